import { SPEED_CONVENTIONS, specificSpeed, suctionSpecificSpeed } from "../calc/specificSpeed";
import { CAVITATION_CAUTION } from "./_shared";
import { defineSpec, type ChoiceParam, type FunctionSpec, type QuantityParam } from "./types";

const speed = { name: "speed", kind: "quantity", dim: "rotationalSpeed", description: "Pump speed, rpm." } as const satisfies QuantityParam;
const flow = { name: "flow", kind: "quantity", dim: "flow", description: "Flow at the best-efficiency point, per impeller eye (half the flow of a double-suction impeller)." } as const satisfies QuantityParam;
const convention = {
  name: "convention",
  kind: "choice",
  options: SPEED_CONVENTIONS,
  optional: true,
  default: "si",
  defaultNote: "SI: rpm, m³/s, m",
  description: '"SI" (rpm, m³/s, m; default), "US" (rpm, gpm, ft) or "dimensionless" (rad/s, m³/s, g·H).',
} as const satisfies ChoiceParam;
const SOURCE = "ANSI/HI 1.1–1.2 (nomenclature: specific speed and suction specific speed); conversion Ns(US) = 51.65·Ns(SI) = 2733·Ω";

export const specs: FunctionSpec[] = [
  defineSpec({
    id: "SPECIFICSPEED",
    topic: "specificSpeed",
    purpose: "Pump specific speed at the best-efficiency point, in the chosen convention's units.",
    params: [speed, flow, { name: "head", kind: "quantity", dim: "length", description: "Head per stage at the best-efficiency point." }, convention],
    result: { dim: "ratio", description: "Specific speed in the convention's units." },
    equation: String.raw`N_s = \frac{N\sqrt{Q}}{H^{3/4}}, \qquad \Omega_s = \frac{\omega\sqrt{Q}}{(gH)^{3/4}}`,
    derivation: (n) => `N_s = N·√Q/H^0.75 = ${n.arg("speed")}·√${n.step("Q")}/${n.step("H")}^0.75 = ${n.result}`,
    assumptions: ["Values at the best-efficiency point, full impeller diameter; head per stage; flow per impeller eye."],
    validity: ["Speed, flow and head greater than zero."],
    cautions: [],
    sources: [SOURCE],
    examples: [
      { args: [1750, "1000 gpm", "100 ft", "us"], expect: 1750, source: "Definition: 1750·√1000/100^0.75 = 1750 (US units)" },
      { args: [1750, "1000 gpm", "100 ft", "si"], expect: 1750 / 51.65, tolerance: 3e-4, source: "Published conversion Ns(US) = 51.65 Ns(SI, m³/s) (from memory)" },
      { args: [1750, "1000 gpm", "100 ft", "dimensionless"], expect: 1750 / 2733, tolerance: 3e-4, source: "Published conversion Ns(US) = 2733 Ω (from memory)" },
    ],
    compute: (a) => specificSpeed(a.speed, a.flow, a.head, a.convention),
  }),
  defineSpec({
    id: "SUCTIONSPEED",
    topic: "specificSpeed",
    purpose: "Suction specific speed at the best-efficiency point, in the chosen convention's units.",
    params: [speed, flow, { name: "npshr", kind: "quantity", dim: "length", description: "NPSHr (NPSH3) at the best-efficiency point." }, convention],
    result: { dim: "ratio", description: "Suction specific speed in the convention's units." },
    equation: String.raw`N_{ss} = \frac{N\sqrt{Q}}{NPSH_r^{3/4}}`,
    derivation: (n) => `N_ss = N·√Q/NPSHr^0.75 = ${n.arg("speed")}·√${n.step("Q")}/${n.step("H")}^0.75 = ${n.result}`,
    assumptions: ["Flow per impeller eye at the best-efficiency point; NPSHr at full diameter."],
    validity: ["Above about 11 000 (US units) warns: suction recirculation trouble is more common there (ANSI/HI 9.6.1; from memory)."],
    cautions: [CAVITATION_CAUTION],
    sources: [SOURCE],
    examples: [{ args: [3550, "500 gpm", "20 ft", "us"], expect: (3550 * Math.sqrt(500)) / 20 ** 0.75, source: "Definition (US units)" }],
    compute: (a) => suctionSpecificSpeed(a.speed, a.flow, a.npshr, a.convention),
  }),
];

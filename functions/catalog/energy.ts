import { annualEnergy } from "../calc/energy";
import { densityParam, unitParam } from "./_shared";
import { defineSpec, type FunctionSpec } from "./types";

export const specs: FunctionSpec[] = [
  defineSpec({
    id: "ENERGY.ANNUAL",
    topic: "energy",
    purpose: "Energy a pump set uses in a year at a duty point.",
    params: [
      { name: "flow", kind: "quantity", dim: "flow", description: "Flow at the duty point." },
      { name: "head", kind: "quantity", dim: "length", description: "Head at the duty point." },
      { name: "efficiency", kind: "quantity", dim: "efficiency", description: 'Pump efficiency at the duty (0.78 or "78%").' },
      { name: "hours", kind: "quantity", dim: "time", description: 'Running hours per year: bare number in hours, or text such as "250 day".' },
      { name: "motor_efficiency", kind: "quantity", dim: "efficiency", optional: true, default: 1, defaultNote: "1 (motor losses left out)", description: "Motor (and drive) efficiency; 1 when left out." },
      densityParam,
      unitParam('"kWh" or "MWh"'),
    ],
    result: { dim: "energy", description: "Energy, J." },
    equation: String.raw`E = \frac{\rho\, g\, Q\, H}{\eta_{pump}\,\eta_{motor}}\; t`,
    derivation: (n) => `E = (P/η_m)·t = ${n.step("P/η_m")}·${n.step("t")} = ${n.result}`,
    assumptions: ["Steady running at one duty point for all the hours."],
    validity: ["Hours from 0 to 8784 (a leap year)."],
    cautions: [],
    sources: ["Definition of pump input power; energy = power × time"],
    examples: [
      { args: [0.05, 40, 0.75, 6000, 0.93, 1000, "kWh"], expect: (1000 * 9.80665 * 0.05 * 40 * 6000) / (0.75 * 0.93 * 1000), source: "Definition: W × h / 1000 = kWh (hand calculation)" },
    ],
    compute: (a) => annualEnergy(a.flow, a.head, a.efficiency, a.hours, a.motor_efficiency, a.density),
  }),
];

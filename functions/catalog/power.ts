import { hydraulicPower, shaftPower } from "../calc/power";
import { DESIGN_AID, densityParam, flowParam, unitParam } from "./_shared";
import { defineSpec, type FunctionSpec, type QuantityParam } from "./types";

const head = { name: "head", kind: "quantity", dim: "length", description: "Total head the pump adds." } as const satisfies QuantityParam;
const SOURCES = ["Definition of hydraulic power; ANSI/HI 1.6 and 14.6 terminology (pump input power = hydraulic power / efficiency)"];

export const specs: FunctionSpec[] = [
  defineSpec({
    id: "POWER.HYDRAULIC",
    topic: "power",
    purpose: "Hydraulic (water) power delivered to the liquid.",
    params: [flowParam, head, densityParam, unitParam('"kW" or "hp"')],
    result: { dim: "power", description: "Power, W." },
    equation: String.raw`P_h = \rho\, g\, Q\, H`,
    derivation: (n) => `P = ρ·g·Q·H = ${n.arg("density")}·${n.g}·${n.arg("flow")}·${n.arg("head")} = ${n.result}`,
    assumptions: ["Standard gravity; density of the pumped liquid (water at 20 °C unless given)."],
    validity: ["Flow of zero or more; density greater than zero."],
    cautions: [DESIGN_AID],
    sources: SOURCES,
    examples: [
      { args: ["3960 gpm", "1 ft", null, "hp"], expect: 1, tolerance: 1e-3, source: "Common practice (US): water horsepower = gpm × ft × SG / 3960" },
    ],
    compute: (a) => hydraulicPower(a.flow, a.head, a.density),
  }),
  defineSpec({
    id: "POWER.SHAFT",
    topic: "power",
    purpose: "Shaft (brake) power a pump needs at an efficiency.",
    params: [flowParam, head, { name: "efficiency", kind: "quantity", dim: "efficiency", description: 'Pump efficiency: a fraction (0.78) or percent text ("78%").' }, densityParam, unitParam('"kW" or "hp"')],
    result: { dim: "power", description: "Shaft power, W." },
    equation: String.raw`P = \frac{\rho\, g\, Q\, H}{\eta}`,
    derivation: (n) => `P = ρgQH/η = ${n.step("P_h")}/${n.step("η")} = ${n.result}`,
    assumptions: ["Efficiency is the pump's at this duty point (from the maker's curve)."],
    validity: ["0 < η ≤ 1: a bare number above 1 (such as 78) is an error, never divided by 100."],
    cautions: [DESIGN_AID, "Size the motor for the largest power on the curve the pump can reach (end of curve), not only the duty point."],
    sources: SOURCES,
    examples: [
      { args: ["3960 gpm", "1 ft", "50%", null, "hp"], expect: 2, tolerance: 1e-3, source: "Common practice (US): brake horsepower = gpm × ft × SG / (3960 η)" },
    ],
    compute: (a) => shaftPower(a.flow, a.head, a.efficiency, a.density),
  }),
];

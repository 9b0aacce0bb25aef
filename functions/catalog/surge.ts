import { WATER_BULK_MODULUS, surgePressure, waveSpeed } from "../calc/surge";
import { PRESSURE_CAUTION, densityParam, unitParam } from "./_shared";
import { defineSpec, type FunctionSpec } from "./types";

const SURGE_CAUTION = "Surge can burst pipes and injure people: a detailed transient analysis by a qualified engineer is needed for any real system.";

export const specs: FunctionSpec[] = [
  defineSpec({
    id: "SURGE.WAVESPEED",
    topic: "surge",
    purpose: "Speed of a pressure wave in a liquid-filled elastic pipe (Korteweg).",
    params: [
      { name: "diameter", kind: "quantity", dim: "length", description: "Pipe inside diameter." },
      { name: "wall", kind: "quantity", dim: "length", description: "Pipe wall thickness." },
      { name: "pipe_modulus", kind: "quantity", dim: "modulus", description: 'Young\'s modulus of the pipe wall, such as "200 GPa" for steel.' },
      { name: "bulk_modulus", kind: "quantity", dim: "modulus", optional: true, default: WATER_BULK_MODULUS, defaultNote: "2.2 GPa, water (common practice)", description: "Bulk modulus of the liquid; 2.2 GPa (water) when left out." },
      densityParam,
      { name: "restraint", kind: "quantity", dim: "ratio", optional: true, default: 1, defaultNote: "1, pipe with expansion joints", description: "Restraint factor c; 1 when left out." },
      unitParam('"ft/s" or "m/s"'),
    ],
    result: { dim: "velocity", description: "Wave speed, m/s." },
    equation: String.raw`a = \sqrt{\frac{K/\rho}{1 + c\,\frac{K D}{E e}}}`,
    derivation: (n) => `a = √(K/ρ)/√(1 + cKD/(Ee)) = ${n.step("√(K/ρ)")}/√${n.step("1 + cKD/(Ee)")} = ${n.result}`,
    assumptions: ["Thin-walled pipe; no free gas in the liquid (a little air lowers a sharply)."],
    validity: ["D/e below 25 or a wall thicker than the radius warns."],
    cautions: [SURGE_CAUTION],
    sources: ["Korteweg (1878); Wylie, E. B. and Streeter, V. L., Fluid Transients in Systems (1993), ch. 2"],
    examples: [
      { args: [0.3, "10 mm", "200 GPa", null, 1000], expect: Math.sqrt(2.2e9 / 1000 / (1 + (2.2e9 * 0.3) / (200e9 * 0.01))), source: "Korteweg formula by hand: steel pipe, 300 mm bore, 10 mm wall" },
      { args: [0.3, 0.01, 1e15, 2.2e9, 1000], expect: Math.sqrt(2.2e6), tolerance: 1e-4, source: "Rigid pipe: a = √(K/ρ) = 1483 m/s, the speed of sound in water (definition)" },
    ],
    compute: (a) => waveSpeed(a.diameter, a.wall, a.pipe_modulus, a.bulk_modulus, a.density, a.restraint),
  }),
  defineSpec({
    id: "SURGE.PRESSURE",
    topic: "surge",
    purpose: "Pressure rise from a sudden change of velocity (Joukowsky).",
    params: [
      { name: "wave_speed", kind: "quantity", dim: "velocity", description: "Pressure-wave speed, from NAPPE.SURGE.WAVESPEED.", plausible: [50, 2000] },
      { name: "velocity_change", kind: "quantity", dim: "velocity", description: "Change of mean velocity, such as the full velocity for a fast valve closure." },
      densityParam,
      unitParam('"kPa" or "psi"'),
    ],
    result: { dim: "pressure", description: "Pressure rise, Pa, above the running pressure." },
    equation: String.raw`\Delta p = \rho\, a\, \Delta v`,
    derivation: (n) => `Δp = ρ·a·Δv = ${n.arg("density")}·${n.arg("wave_speed")}·${n.arg("velocity_change")} = ${n.result}`,
    assumptions: ["The change is faster than the wave's round trip 2L/a; friction neglected."],
    validity: ["Always returns a warning on its limits: reflections and column separation are not modelled."],
    cautions: [SURGE_CAUTION, PRESSURE_CAUTION],
    sources: ["Joukowsky (1898); Wylie and Streeter (1993)"],
    examples: [
      { args: ["4000 ft/s", "1 ft/s", 998, "psi"], expect: 53.79, tolerance: 1e-3, source: "Common practice: about 50 to 60 psi per ft/s of velocity change in water mains; hand calculation 998 × 1219.2 × 0.3048 Pa = 53.79 psi" },
    ],
    compute: (a) => surgePressure(a.wave_speed, a.velocity_change, a.density),
  }),
];

import { headFromPressure, pressureFromHead } from "../calc/hydrostatics";
import { densityParam, unitParam } from "./_shared";
import { defineSpec, type FunctionSpec } from "./types";

const SOURCES = ["Hydrostatics: p = ρgh; g = 9.80665 m/s² (standard gravity, NIST SP 811)"];

export const specs: FunctionSpec[] = [
  defineSpec({
    id: "HEAD",
    topic: "hydrostatics",
    purpose: "Head of liquid equivalent to a pressure or pressure difference.",
    params: [
      { name: "pressure", kind: "quantity", dim: "pressure", description: "Pressure or pressure difference (gauge or absolute, as you need the head)." },
      densityParam,
      unitParam('"ft" or "m"'),
    ],
    result: { dim: "length", description: "Head, m of the liquid." },
    equation: String.raw`h = \frac{p}{\rho\, g}`,
    derivation: (n) => `h = p/(ρg) = ${n.arg("pressure")}/(${n.arg("density")}·${n.g}) = ${n.result}`,
    assumptions: ["Standard gravity g = 9.80665 m/s².", "Head is in metres of the liquid whose density is given."],
    validity: ["Density must be greater than zero."],
    cautions: [],
    sources: SOURCES,
    examples: [
      { args: ["1 psi", null, "ft"], expect: 2.3108, tolerance: 5e-4, source: "Common practice: 1 psi ≈ 2.31 ft of water near room temperature" },
      { args: ["98.0665 kPa", 1000], expect: 10, source: "Definition: 10 m of water at 1000 kg/m³ and standard gravity" },
    ],
    compute: (a) => headFromPressure(a.pressure, a.density),
  }),
  defineSpec({
    id: "PRESSURE",
    topic: "hydrostatics",
    purpose: "Pressure of a column of liquid of a given head.",
    params: [
      { name: "head", kind: "quantity", dim: "length", description: "Head of liquid." },
      densityParam,
      unitParam('"kPa" or "psi"'),
    ],
    result: { dim: "pressure", description: "Pressure, Pa (a difference: add the surface pressure for absolute)." },
    equation: String.raw`p = \rho\, g\, h`,
    derivation: (n) => `p = ρ·g·h = ${n.arg("density")}·${n.g}·${n.arg("head")} = ${n.result}`,
    assumptions: ["Standard gravity g = 9.80665 m/s²."],
    validity: ["Density must be greater than zero."],
    cautions: [],
    sources: SOURCES,
    examples: [
      { args: [10, 1000, "kPa"], expect: 98.0665, source: "Definition: 10 mH2O (conventional) = 98.0665 kPa (NIST SP 811)" },
      { args: ["2.31 ft", null, "psi"], expect: 0.99966, tolerance: 5e-4, source: "Common practice: 2.31 ft of water ≈ 1 psi" },
    ],
    compute: (a) => pressureFromHead(a.head, a.density),
  }),
];

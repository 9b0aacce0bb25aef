import { convertUnits, inSiBaseUnits } from "../units/quantity";
import { ok, step } from "../calc/_lib/result";
import { defineSpec, type FunctionSpec } from "./types";

export const specs: FunctionSpec[] = [
  defineSpec({
    id: "CONVERT",
    topic: "units",
    purpose: "Converts a value from one unit to another of the same dimension.",
    params: [
      { name: "value", kind: "quantity", dim: "ratio", description: "The number to convert." },
      { name: "from_unit", kind: "unit", description: 'Unit the value is in, such as "gpm" or "psi".' },
      { name: "to_unit", kind: "unit", description: 'Unit wanted, such as "L/s" or "kPa".' },
    ],
    result: { dim: "ratio", description: "The value in to_unit." },
    equation: String.raw`x_{\text{to}} = x_{\text{from}} \cdot \frac{k_{\text{from}}}{k_{\text{to}}} \quad (\text{offsets for }^\circ\text{C}, ^\circ\text{F})`,
    derivation: (n) => `${n.arg("value")} ${n.arg("from_unit")} = ${n.step("x_SI")} in SI base units = ${n.result} ${n.arg("to_unit")}`,
    assumptions: ["US gallons (231 in³); water columns at 1000 kg/m³ and standard gravity (conventional)."],
    validity: ["Both units must measure the same dimension."],
    cautions: [],
    sources: ["NIST SP 811 (2008), appendix B: conversion factors", "mathjs unit definitions (SI)"],
    examples: [
      { args: [1, "psi", "Pa"], expect: 6894.757293168361, source: "NIST SP 811 B.8: 1 psi = 6.894757E+03 Pa (exact from lbf and in)" },
      { args: [100, "gpm", "L/s"], expect: 6.30901964, source: "NIST SP 811: US gallon = 3.785411784 L exactly" },
      { args: [212, "degF", "degC"], expect: 100, source: "NIST SP 811 B.9: t/°C = (t/°F − 32)/1.8" },
      { args: [1, "ftH2O", "kPa"], expect: 2.98906692, source: "NIST SP 811 B.8: foot of water (conventional) = 2.989067E+03 Pa" },
    ],
    compute: (a) => {
      const result = convertUnits(a.value, a.from_unit, a.to_unit);
      const si = inSiBaseUnits(a.value, a.from_unit);
      return ok(result, [], [step("x_SI", `the value in SI base units, ${si.unit}`, si.value, "ratio", "mathjs unit definitions (factors as NIST SP 811 lists them)")]);
    },
  }),
];

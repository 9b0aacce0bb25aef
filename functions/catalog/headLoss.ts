import { darcyHeadLoss, hazenWilliamsHeadLoss, minorHeadLoss } from "../calc/headLoss";
import { diameterParam, flowParam, kinematicViscosityParam, unitParam } from "./_shared";
import { defineSpec, type FunctionSpec, type QuantityParam } from "./types";

const length = { name: "length", kind: "quantity", dim: "length", description: "Pipe length." } as const satisfies QuantityParam;

export const specs: FunctionSpec[] = [
  defineSpec({
    id: "HEADLOSS",
    topic: "headLoss",
    purpose: "Friction (major) head loss in a straight pipe by Darcy–Weisbach.",
    params: [
      flowParam,
      diameterParam,
      length,
      { name: "roughness", kind: "quantity", dim: "length", description: 'Absolute roughness ε, such as "0.045 mm" for new steel.' },
      kinematicViscosityParam,
      unitParam('"ft" or "m"'),
    ],
    result: { dim: "length", description: "Head loss, m of the flowing liquid." },
    equation: String.raw`h_f = f\,\frac{L}{D}\,\frac{V^2}{2g}, \quad V = \frac{4Q}{\pi D^2}, \quad f = f_{\text{Colebrook}}(Re, \varepsilon/D)`,
    derivation: (n) => `h_f = f·(L/D)·V²/2g = ${n.step("f")}·(${n.arg("length")}/${n.arg("diameter")})·${n.step("V²/2g")} = ${n.result}`,
    assumptions: ["Full round pipe, steady flow, Newtonian liquid.", "Friction factor by Colebrook (64/Re when laminar)."],
    validity: ["Transitional Re (2000–4000) and ε/D beyond the Moody chart give warnings.", "Velocity above 3 m/s gives a warning (common practice)."],
    cautions: [],
    sources: ["Darcy–Weisbach equation", "Colebrook (1939)"],
    examples: [
      {
        args: ["0.2 ft^3/s", "2 in", "200 ft", "0.000007 ft", "1.2085e-5 ft^2/s", "ft"],
        expect: 27.3,
        tolerance: 5e-3,
        source: "Çengel & Cimbala, worked example: 200 ft of 2-in stainless pipe at 0.2 ft³/s, V = 9.17 ft/s, f = 0.0174, hL = 27.3 ft (from memory)",
      },
    ],
    compute: (a) => darcyHeadLoss(a.flow, a.diameter, a.length, a.roughness, a.kinematic_viscosity),
  }),
  defineSpec({
    id: "HEADLOSS.HW",
    topic: "headLoss",
    purpose: "Friction head loss of water in a pipe by Hazen–Williams.",
    params: [flowParam, diameterParam, length, { name: "c_factor", kind: "quantity", dim: "ratio", description: "Hazen–Williams C, such as 130 for new steel." }, unitParam('"ft" or "m"')],
    result: { dim: "length", description: "Head loss, m of water." },
    equation: String.raw`h_f = \frac{10.67\, L\, Q^{1.852}}{C^{1.852} D^{4.8704}} \quad (\text{SI units})`,
    // In US units the constant becomes 10.67·0.3048^−4.8704·0.0283168^1.852 = 4.725, with Q in ft³/s and L, D in ft.
    derivation: (n) => {
      const k = n.us ? "4.725" : "10.67";
      return `h = ${k}·L·Q^1.852/(C^1.852·D^4.8704) = ${k}·${n.arg("length")}·(${n.arg("flow", n.us ? "ft^3/s" : undefined)})^1.852/(${n.arg("c_factor")}^1.852·(${n.arg("diameter")})^4.8704) = ${n.result}`;
    },
    assumptions: ["Water near room temperature, turbulent flow: the formula has no viscosity term."],
    validity: ["C outside 40–160, D below 50 mm or velocity above 3 m/s give warnings."],
    cautions: [],
    sources: ["Williams, G. S. and Hazen, A. (1905), Hydraulic Tables", "SI coefficient 10.67 as in common water-supply texts"],
    examples: [
      {
        args: ["500 gpm", "6.065 in", "1000 ft", 120, "ft"],
        expect: 22.722,
        tolerance: 1e-2,
        source: "US-unit form hf = 10.44·L·Q^1.85/(C^1.85·d^4.8655) (ft, gpm, in), as printed in hydraulic data handbooks (from memory)",
      },
    ],
    compute: (a) => hazenWilliamsHeadLoss(a.flow, a.diameter, a.length, a.c_factor),
  }),
  defineSpec({
    id: "HEADLOSS.MINOR",
    topic: "headLoss",
    purpose: "Minor (fittings and valves) head loss from a total loss coefficient.",
    params: [flowParam, diameterParam, { name: "k_total", kind: "quantity", dim: "ratio", description: "Sum of the loss coefficients K of the fittings." }, unitParam('"ft" or "m"')],
    result: { dim: "length", description: "Head loss, m." },
    equation: String.raw`h_m = \Sigma K\,\frac{V^2}{2g}, \quad V = \frac{4Q}{\pi D^2}`,
    derivation: (n) => `h_m = ΣK·V²/2g = ${n.arg("k_total")}·${n.step("V²/2g")} = ${n.result}`,
    assumptions: ["Every K refers to the velocity in this diameter."],
    validity: ["K of zero or more."],
    cautions: [],
    sources: ["Loss-coefficient method, as in Crane Technical Paper 410"],
    examples: [
      { args: ["0.01 m^3/s", 0.1, 1], expect: (4 * 0.01) ** 2 / (Math.PI * 0.01) ** 2 / (2 * 9.80665), source: "Definition: one velocity head V²/2g" },
    ],
    compute: (a) => minorHeadLoss(a.flow, a.diameter, a.k_total),
  }),
];

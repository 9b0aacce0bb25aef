import { FRICTION_METHODS, frictionFactor } from "../calc/friction";
import { defineSpec, type FunctionSpec } from "./types";

export const specs: FunctionSpec[] = [
  defineSpec({
    id: "FRICTION",
    topic: "friction",
    purpose: "Darcy friction factor from the Reynolds number and relative roughness.",
    params: [
      { name: "reynolds", kind: "quantity", dim: "ratio", description: "Reynolds number." },
      { name: "relative_roughness", kind: "quantity", dim: "ratio", description: "Absolute roughness over inside diameter, ε/D." },
      {
        name: "method",
        kind: "choice",
        options: FRICTION_METHODS,
        optional: true,
        default: "colebrook",
        defaultNote: "Colebrook, solved to double precision",
        description: '"colebrook" (default), "swamee-jain", "haaland" or "churchill".',
      },
    ],
    result: { dim: "ratio", description: "Darcy (Moody) friction factor; the Fanning factor is a quarter of it." },
    equation: String.raw`\frac{1}{\sqrt f} = -2\log_{10}\!\left(\frac{\varepsilon/D}{3.7} + \frac{2.51}{Re\sqrt f}\right); \quad f = \frac{64}{Re}\ (Re < 2000)`,
    derivation: (n) => (n.has("ε/D") ? `f = ${n.result} for Re = ${n.step("Re")}, ε/D = ${n.step("ε/D")}` : `f = 64/Re = 64/${n.step("Re")} = ${n.result}`),
    assumptions: [
      "Fully developed flow of a Newtonian liquid in a full round pipe.",
      "Laminar below Re = 2000: f = 64/Re for every method but Churchill's, which covers all regimes itself.",
    ],
    validity: [
      "Re from 2000 to 4000 is transitional: a value is returned with a warning.",
      "Swamee–Jain: 5000 ≤ Re ≤ 1e8 and 1e-6 ≤ ε/D ≤ 0.01 (about 1 % from Colebrook).",
      "Haaland: 4000 ≤ Re ≤ 1e8 (about 1.5 % from Colebrook).",
      "ε/D above 0.05 is beyond the Moody chart: warning.",
    ],
    cautions: [],
    sources: [
      "Colebrook, C. F. (1939), J. Inst. Civ. Eng. 11, 133–156",
      "Swamee, P. K. and Jain, A. K. (1976), J. Hydraulics Div. ASCE 102(5), 657–664",
      "Haaland, S. E. (1983), J. Fluids Eng. 105(1), 89–90",
      "Churchill, S. W. (1977), Chem. Eng. 84(24), 91–92",
    ],
    examples: [
      { args: [126400, 0.000042], expect: 0.0174, tolerance: 5e-3, source: "Çengel & Cimbala, worked example on a 2-in stainless water pipe: f = 0.0174 (from memory)" },
      { args: [1000, 0.001], expect: 0.064, source: "Hagen–Poiseuille: f = 64/Re (definition)" },
      { args: [1e5, 0.0001, "swamee-jain"], expect: 0.01845244530756638, tolerance: 1e-12, source: "Swamee–Jain formula evaluated independently in Python 3.11 (math.log10)" },
    ],
    compute: (a) => frictionFactor(a.reynolds, a.relative_roughness, a.method),
  }),
];

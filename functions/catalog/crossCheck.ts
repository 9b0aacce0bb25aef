import { CROSSCHECK_TOLERANCE, crossCheck } from "../calc/crossCheck";
import { defineSpec, type FunctionSpec } from "./types";

export const specs: FunctionSpec[] = [
  defineSpec({
    id: "CROSSCHECK",
    topic: "crossCheck",
    purpose: "Relative difference of a hand-calculated value from Nappe's, with a verdict against a tolerance.",
    params: [
      { name: "hand", kind: "quantity", dim: "ratio", description: "The hand-calculated value (a cell of your own formula)." },
      { name: "nappe", kind: "quantity", dim: "ratio", description: 'Nappe\'s value of the same quantity in the same unit, such as NAPPE.HEADLOSS(…, "ft").' },
      {
        name: "tolerance",
        kind: "quantity",
        dim: "efficiency",
        optional: true,
        default: CROSSCHECK_TOLERANCE,
        defaultNote: "0.5 %",
        description: 'Largest relative difference that still agrees: a fraction (0.005) or percent text ("0.5%").',
      },
    ],
    result: { dim: "ratio", description: "Relative difference (hand − Nappe)/Nappe; a warning says when it exceeds the tolerance." },
    equation: String.raw`\Delta = \frac{x_{hand} - x_{Nappe}}{x_{Nappe}}, \qquad |\Delta| \le \text{tol} \Rightarrow \text{agrees}`,
    // Nine figures: enough for the subtraction to come out from the numbers shown.
    derivation: (n) => `Δ = (hand − Nappe)/Nappe = (${n.arg("hand", undefined, 9)} − ${n.arg("nappe", undefined, 9)})/${n.arg("nappe", undefined, 9)} = ${n.result}`,
    assumptions: ["Both values are in the same unit: give the NAPPE call the unit of the hand cell."],
    validity: ["Nappe's value must not be zero; tolerance above 0 and below 1."],
    cautions: ["Agreement within the tolerance does not prove both right: the cross-check's diagnosis (in the pane and every audit) names every step that departs."],
    sources: ["Relative difference (definition)"],
    examples: [
      { args: [10.2, 10, "0.5%"], expect: 0.02, tolerance: 1e-12, source: "Definition: (10.2 − 10)/10 = 0.02 (differs at 0.5 %)" },
      { args: [10.03, 10], expect: 0.003, tolerance: 1e-12, source: "Definition: (10.03 − 10)/10 = 0.003 (agrees at the default 0.5 %)" },
    ],
    compute: (a) => crossCheck(a.hand, a.nappe, a.tolerance),
  }),
];

import { AFFINITY_KINDS, type AffinityKind, affinityRatioThrough, affinityScale, speedForDuty, trimDiameter } from "../calc/affinity";
import type { Table } from "../tables/table";
import { curveInterpolant } from "../calc/pumpCurve";
import { curveFromTable } from "./_tables";
import type { Dimension } from "../units/dimensions";
import { curveParam, DESIGN_AID, PARABOLA_CURVE, unitParam } from "./_shared";
import { defineSpec, type Args, type FunctionSpec, type QuantityParam } from "./types";

const dutyFlow = { name: "flow", kind: "quantity", dim: "flow", description: "Duty flow." } as const satisfies QuantityParam;
const dutyHead = { name: "head", kind: "quantity", dim: "length", description: "Duty head." } as const satisfies QuantityParam;
const headOf = (curve: Table) => curveInterpolant("curve", curveFromTable("curve", curve), "head");
const RATIO_EQUATION = String.raw`r^2\,H_c\!\left(\frac{Q}{r}\right) = H \quad \Rightarrow \quad r`;
/** On that parabola the ratio through (Q, H) is √((H + 12000·Q²)/52). */
const PARABOLA_RATIO = Math.sqrt((35 + 12000 * 0.03 ** 2) / 52);
const PARABOLA_SOURCE = "Hand calculation on the parabola H = 52 − 12000Q²: r = √((H + 12000Q²)/52) = 0.93849 for 0.03 m³/s at 35 m (PCHIP through its points)";

const DIM_OF_KIND: Record<AffinityKind, Dimension> = { flow: "flow", head: "length", npshr: "length", power: "power" };
const isKind = (k: unknown): k is AffinityKind => (AFFINITY_KINDS as readonly unknown[]).includes(k);
const dimOfKind = (a: Args): Dimension => {
  const kind = a.kind;
  if (!isKind(kind)) throw new Error("kind is read before the value whose dimension it sets");
  return DIM_OF_KIND[kind];
};

export const specs: FunctionSpec[] = [
  defineSpec({
    id: "AFFINITY",
    topic: "affinity",
    purpose: "Scales a flow, head, NPSHr or power by the affinity laws for a speed or diameter ratio.",
    params: [
      { name: "value", kind: "anyQuantity", dimFrom: dimOfKind, description: "The flow, head, NPSHr or power to scale." },
      { name: "kind", kind: "choice", options: AFFINITY_KINDS, description: '"flow" (× r), "head" or "npshr" (× r²), "power" (× r³).' },
      { name: "ratio", kind: "quantity", dim: "ratio", description: "Speed ratio N2/N1 (or impeller diameter ratio D2/D1)." },
      unitParam('"gpm", "ft" or "hp", matching the kind'),
    ],
    result: { dim: dimOfKind, description: "Scaled value in the kind's base unit." },
    equation: String.raw`Q_2 = Q_1 r, \quad H_2 = H_1 r^2, \quad P_2 = P_1 r^3, \quad r = \frac{N_2}{N_1}\ \text{or}\ \frac{D_2}{D_1}`,
    derivation: (n) => `x₂ = x₁·r^n = ${n.arg("value")}·${n.arg("ratio")}^${n.step("n")} = ${n.result} (${n.arg("kind")})`,
    assumptions: ["Efficiency unchanged by the change of speed or diameter.", "Diameter scaling holds only for small trims of the same impeller."],
    validity: ["Ratios far from 1 (below 0.5 or above 1.5) give a warning."],
    cautions: [DESIGN_AID],
    sources: ["Affinity (similarity) laws of centrifugal pumps; ANSI/HI 1.3"],
    examples: [
      { args: [100, "head", 0.9], expect: 81, source: "Affinity law H ∝ r² (definition)" },
      { args: ["100 gpm", "flow", 1.1, "gpm"], expect: 110, source: "Affinity law Q ∝ r (definition)" },
      { args: ["10 hp", "power", 0.5, "hp"], expect: 1.25, source: "Affinity law P ∝ r³ (definition)" },
    ],
    compute: (a) => affinityScale(a.value, a.kind, a.ratio),
  }),
  defineSpec({
    id: "AFFINITY.RATIO",
    topic: "affinity",
    purpose: "Speed or diameter ratio r that moves a pump curve through a duty point by the affinity laws.",
    params: [curveParam, dutyFlow, dutyHead],
    result: { dim: "ratio", description: "Ratio r = N2/N1 (or D2/D1)." },
    equation: RATIO_EQUATION,
    derivation: (n) => `r²·Hc(Q/r) = H: ${n.step("r")}²·${n.step("Hc(Q/r)")} = ${n.arg("head")} at Q/r = ${n.step("Q/r")}`,
    assumptions: ["Affinity laws: flow ∝ r, head ∝ r²; efficiency unchanged.", "Solved by Brent's method with Q/r kept on the curve."],
    validity: ["An error when no ratio moves the curve through the duty while staying on its flow range."],
    cautions: [DESIGN_AID],
    sources: ["Affinity laws; ANSI/HI 1.3", "Brent (1973) root finding"],
    examples: [{ args: [PARABOLA_CURVE, 0.03, 35], expect: PARABOLA_RATIO, tolerance: 1e-3, source: PARABOLA_SOURCE }],
    compute: (a) => affinityRatioThrough(headOf(a.curve), a.flow, a.head),
  }),
  defineSpec({
    id: "TRIM",
    topic: "affinity",
    purpose: "Trimmed impeller diameter that meets a duty point, by the affinity laws.",
    params: [curveParam, { name: "diameter", kind: "quantity", dim: "length", description: "Impeller diameter of the curve." }, dutyFlow, dutyHead, unitParam('"mm" or "in"')],
    result: { dim: "length", description: "Trimmed diameter, m." },
    equation: String.raw`D_2 = r\,D_1, \quad ${RATIO_EQUATION}`,
    derivation: (n) => `D₂ = r·D₁ = ${n.step("r")}·${n.arg("diameter")} = ${n.result}`,
    assumptions: ["Affinity laws for diameter hold only for small trims of the same impeller; makers' trimmed curves are better."],
    validity: ["A duty above the full-diameter curve is an error (a trim cannot add diameter).", "Trims deeper than about 10 % warn; below about 75 % of the diameter warn more strongly (common practice)."],
    cautions: [DESIGN_AID, "Trim in steps and test: an over-trimmed impeller cannot be restored."],
    sources: ["Affinity laws for impeller trimming; ANSI/HI 1.3 (common practice limits)"],
    examples: [{ args: [PARABOLA_CURVE, "250 mm", 0.03, 35, "mm"], expect: 250 * PARABOLA_RATIO, tolerance: 1e-3, source: PARABOLA_SOURCE }],
    compute: (a) => trimDiameter(headOf(a.curve), a.diameter, a.flow, a.head),
  }),
  defineSpec({
    id: "SPEED",
    topic: "affinity",
    purpose: "Pump speed that meets a duty point, by the affinity laws.",
    params: [curveParam, { name: "speed", kind: "quantity", dim: "rotationalSpeed", description: "Speed of the curve, rpm." }, dutyFlow, dutyHead],
    result: { dim: "rotationalSpeed", description: "Speed, rpm." },
    equation: String.raw`N_2 = r\,N_1, \quad ${RATIO_EQUATION}`,
    derivation: (n) => `N₂ = r·N₁ = ${n.step("r")}·${n.arg("speed")} = ${n.result}`,
    assumptions: ["Affinity laws for speed: flow ∝ N, head ∝ N², power ∝ N³; efficiency unchanged."],
    validity: ["Speeds above the curve's warn (maker's limit, motor power)."],
    cautions: [DESIGN_AID],
    sources: ["Affinity laws; ANSI/HI 1.3"],
    examples: [{ args: [PARABOLA_CURVE, 1750, 0.03, 35], expect: 1750 * PARABOLA_RATIO, tolerance: 1e-3, source: PARABOLA_SOURCE }],
    compute: (a) => speedForDuty(headOf(a.curve), a.speed, a.flow, a.head),
  }),
];

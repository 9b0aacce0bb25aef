import { AFFINITY_KINDS, type AffinityKind, affinityScale } from "../calc/affinity";
import type { Dimension } from "../units/dimensions";
import { DESIGN_AID, unitParam } from "./_shared";
import type { Args, FunctionSpec } from "./types";

const DIM_OF_KIND: Record<AffinityKind, Dimension> = { flow: "flow", head: "length", npshr: "length", power: "power" };
const dimOfKind = (a: Args): Dimension => DIM_OF_KIND[a.kind as AffinityKind];

export const specs: FunctionSpec[] = [
  {
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
    assumptions: ["Efficiency unchanged by the change of speed or diameter.", "Diameter scaling holds only for small trims of the same impeller."],
    validity: ["Ratios far from 1 (below 0.5 or above 1.5) give a warning."],
    cautions: [DESIGN_AID],
    sources: ["Affinity (similarity) laws of centrifugal pumps; ANSI/HI 1.3"],
    examples: [
      { args: [100, "head", 0.9], expect: 81, source: "Affinity law H ∝ r² (definition)" },
      { args: ["100 gpm", "flow", 1.1, "gpm"], expect: 110, source: "Affinity law Q ∝ r (definition)" },
      { args: ["10 hp", "power", 0.5, "hp"], expect: 1.25, source: "Affinity law P ∝ r³ (definition)" },
    ],
    compute: (a) => affinityScale(a.value as number, a.kind as AffinityKind, a.ratio as number),
  },
];

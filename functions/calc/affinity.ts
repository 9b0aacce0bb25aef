/** Affinity laws for a centrifugal pump: flow ∝ r, head and NPSHr ∝ r², power ∝ r³. */
import { CalcError, type CalcResult, ok, requireFinite } from "./_lib/result";

export const AFFINITY_KINDS = ["flow", "head", "npshr", "power"] as const;
export type AffinityKind = (typeof AFFINITY_KINDS)[number];

const EXPONENT: Record<AffinityKind, number> = { flow: 1, head: 2, npshr: 2, power: 3 };

/** Exponent of the ratio for each kind of quantity. */
export function affinityExponent(kind: AffinityKind): number {
  return EXPONENT[kind];
}

/** Scales a value by r^n for its kind, where r is the speed (or impeller diameter) ratio. */
export function affinityScale(value: number, kind: AffinityKind, ratio: number): CalcResult {
  requireFinite("value", value);
  if (!(Number.isFinite(ratio) && ratio > 0)) throw new CalcError("ratio", `expected a speed or diameter ratio greater than zero; got ${ratio}`);
  const warnings: string[] = [];
  if (ratio < 0.5 || ratio > 1.5) {
    warnings.push(`Ratio ${ratio} is far from 1: the affinity laws lose accuracy (efficiency and NPSHr change); confirm with the pump maker.`);
  }
  return ok(value * Math.pow(ratio, EXPONENT[kind]), warnings);
}

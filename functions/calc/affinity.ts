/** Affinity laws for a centrifugal pump: flow ∝ r, head and NPSHr ∝ r², power ∝ r³. */
import { CalcError, type CalcResult, ok, requireFinite, step, quoted } from "./_lib/result";
import { allRoots } from "./_lib/solve";

export const AFFINITY_KINDS = ["flow", "head", "npshr", "power"] as const;
export type AffinityKind = (typeof AFFINITY_KINDS)[number];

const EXPONENT: Record<AffinityKind, number> = { flow: 1, head: 2, npshr: 2, power: 3 };

/**
 * The factor each column of a pump curve is multiplied by when the curve moves by a speed or
 * diameter ratio r: flow r, head and NPSHr r², power r³; efficiency (and anything else) unchanged.
 */
export function curveScaleFactors(ratio: number): CalcResult<(column: string) => number> {
  if (!(Number.isFinite(ratio) && ratio > 0)) throw new CalcError("ratio", `expected a ratio greater than zero; got ${ratio}`);
  const warnings = ratio < 0.5 || ratio > 1.5 ? [`Ratio ${ratio} is far from 1: the affinity laws lose accuracy; confirm with the pump maker.`] : [];
  const factor = (column: string) => ((AFFINITY_KINDS as readonly string[]).includes(column) ? Math.pow(ratio, EXPONENT[column as AffinityKind]) : 1);
  return ok(factor, warnings, [
    step("r", "speed (or diameter) ratio", ratio, "ratio", "as given"),
    step("r²", "factor on head and NPSHr", ratio * ratio, "ratio", "affinity: H ∝ r²"),
    step("r³", "factor on power", ratio ** 3, "ratio", "affinity: P ∝ r³"),
  ]);
}

/** Scales a value by r^n for its kind, where r is the speed (or impeller diameter) ratio. */
export function affinityScale(value: number, kind: AffinityKind, ratio: number): CalcResult {
  requireFinite("value", value);
  if (!(Number.isFinite(ratio) && ratio > 0)) throw new CalcError("ratio", `expected a speed or diameter ratio greater than zero; got ${ratio}`);
  const warnings: string[] = [];
  if (ratio < 0.5 || ratio > 1.5) {
    warnings.push(`Ratio ${ratio} is far from 1: the affinity laws lose accuracy (efficiency and NPSHr change); confirm with the pump maker.`);
  }
  return ok(value * Math.pow(ratio, EXPONENT[kind]), warnings, [
    step("n", `exponent for ${kind}`, EXPONENT[kind], "ratio", "affinity: flow ∝ r, head and NPSHr ∝ r², power ∝ r³"),
    step("r^n", "affinity factor", Math.pow(ratio, EXPONENT[kind]), "ratio", "r raised to n"),
  ]);
}

/**
 * The ratio r (speed or diameter) that moves a head curve through a duty point (Q, H):
 * r²·Hc(Q/r) = H, with Q/r inside the curve. Where several ratios work, the one nearest 1.
 */
export function affinityRatioThrough(head: { min: number; max: number; at(q: number): number }, flow: number, dutyHead: number): CalcResult {
  if (!(flow > 0 && Number.isFinite(flow))) throw new CalcError("flow", `expected a duty flow greater than zero; got ${flow}`);
  if (!(dutyHead > 0 && Number.isFinite(dutyHead))) throw new CalcError("head", `expected a duty head greater than zero; got ${dutyHead}`);
  const rLo = flow / head.max;
  const rHi = head.min > 0 ? flow / head.min : Math.max(10, rLo * 10);
  const g = (r: number) => r * r * head.at(Math.min(Math.max(flow / r, head.min), head.max)) - dutyHead;
  const roots = allRoots(g, rLo, rHi, 400);
  if (!roots.length) {
    throw new CalcError("head", `no speed or diameter ratio moves this curve through ${quoted(flow, "flow")} at ${quoted(dutyHead, "length")} while staying on the curve's flow range`);
  }
  const r = roots.reduce((best, x) => (Math.abs(Math.log(x)) < Math.abs(Math.log(best)) ? x : best));
  return ok(r, [], [
    step("r", "speed or diameter ratio", r, "ratio", "r²·Hc(Q/r) = H solved by Brent's method"),
    step("Q/r", "flow on the given curve that maps to the duty", flow / r, "flow", "affinity: flow ∝ r"),
    step("Hc(Q/r)", "head of the given curve there", head.at(flow / r), "length", "PCHIP through the curve's points"),
  ]);
}

/** Trim diameter for a duty point: D2 = r·D1. Deeper trims than common practice trusts warn. */
export function trimDiameter(head: { min: number; max: number; at(q: number): number }, diameter: number, flow: number, dutyHead: number): CalcResult {
  if (!(diameter > 0 && Number.isFinite(diameter))) throw new CalcError("diameter", `expected the curve's impeller diameter, greater than zero; got ${diameter}`);
  const ratio = affinityRatioThrough(head, flow, dutyHead);
  const r = ratio.value;
  if (r > 1 + 1e-12) {
    throw new CalcError("head", `the duty needs an impeller ${((r - 1) * 100).toFixed(1)} % larger than the curve's ${diameter} m: a trim cannot add diameter; choose a larger impeller or speed`);
  }
  const warnings: string[] = [];
  if (r < 0.75) {
    warnings.push(`Trim to ${(r * 100).toFixed(1)} % of the diameter: below the 75 % or so most makers allow (common practice); efficiency falls and the affinity estimate is poor.`);
  } else if (r < 0.9) {
    warnings.push(`Trim of ${((1 - r) * 100).toFixed(1)} %: beyond about 10 % the affinity laws overstate head and flow (common practice); trim in steps or use the maker's trimmed curves.`);
  }
  return ok(r * diameter, warnings, ratio.steps);
}

/** Speed for a duty point: N2 = r·N1. */
export function speedForDuty(head: { min: number; max: number; at(q: number): number }, speed: number, flow: number, dutyHead: number): CalcResult {
  if (!(speed > 0 && Number.isFinite(speed))) throw new CalcError("speed", `expected the curve's speed, greater than zero; got ${speed}`);
  const ratio = affinityRatioThrough(head, flow, dutyHead);
  const r = ratio.value;
  const warnings = affinityScale(1, "flow", r).warnings;
  if (r > 1) warnings.push(`Speed ${(r * 100).toFixed(1)} % of the curve's: confirm the maker's maximum speed and the motor power, which rises as the cube of speed.`);
  return ok(r * speed, warnings, ratio.steps);
}

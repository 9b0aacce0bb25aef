/**
 * Cross-check of a hand calculation: the relative difference (hand − Nappe)/Nappe and whether it
 * is within a tolerance. Kept in the workbook as a worksheet formula, so that every check of the
 * workbook and every audit lists it with its verdict.
 */
import { CalcError, type CalcResult, ok, requireFinite, step } from "./_lib/result";

/** The tolerance a cross-check uses when none is given: 0.5 %. */
export const CROSSCHECK_TOLERANCE = 0.005;

export function crossCheck(hand: number, nappe: number, tolerance: number): CalcResult {
  requireFinite("hand", hand);
  requireFinite("nappe", nappe);
  if (nappe === 0) throw new CalcError("nappe", "is zero: a relative difference cannot be taken; compare the values directly");
  if (!(tolerance > 0 && tolerance < 1)) throw new CalcError("tolerance", `expected a fraction above 0 and below 1 (0.005 or "0.5%"); got ${tolerance}`);
  const difference = (hand - nappe) / nappe;
  const percent = (x: number) => `${(x * 100).toPrecision(3)} %`;
  // Far apart, a ratio reads better than a percentage ("41.0 times", never "4.10e+3 %").
  const how = Math.abs(difference) >= 10 ? `${Number((hand / nappe).toPrecision(3))} times Nappe's` : `${percent(Math.abs(difference))} ${difference > 0 ? "above" : "below"} Nappe's`;
  const warnings = Math.abs(difference) > tolerance ? [`Differs: the hand value is ${how} (tolerance ${percent(tolerance)}); the cross-check's diagnosis names the step that departs.`] : [];
  return ok(difference, warnings, [step("|Δ|/tol", "difference over the tolerance", Math.abs(difference) / tolerance, "ratio", Math.abs(difference) > tolerance ? "differs" : "agrees")]);
}

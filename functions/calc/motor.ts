/** Standard motor ratings: the next rating at or above a required power. */
import { CalcError, type CalcResult, ok, requireNonNegative, step } from "./_lib/result";

export const MOTOR_SERIES = ["nema", "iec"] as const;
type MotorSeries = (typeof MOTOR_SERIES)[number];

/** NEMA MG 1 horsepower ratings (fractional 1/2 and 3/4, integral to 1000 hp; from memory). */
export const NEMA_HP = [0.5, 0.75, 1, 1.5, 2, 3, 5, 7.5, 10, 15, 20, 25, 30, 40, 50, 60, 75, 100, 125, 150, 200, 250, 300, 350, 400, 450, 500, 600, 700, 800, 900, 1000];
/** IEC 60072-1 output ratings, kW (from memory). */
export const IEC_KW = [0.06, 0.09, 0.12, 0.18, 0.25, 0.37, 0.55, 0.75, 1.1, 1.5, 2.2, 3, 4, 5.5, 7.5, 11, 15, 18.5, 22, 30, 37, 45, 55, 75, 90, 110, 132, 160, 200, 250, 315, 355, 400, 450, 500, 560, 630, 710, 800, 900, 1000];

/** Mechanical horsepower, W (NIST SP 811: 550 ft·lbf/s). */
export const HORSEPOWER = 745.69987158227022;

/** Ratings of a series in W. */
function motorRatings(series: MotorSeries): number[] {
  return series === "nema" ? NEMA_HP.map((hp) => hp * HORSEPOWER) : IEC_KW.map((kw) => kw * 1000);
}

/** The largest rating of a series, W. */
export function largestRating(series: MotorSeries): number {
  const ratings = motorRatings(series);
  return ratings[ratings.length - 1];
}

/**
 * The smallest standard rating of at least power·(1 + margin), W. `arg` names the argument the
 * power came from in an error (the curve, when the power was found on it).
 */
export function motorSize(power: number, series: MotorSeries, margin: number, arg = "power"): CalcResult {
  requireNonNegative("power", power, "a power of zero or more");
  if (!(margin >= 0 && margin < 1)) throw new CalcError("margin", `expected a fraction from 0 to below 1 (0.15 for 15 %); got ${margin}`);
  const needed = power * (1 + margin);
  const ratings = motorRatings(series);
  const rating = ratings.find((r) => r >= needed * (1 - 1e-12));
  if (rating === undefined) {
    const largest = ratings[ratings.length - 1];
    // Four figures can print both as 745.7 kW when the power is a hair above the rating: then show more.
    const digits = (needed / 1000).toPrecision(4) === (largest / 1000).toPrecision(4) ? 8 : 4;
    throw new CalcError(arg, `${(needed / 1000).toPrecision(digits)} kW${arg === "power" ? "" : " (the largest shaft power on it)"} is above the largest ${series === "nema" ? "NEMA" : "IEC"} rating listed here (${(largest / 1000).toPrecision(digits)} kW)`);
  }
  const warnings = margin === 0 ? ["No margin added: size the motor for the largest power the pump can draw on its curve (end of curve), not only the duty point."] : [];
  return ok(rating, warnings, [step("P(1 + m)", "power to cover, margin added", needed, "power", "next rating at or above it")]);
}

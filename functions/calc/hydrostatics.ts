/** Hydrostatics: head of liquid and pressure, p = ρ·g·h. */
import { type CalcResult, ok, requireFinite, requirePositive } from "./_lib/result";
import { STANDARD_GRAVITY } from "./_lib/constants";

/** Head of liquid, m, equivalent to a pressure (or pressure difference) in Pa. */
export function headFromPressure(pressure: number, density: number): CalcResult {
  requireFinite("pressure", pressure);
  requirePositive("density", density, "a density greater than zero");
  return ok(pressure / (density * STANDARD_GRAVITY));
}

/** Pressure, Pa, of a column of liquid of the given head, m. */
export function pressureFromHead(head: number, density: number): CalcResult {
  requireFinite("head", head);
  requirePositive("density", density, "a density greater than zero");
  return ok(density * STANDARD_GRAVITY * head);
}

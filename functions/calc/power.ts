/** Hydraulic and shaft power of a pump: P = ρ·g·Q·H and P/η. */
import { CalcError, type CalcResult, ok, requireFinite, requireNonNegative, requirePositive, step } from "./_lib/result";
import { STANDARD_GRAVITY } from "./_lib/constants";

/** Throws unless η is a fraction in (0, 1]. */
export function requireEfficiency(arg: string, efficiency: number): void {
  if (!(Number.isFinite(efficiency) && efficiency > 0 && efficiency <= 1)) {
    throw new CalcError(arg, `expected an efficiency above 0 and at most 1 (0.78 or "78%"); got ${efficiency}`);
  }
}

/** Hydraulic (water) power, W: ρ·g·Q·H. */
export function hydraulicPower(flow: number, head: number, density: number): CalcResult {
  requireNonNegative("flow", flow, "a flow of zero or more");
  requireFinite("head", head);
  requirePositive("density", density, "a density greater than zero");
  return ok(density * STANDARD_GRAVITY * flow * head, [], [step("ρg", "specific weight, N/m³", density * STANDARD_GRAVITY, "ratio", "g = 9.80665 m/s²")]);
}

/** Shaft (brake) power, W: ρ·g·Q·H/η. */
export function shaftPower(flow: number, head: number, efficiency: number, density: number): CalcResult {
  requireEfficiency("efficiency", efficiency);
  const hydraulic = hydraulicPower(flow, head, density);
  const warnings = efficiency < 0.2 ? [`Efficiency ${efficiency} is unusually low for a centrifugal pump; check the input.`] : [];
  return ok(hydraulic.value / efficiency, warnings, [step("P_h", "hydraulic power ρgQH", hydraulic.value, "power", "g = 9.80665 m/s²"), step("η", "pump efficiency", efficiency, "efficiency", "as given")]);
}

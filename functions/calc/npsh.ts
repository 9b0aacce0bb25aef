/** Net positive suction head available, and the margin over the pump's NPSH required. */
import { type CalcResult, ok, requireFinite, requireNonNegative, requirePositive, step } from "./_lib/result";
import { STANDARD_GRAVITY } from "./_lib/constants";

/**
 * NPSHa, m: (p_s − p_v)/(ρ·g) + z − h_L, with p_s the absolute pressure on the liquid surface,
 * z the height of that surface above the impeller eye (negative for a suction lift) and h_L the
 * suction-line loss.
 */
export function npshAvailable(surfacePressure: number, liquidHeight: number, suctionLoss: number, vapourPressure: number, density: number): CalcResult {
  requirePositive("surface_pressure", surfacePressure, "an absolute surface pressure greater than zero");
  requireFinite("liquid_height", liquidHeight);
  requireNonNegative("suction_loss", suctionLoss, "a suction loss of zero or more");
  requirePositive("density", density, "a density greater than zero");
  const value = (surfacePressure - vapourPressure) / (density * STANDARD_GRAVITY) + liquidHeight - suctionLoss;
  const warnings: string[] = [];
  if (surfacePressure <= vapourPressure) {
    warnings.push("The surface pressure is at or below the vapour pressure: the liquid is boiling at the surface.");
  }
  if (value <= 0) warnings.push("NPSHa is zero or negative: any pump will cavitate here.");
  const rhoG = density * STANDARD_GRAVITY;
  return ok(value, warnings, [
    step("p_s/ρg", "surface pressure head (absolute)", surfacePressure / rhoG, "length", "p_s/(ρg), g = 9.80665 m/s²"),
    step("p_v/ρg", "vapour pressure head", vapourPressure / rhoG, "length", "IAPWS-IF97 region 4 vapour pressure over ρg"),
    step("z", "static head: liquid surface above the impeller eye", liquidHeight, "length", "as given (negative for a suction lift)"),
    step("h_L", "suction line loss", suctionLoss, "length", "as given"),
  ]);
}

/** Margin ratios of ANSI/HI 9.6.1 (values from memory: 1.1 at the least, up to 2.5 for high suction energy). */
const NPSH_MARGIN_MINIMUM = 1.1;

/** NPSH margin ratio NPSHa/NPSHr with warnings below the guideline. */
export function npshMargin(npsha: number, npshr: number): CalcResult {
  requireFinite("npsha", npsha);
  requirePositive("npshr", npshr, "an NPSH required greater than zero");
  const ratio = npsha / npshr;
  const warnings: string[] = [];
  if (ratio < 1) {
    warnings.push("NPSHa is below NPSHr: the pump will cavitate, losing head and eroding the impeller.");
  } else if (ratio < NPSH_MARGIN_MINIMUM) {
    warnings.push(`Margin ratio ${ratio.toFixed(2)} is below ${NPSH_MARGIN_MINIMUM}, the least ANSI/HI 9.6.1 suggests for any service; NPSHr is itself a 3 % head-drop point, so some cavitation is already present.`);
  } else if (ratio < 1.5) {
    warnings.push(`Margin ratio ${ratio.toFixed(2)}: ANSI/HI 9.6.1 asks for more (up to 2.5) on high suction energy pumps and some services; check the guideline for this application.`);
  }
  return ok(ratio, warnings, [step("NPSHa − NPSHr", "margin in head", npsha - npshr, "length", "difference")]);
}


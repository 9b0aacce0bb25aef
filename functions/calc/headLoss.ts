/** Head losses in full pipes: Darcy–Weisbach, Hazen–Williams and loss coefficients. */
import { CalcError, type CalcResult, ok, requireNonNegative, requirePositive, step, quoted } from "./_lib/result";
import { STANDARD_GRAVITY } from "./_lib/constants";
import { frictionFactor } from "./friction";
import { meanVelocity, reynoldsNumber } from "./pipeFlow";

/** Velocity head V²/2g, m. */
export function velocityHead(velocity: number): number {
  return (velocity * velocity) / (2 * STANDARD_GRAVITY);
}

/** Darcy–Weisbach major loss, m: h = f·(L/D)·V²/2g with f from Colebrook (64/Re when laminar). */
export function darcyHeadLoss(flow: number, diameter: number, length: number, roughness: number, kinematicViscosity: number): CalcResult {
  requireNonNegative("length", length, "a pipe length of zero or more");
  requireNonNegative("roughness", roughness, "an absolute roughness of zero or more");
  const v = meanVelocity(flow, diameter).value;
  if (flow === 0 || length === 0) return ok(0);
  const re = reynoldsNumber(flow, diameter, kinematicViscosity).value;
  if (roughness / diameter > 0.5) {
    throw new CalcError("roughness", `expected a roughness well below the inside diameter; got ε/D = ${(roughness / diameter).toPrecision(3)}`);
  }
  const f = frictionFactor(re, roughness / diameter, "colebrook");
  const warnings = [...f.warnings];
  if (v > 3) warnings.push(`Velocity ${quoted(v, "velocity")} is above the ${quoted(3, "velocity")} many designers use as a limit for water mains (common practice).`);
  const steps = [
    step("V", "mean velocity", v, "velocity", "continuity, V = 4Q/(πD²)"),
    step("Re", "Reynolds number", re, "ratio", "Re = VD/ν"),
    step("ε/D", "relative roughness", roughness / diameter, "ratio", "roughness over inside diameter"),
    step("f", "Darcy friction factor", f.value, "ratio", re < 2000 ? "64/Re (laminar)" : "Colebrook, solved to double precision"),
    step("V²/2g", "velocity head", velocityHead(v), "length", "g = 9.80665 m/s²"),
  ];
  return ok(((f.value * length) / diameter) * velocityHead(v), warnings, steps);
}

/** Hazen–Williams major loss, m, SI form: h = 10.67·L·Q^1.852/(C^1.852·D^4.8704). */
export function hazenWilliamsHeadLoss(flow: number, diameter: number, length: number, cFactor: number): CalcResult {
  requireNonNegative("length", length, "a pipe length of zero or more");
  requirePositive("c_factor", cFactor, "a Hazen–Williams C greater than zero");
  const v = meanVelocity(flow, diameter).value;
  const warnings: string[] = [];
  if (cFactor < 40 || cFactor > 160) warnings.push(`C = ${cFactor} is outside the usual 40 to 160 of published tables.`);
  if (diameter < 0.05) warnings.push("Hazen–Williams is meant for pipes of about 50 mm and larger.");
  if (v > 3) warnings.push(`Velocity ${quoted(v, "velocity")} is above about ${quoted(3, "velocity")}, where Hazen–Williams loses accuracy.`);
  const h = (10.67 * length * Math.pow(flow, 1.852)) / (Math.pow(cFactor, 1.852) * Math.pow(diameter, 4.8704));
  return ok(h, warnings, [step("V", "mean velocity", v, "velocity", "continuity, V = 4Q/(πD²)"), step("S", "hydraulic gradient, m per m of pipe", length > 0 ? h / length : 0, "ratio", "h/L")]);
}

/** Minor (local) loss, m: h = ΣK·V²/2g. */
export function minorHeadLoss(flow: number, diameter: number, kTotal: number): CalcResult {
  requireNonNegative("k_total", kTotal, "a sum of loss coefficients of zero or more");
  const v = meanVelocity(flow, diameter).value;
  return ok(kTotal * velocityHead(v), [], [step("V", "mean velocity", v, "velocity", "continuity, V = 4Q/(πD²)"), step("V²/2g", "velocity head", velocityHead(v), "length", "g = 9.80665 m/s²")]);
}

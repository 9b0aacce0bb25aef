/**
 * Darcy friction factor of full-pipe flow.
 *
 * - Colebrook (1939) solved to double precision by Clamond's (2009) scheme and one Newton step.
 * - Swamee & Jain (1976), Haaland (1983): explicit approximations of Colebrook.
 * - Churchill (1977): one equation over laminar, transitional and turbulent flow.
 * - Laminar flow (Re < 2000): f = 64/Re (Hagen–Poiseuille) for every method but Churchill's.
 */
import { CalcError, type CalcResult, ok, requireNonNegative, requirePositive, step } from "./_lib/result";

export const FRICTION_METHODS = ["colebrook", "swamee-jain", "haaland", "churchill"] as const;
type FrictionMethod = (typeof FRICTION_METHODS)[number];

/** Upper end of laminar flow and lower end of fully turbulent flow used here (common practice). */
const LAMINAR_LIMIT = 2000;
const TURBULENT_LIMIT = 4000;
const MAX_RELATIVE_ROUGHNESS = 0.5;
const MOODY_RELATIVE_ROUGHNESS = 0.05;

/** Swamee–Jain: f = 0.25/[log10(ε/3.7D + 5.74/Re^0.9)]². */
export function swameeJainFriction(re: number, relativeRoughness: number): number {
  const l = Math.log10(relativeRoughness / 3.7 + 5.74 / Math.pow(re, 0.9));
  return 0.25 / (l * l);
}

/** Haaland: 1/√f = −1.8·log10[(ε/3.7D)^1.11 + 6.9/Re]. */
export function haalandFriction(re: number, relativeRoughness: number): number {
  const x = -1.8 * Math.log10(Math.pow(relativeRoughness / 3.7, 1.11) + 6.9 / re);
  return 1 / (x * x);
}

/** Churchill (1977): f = 8·[(8/Re)^12 + (A + B)^−1.5]^(1/12). */
export function churchillFriction(re: number, relativeRoughness: number): number {
  const A = Math.pow(2.457 * Math.log(1 / (Math.pow(7 / re, 0.9) + 0.27 * relativeRoughness)), 16);
  const B = Math.pow(37530 / re, 16);
  return 8 * Math.pow(Math.pow(8 / re, 12) + Math.pow(A + B, -1.5), 1 / 12);
}

/**
 * Colebrook: 1/√f = −2·log10(ε/3.7D + 2.51/(Re·√f)). Solved by D. Clamond's scheme ("Efficient
 * resolution of the Colebrook equation", Ind. Eng. Chem. Res. 48 (2009) 3665–3671): one of its
 * third-order iterations, on the paper's variable F = ln10/(2√f) from its own starting value
 * (relative error below about 1e-4, worst near Re = 2000), then Newton steps on x = 1/√f until a
 * step is below 1e-8·x. Newton converges quadratically here (the error after a step is about
 * 0.1·step²), so the last step leaves an error far below the last bit: against mpmath at 40
 * digits it is within 7e-16 over Re 2000–1e9 and ε/D 0–0.5 (test/friction.test.ts; a 20 000-point
 * grid was checked the same way). Usually one Newton step, two near the laminar limit.
 */
export function colebrookFriction(re: number, relativeRoughness: number): number {
  const x1 = relativeRoughness * re * 0.123968186335417556; // ε/D·Re·ln10/18.574
  const x2 = Math.log(re) - 0.779397488455682028; // ln(Re·ln10/5.02)
  const s = x1 + x2 - 0.2; // x1 + F at the starting value F = x2 − 0.2
  const e = (Math.log(s) - 0.2) / (1 + s);
  const F = x2 - 0.2 - ((1 + s + 0.5 * e) * e * s) / (1 + s + e * (1 + e / 3));
  const twoOverLn10 = 0.868588963806503655; // 2/ln10
  let x = F * twoOverLn10; // 1/√f = 2F/ln10
  const a = relativeRoughness / 3.7;
  const b = 2.51 / re;
  for (let i = 0; i < 50; i++) {
    const inner = a + b * x;
    const step = (x + twoOverLn10 * Math.log(inner)) / (1 + (twoOverLn10 * b) / inner);
    x -= step;
    if (Math.abs(step) <= 1e-8 * x) return 1 / (x * x);
  }
  throw new CalcError("reynolds", "the Colebrook equation did not converge for these inputs");
}

const EXPLICIT: Record<FrictionMethod, (re: number, rr: number) => number> = {
  colebrook: colebrookFriction,
  "swamee-jain": swameeJainFriction,
  haaland: haalandFriction,
  churchill: churchillFriction,
};

/** Darcy friction factor for a Reynolds number and relative roughness ε/D by the chosen method. */
export function frictionFactor(re: number, relativeRoughness: number, method: FrictionMethod = "colebrook"): CalcResult {
  requirePositive("reynolds", re, "a Reynolds number greater than zero");
  requireNonNegative("relative_roughness", relativeRoughness, "a relative roughness ε/D of zero or more");
  if (relativeRoughness > MAX_RELATIVE_ROUGHNESS) {
    throw new CalcError("relative_roughness", `expected ε/D below ${MAX_RELATIVE_ROUGHNESS} (roughness over inside diameter); got ${relativeRoughness}`);
  }
  const warnings: string[] = [];
  if (relativeRoughness > MOODY_RELATIVE_ROUGHNESS) {
    warnings.push(`Relative roughness ${relativeRoughness} is beyond the Moody chart (ε/D ≤ 0.05); the friction factor is an extrapolation.`);
  }
  if (method !== "churchill" && re < LAMINAR_LIMIT) {
    return ok(64 / re, warnings, [step("Re", "Reynolds number, laminar (below 2000)", re, "ratio", "as given; f = 64/Re (Hagen–Poiseuille)")]);
  }
  if (re < TURBULENT_LIMIT) {
    warnings.push(`Re = ${re.toPrecision(4)} is transitional (2000 to 4000): the flow may be laminar or turbulent and the friction factor is uncertain.`);
  }
  if (method === "swamee-jain" && !(re >= 5000 && re <= 1e8 && relativeRoughness >= 1e-6 && relativeRoughness <= 1e-2)) {
    warnings.push("Outside the Swamee–Jain range (5000 ≤ Re ≤ 1e8, 1e-6 ≤ ε/D ≤ 0.01); its error against Colebrook may exceed 1 %.");
  }
  if (method === "haaland" && !(re >= 4000 && re <= 1e8)) {
    warnings.push("Outside the Haaland range (4000 ≤ Re ≤ 1e8); its error against Colebrook may exceed 1.5 %.");
  }
  const f = EXPLICIT[method](re, relativeRoughness);
  const how = method === "colebrook" ? "Colebrook, 1/√f = −2 log₁₀(ε/3.7D + 2.51/(Re√f)), solved to double precision" : `${method === "swamee-jain" ? "Swamee–Jain" : method === "haaland" ? "Haaland" : "Churchill (1977)"} explicit formula`;
  return ok(f, warnings, [step("Re", "Reynolds number", re, "ratio", "as given"), step("ε/D", "relative roughness", relativeRoughness, "ratio", "as given"), step("f", "Darcy friction factor", f, "ratio", how)]);
}

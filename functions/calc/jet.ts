/** Free jets and nozzles: Torricelli velocity, projectile rise and throw (drag neglected), nozzle flow. */
import { CalcError, type CalcResult, ok, requireFinite, requireNonNegative, requirePositive, step } from "./_lib/result";
import { STANDARD_GRAVITY as g } from "./_lib/constants";
import { pipeArea } from "./pipeFlow";

function requireCoefficient(arg: string, c: number): void {
  if (!(Number.isFinite(c) && c > 0 && c <= 1)) throw new CalcError(arg, `expected a coefficient above 0 and at most 1; got ${c}`);
}

function requireAngle(angle: number): void {
  if (!(Number.isFinite(angle) && angle >= 0 && angle <= 90)) {
    throw new CalcError("angle", `expected an elevation angle from 0° (horizontal) to 90° (vertical); got ${angle}°`);
  }
}

/** Jet velocity, m/s, from the head across a nozzle: v = Cv·√(2gh). */
export function jetVelocity(head: number, velocityCoefficient: number): CalcResult {
  requireNonNegative("height", head, "a head of zero or more");
  requireCoefficient("velocity_coefficient", velocityCoefficient);
  return ok(velocityCoefficient * Math.sqrt(2 * g * head), [], [step("√(2gh)", "ideal (Torricelli) velocity", Math.sqrt(2 * g * head), "velocity", "g = 9.80665 m/s²")]);
}

/** Rise of a jet above the nozzle, m: (v·sinθ)²/2g with air drag neglected. */
export function jetHeight(velocity: number, angleDeg: number): CalcResult {
  requireNonNegative("velocity", velocity, "a jet velocity of zero or more");
  requireAngle(angleDeg);
  const vy = velocity * Math.sin((angleDeg * Math.PI) / 180);
  return ok((vy * vy) / (2 * g), [DRAG_WARNING], [step("v·sinθ", "vertical velocity at the nozzle", vy, "velocity", "component along the vertical")]);
}

/**
 * Horizontal throw of a jet, m, with air drag neglected, landing `drop` metres below the nozzle
 * (negative: above it): x = v·cosθ·t with t the later root of drop + v·sinθ·t − g·t²/2 = 0.
 */
export function jetReach(velocity: number, angleDeg: number, drop: number): CalcResult {
  requireNonNegative("velocity", velocity, "a jet velocity of zero or more");
  requireAngle(angleDeg);
  requireFinite("drop", drop);
  const rad = (angleDeg * Math.PI) / 180;
  const vx = velocity * Math.cos(rad);
  const vy = velocity * Math.sin(rad);
  const disc = vy * vy + 2 * g * drop;
  if (disc < 0) {
    throw new CalcError("drop", `the jet rises only ${((vy * vy) / (2 * g)).toPrecision(4)} m, so it cannot land ${-drop} m above the nozzle`);
  }
  const t = (vy + Math.sqrt(disc)) / g;
  return ok(vx * t, [DRAG_WARNING], [
    step("v·cosθ", "horizontal velocity", vx, "velocity", "component along the horizontal"),
    step("v·sinθ", "vertical velocity at the nozzle", vy, "velocity", "component along the vertical"),
    step("t", "time of flight, s", t, "ratio", "later root of Δz + v·sinθ·t − g·t²/2 = 0"),
  ]);
}

/** Flow through a nozzle or orifice, m³/s: Q = Cd·(πD²/4)·√(2gh). */
export function nozzleFlow(diameter: number, head: number, dischargeCoefficient: number): CalcResult {
  requirePositive("diameter", diameter, "a nozzle diameter greater than zero");
  requireNonNegative("head", head, "a head of zero or more");
  requireCoefficient("discharge_coefficient", dischargeCoefficient);
  return ok(dischargeCoefficient * pipeArea(diameter) * Math.sqrt(2 * g * head), [], [
    step("A", "outlet area", pipeArea(diameter), "area", "πD²/4"),
    step("√(2gh)", "ideal jet velocity", Math.sqrt(2 * g * head), "velocity", "g = 9.80665 m/s²"),
  ]);
}

const DRAG_WARNING =
  "Air drag and jet break-up are neglected: real jets of any size rise and throw noticeably less; use the nozzle maker's data for design.";

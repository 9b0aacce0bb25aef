/** Pressure surge (water hammer): Korteweg wave speed and the Joukowsky pressure rise. */
import { STANDARD_GRAVITY } from "./_lib/constants";
import { type CalcResult, CalcError, ok, requireFinite, requirePositive, step } from "./_lib/result";

/** Bulk modulus of water used by default, Pa (about 2.2 GPa near 20 °C; common practice). */
export const WATER_BULK_MODULUS = 2.2e9;

/** a = √((K/ρ)/(1 + c·K·D/(E·e))). */
export function waveSpeed(diameter: number, wall: number, pipeModulus: number, bulkModulus: number, density: number, restraint: number): CalcResult {
  requirePositive("diameter", diameter, "an inside diameter greater than zero");
  requirePositive("wall", wall, "a wall thickness greater than zero");
  requirePositive("pipe_modulus", pipeModulus, "an elastic modulus greater than zero");
  requirePositive("bulk_modulus", bulkModulus, "a bulk modulus greater than zero");
  requirePositive("density", density, "a density greater than zero");
  if (!(restraint >= 0 && restraint <= 1.5)) throw new CalcError("restraint", `expected a restraint factor c from 0 to about 1 (1 for a pipe with expansion joints; 1 − ν² for a pipe anchored against axial movement); got ${restraint}`);
  const warnings: string[] = [];
  if (wall >= diameter / 2) warnings.push("A wall thicker than the radius: the thin-wall Korteweg formula does not hold.");
  else if (diameter / wall < 25) warnings.push("D/e below 25: a thick-wall correction of the restraint factor may be needed.");
  const stiffness = 1 + (restraint * bulkModulus * diameter) / (pipeModulus * wall);
  return ok(Math.sqrt(bulkModulus / density / stiffness), warnings, [
    step("√(K/ρ)", "wave speed in the liquid alone", Math.sqrt(bulkModulus / density), "velocity", "rigid pipe"),
    step("1 + cKD/(Ee)", "wall elasticity factor", stiffness, "ratio", "Korteweg"),
  ]);
}

/** Δp = ρ·a·Δv for a change of velocity faster than the wave's round trip 2L/a. */
export function surgePressure(waveSpeedValue: number, velocityChange: number, density: number): CalcResult {
  requirePositive("wave_speed", waveSpeedValue, "a wave speed greater than zero");
  requireFinite("velocity_change", velocityChange);
  requirePositive("density", density, "a density greater than zero");
  return ok(density * waveSpeedValue * Math.abs(velocityChange), [
    "Joukowsky holds for a change faster than 2L/a; slower closures give less, but column separation and reflections can give more.",
  ], [step("Δp/ρg", "pressure rise as head of liquid", waveSpeedValue * Math.abs(velocityChange) / STANDARD_GRAVITY, "length", "a·Δv/g, g = 9.80665 m/s²")]);
}

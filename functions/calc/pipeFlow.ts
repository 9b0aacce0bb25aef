/** Mean velocity and Reynolds number of full-pipe flow (continuity; definition of Re). */
import { type CalcResult, ok, requireNonNegative, requirePositive, step } from "./_lib/result";

/** Flow area of a round pipe, m², from its inside diameter, m. */
export function pipeArea(diameter: number): number {
  return (Math.PI * diameter * diameter) / 4;
}

/** Mean velocity, m/s: V = 4Q/(πD²). */
export function meanVelocity(flow: number, diameter: number): CalcResult {
  requireNonNegative("flow", flow, "a flow of zero or more");
  requirePositive("diameter", diameter, "an inside diameter greater than zero");
  const area = pipeArea(diameter);
  return ok(flow / area, [], [step("A", "flow area", area, "ratio", "πD²/4, m²")]);
}

/** Reynolds number: Re = V·D/ν = 4Q/(π·D·ν). */
export function reynoldsNumber(flow: number, diameter: number, kinematicViscosity: number): CalcResult {
  requireNonNegative("flow", flow, "a flow of zero or more");
  requirePositive("diameter", diameter, "an inside diameter greater than zero");
  requirePositive("kinematic_viscosity", kinematicViscosity, "a kinematic viscosity greater than zero");
  const v = flow / pipeArea(diameter);
  return ok((4 * flow) / (Math.PI * diameter * kinematicViscosity), [], [step("V", "mean velocity", v, "velocity", "continuity, V = 4Q/(πD²)"), step("ν", "kinematic viscosity", kinematicViscosity, "kinematicViscosity", "as given")]);
}

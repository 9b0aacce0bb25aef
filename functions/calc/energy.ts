/** Annual pumping energy: E = ρ·g·Q·H/(η_pump·η_motor) × running time. */
import { type CalcResult, CalcError, ok } from "./_lib/result";
import { requireEfficiency, shaftPower } from "./power";

/** Energy, J, over `seconds` of running at the duty. */
export function annualEnergy(flow: number, head: number, efficiency: number, seconds: number, motorEfficiency: number, density: number): CalcResult {
  requireEfficiency("motor_efficiency", motorEfficiency);
  if (!(seconds >= 0 && seconds <= 366 * 86400)) throw new CalcError("hours", `expected running time from 0 to 8784 h in a year; got ${(seconds / 3600).toPrecision(6)} h`);
  const shaft = shaftPower(flow, head, efficiency, density);
  return ok((shaft.value / motorEfficiency) * seconds, shaft.warnings);
}

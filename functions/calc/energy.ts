/** Annual pumping energy: E = ρ·g·Q·H/(η_pump·η_motor) × running time. */
import { type CalcResult, CalcError, ok, step } from "./_lib/result";
import { requireEfficiency, shaftPower } from "./power";

const SECONDS_PER_HOUR = 3600;

/** Energy, J, over `hours` of running at the duty (hours: the running-time dimension's base unit). */
export function annualEnergy(flow: number, head: number, efficiency: number, hours: number, motorEfficiency: number, density: number): CalcResult {
  requireEfficiency("motor_efficiency", motorEfficiency);
  if (!(hours >= 0 && hours <= 366 * 24)) throw new CalcError("hours", `expected running time from 0 to 8784 h in a year; got ${hours.toPrecision(6)} h`);
  const seconds = hours * SECONDS_PER_HOUR;
  const shaft = shaftPower(flow, head, efficiency, density);
  return ok((shaft.value / motorEfficiency) * seconds, shaft.warnings, [
    step("P", "shaft power ρgQH/η", shaft.value, "power", "g = 9.80665 m/s²"),
    step("P/η_m", "electrical input power", shaft.value / motorEfficiency, "power", "over the motor (and drive) efficiency"),
    step("t", "running time", hours, "time", "as given"),
  ]);
}

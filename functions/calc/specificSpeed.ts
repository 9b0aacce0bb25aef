/**
 * Specific speed Ns = N·√Q/H^0.75 and suction specific speed Nss = N·√Q/NPSHr^0.75, at the
 * best-efficiency point, Q per impeller eye. The convention names the units Ns is expressed in.
 */
import { CalcError, type CalcResult, ok, step, type Step } from "./_lib/result";
import { STANDARD_GRAVITY } from "./_lib/constants";

export const SPEED_CONVENTIONS = ["si", "us", "dimensionless"] as const;
type SpeedConvention = (typeof SPEED_CONVENTIONS)[number];

const GPM = 3.785411784e-3 / 60;
const FOOT = 0.3048;

/** N·√Q/H^0.75 in the convention's units, from rpm, m³/s and m. */
export function specificSpeedValue(speedRpm: number, flow: number, head: number, convention: SpeedConvention): number {
  switch (convention) {
    case "si":
      return (speedRpm * Math.sqrt(flow)) / Math.pow(head, 0.75);
    case "us":
      return (speedRpm * Math.sqrt(flow / GPM)) / Math.pow(head / FOOT, 0.75);
    case "dimensionless":
      return ((speedRpm * 2 * Math.PI) / 60) * Math.sqrt(flow) / Math.pow(STANDARD_GRAVITY * head, 0.75);
  }
}

function check(speed: number, flow: number, head: number, headArg: string): void {
  if (!(speed > 0 && Number.isFinite(speed))) throw new CalcError("speed", `expected a speed greater than zero; got ${speed}`);
  if (!(flow > 0 && Number.isFinite(flow))) throw new CalcError("flow", `expected a flow greater than zero; got ${flow}`);
  if (!(head > 0 && Number.isFinite(head))) throw new CalcError(headArg, `expected a value greater than zero; got ${head}`);
}

/** The flow and head (or NPSHr) as the convention writes them. */
function conventionSteps(speed: number, flow: number, head: number, convention: SpeedConvention, headName: string): Step[] {
  if (convention === "us") return [step("Q", "flow in gpm", flow / GPM, "ratio", "US convention: rpm, gpm, ft"), step("H", `${headName} in ft`, head / FOOT, "ratio", "US convention")];
  if (convention === "dimensionless") return [step("ω", "angular speed, rad/s", (speed * 2 * Math.PI) / 60, "ratio", "2πN/60"), step("gH", `g times ${headName}, J/kg`, STANDARD_GRAVITY * head, "ratio", "g = 9.80665 m/s²")];
  return [step("Q", "flow in m³/s", flow, "ratio", "SI convention: rpm, m³/s, m"), step("H", `${headName} in m`, head, "ratio", "SI convention")];
}

/** Pump specific speed at the best-efficiency point. */
export function specificSpeed(speed: number, flow: number, head: number, convention: SpeedConvention): CalcResult {
  check(speed, flow, head, "head");
  return ok(specificSpeedValue(speed, flow, head, convention), [], conventionSteps(speed, flow, head, convention, "head"));
}

/** Suction specific speed; warns above the range where suction recirculation trouble is common. */
export function suctionSpecificSpeed(speed: number, flow: number, npshr: number, convention: SpeedConvention): CalcResult {
  check(speed, flow, npshr, "npshr");
  const us = specificSpeedValue(speed, flow, npshr, "us");
  const warnings =
    us > 11000
      ? [`Nss = ${Math.round(us)} (US units) is above about 11 000, where many users and ANSI/HI 9.6.1 expect more trouble from suction recirculation; keep away from low flows.`]
      : [];
  return ok(specificSpeedValue(speed, flow, npshr, convention), warnings, conventionSteps(speed, flow, npshr, convention, "NPSHr"));
}

/**
 * Welded and seamless wrought steel pipe (ASME B36.10M) and stainless steel pipe
 * (ASME B36.19M, "S" schedules): outside diameter and wall thickness by nominal pipe size and
 * schedule, NPS 1/8 to 24. Values in inches as the standards tabulate them (transcribed from
 * memory of the standards' tables; the tests check well-known sizes).
 */
import { CalcError, type CalcResult, ok, step } from "./_lib/result";

const INCH = 0.0254;

/** Nominal sizes in the order of the wall-thickness rows below. */
const NPS = ["1/8", "1/4", "3/8", "1/2", "3/4", "1", "1-1/4", "1-1/2", "2", "2-1/2", "3", "3-1/2", "4", "5", "6", "8", "10", "12", "14", "16", "18", "20", "24"] as const;
const OD = [0.405, 0.54, 0.675, 0.84, 1.05, 1.315, 1.66, 1.9, 2.375, 2.875, 3.5, 4, 4.5, 5.563, 6.625, 8.625, 10.75, 12.75, 14, 16, 18, 20, 24];

// Wall thickness, in, per schedule, one entry per NPS above (0 = not listed in the standard).
const WALL: Record<string, number[]> = {
  "5S": [0, 0, 0, 0.065, 0.065, 0.065, 0.065, 0.065, 0.065, 0.083, 0.083, 0.083, 0.083, 0.109, 0.109, 0.109, 0.134, 0.156, 0.156, 0.165, 0.165, 0.188, 0.218],
  "10S": [0.049, 0.065, 0.065, 0.083, 0.083, 0.109, 0.109, 0.109, 0.109, 0.12, 0.12, 0.12, 0.12, 0.134, 0.134, 0.148, 0.165, 0.18, 0.188, 0.188, 0.188, 0.218, 0.25],
  "10": [0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0.25, 0.25, 0.25, 0.25, 0.25],
  "20": [0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0.25, 0.25, 0.25, 0.312, 0.312, 0.312, 0.375, 0.375],
  "30": [0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0.277, 0.307, 0.33, 0.375, 0.375, 0.438, 0.5, 0.562],
  "40": [0.068, 0.088, 0.091, 0.109, 0.113, 0.133, 0.14, 0.145, 0.154, 0.203, 0.216, 0.226, 0.237, 0.258, 0.28, 0.322, 0.365, 0.406, 0.438, 0.5, 0.562, 0.594, 0.688],
  STD: [0.068, 0.088, 0.091, 0.109, 0.113, 0.133, 0.14, 0.145, 0.154, 0.203, 0.216, 0.226, 0.237, 0.258, 0.28, 0.322, 0.365, 0.375, 0.375, 0.375, 0.375, 0.375, 0.375],
  "40S": [0.068, 0.088, 0.091, 0.109, 0.113, 0.133, 0.14, 0.145, 0.154, 0.203, 0.216, 0.226, 0.237, 0.258, 0.28, 0.322, 0.365, 0.375, 0, 0, 0, 0, 0],
  "60": [0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0.406, 0.5, 0.562, 0.594, 0.656, 0.75, 0.812, 0.969],
  "80": [0.095, 0.119, 0.126, 0.147, 0.154, 0.179, 0.191, 0.2, 0.218, 0.276, 0.3, 0.318, 0.337, 0.375, 0.432, 0.5, 0.594, 0.688, 0.75, 0.844, 0.938, 1.031, 1.219],
  XS: [0.095, 0.119, 0.126, 0.147, 0.154, 0.179, 0.191, 0.2, 0.218, 0.276, 0.3, 0.318, 0.337, 0.375, 0.432, 0.5, 0.5, 0.5, 0.5, 0.5, 0.5, 0.5, 0.5],
  "80S": [0.095, 0.119, 0.126, 0.147, 0.154, 0.179, 0.191, 0.2, 0.218, 0.276, 0.3, 0.318, 0.337, 0.375, 0.432, 0.5, 0.5, 0.5, 0, 0, 0, 0, 0],
  "100": [0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0.594, 0.719, 0.844, 0.938, 1.031, 1.156, 1.281, 1.531],
  "120": [0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0.438, 0.5, 0.562, 0.719, 0.844, 1, 1.094, 1.219, 1.375, 1.5, 1.812],
  "140": [0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0.812, 1, 1.125, 1.25, 1.438, 1.562, 1.75, 2.062],
  "160": [0, 0, 0, 0.188, 0.219, 0.25, 0.25, 0.281, 0.344, 0.375, 0.438, 0, 0.531, 0.625, 0.719, 0.906, 1.125, 1.312, 1.406, 1.594, 1.781, 1.969, 2.344],
  XXS: [0, 0, 0, 0.294, 0.308, 0.358, 0.382, 0.4, 0.436, 0.552, 0.6, 0, 0.674, 0.75, 0.864, 0.875, 1, 1, 0, 0, 0, 0, 0],
};

export const PIPE_SCHEDULES = Object.keys(WALL);

/** Normalises a nominal size: 6, "6", "1-1/2", "1 1/2", "1.5", 1.25 → the table's spelling. */
function normaliseNps(nps: number | string): string | undefined {
  const text = String(nps).trim().replace(/"|in$|inch$/i, "").trim();
  if (NPS.includes(text as (typeof NPS)[number])) return text;
  const mixed = /^(\d+)[\s-]+(\d)\/(\d)$/.exec(text);
  const value = mixed ? Number(mixed[1]) + Number(mixed[2]) / Number(mixed[3]) : /^\d\/\d$/.test(text) ? Number(text[0]) / Number(text[2]) : Number(text);
  if (!Number.isFinite(value)) return undefined;
  return NPS.find((n) => {
    const m = /^(?:(\d+)-)?(?:(\d)\/(\d))?$|^(\d+)$/.exec(n)!;
    const v = m[4] !== undefined ? Number(m[4]) : Number(m[1] ?? 0) + (m[2] ? Number(m[2]) / Number(m[3]) : 0);
    return Math.abs(v - value) < 1e-9;
  });
}

/** Normalises a schedule: 40, "40", "Sch 40", "std", "xs", "40s", "XXS". */
function normaliseSchedule(schedule: number | string): string | undefined {
  const text = String(schedule).trim().toUpperCase().replace(/^(SCH(EDULE)?\.?\s*)/, "");
  return PIPE_SCHEDULES.includes(text) ? text : undefined;
}

interface PipeDimensions {
  outside: number;
  wall: number;
  inside: number;
}

/** Outside diameter, wall and inside diameter, m. */
export function pipeDimensions(nps: number | string, schedule: number | string): PipeDimensions {
  const size = normaliseNps(nps);
  if (!size) throw new CalcError("nps", `"${nps}" is not a nominal pipe size listed here (NPS ${NPS[0]} to ${NPS[NPS.length - 1]}, such as 6 or "1-1/2")`, "value");
  const sch = normaliseSchedule(schedule);
  if (!sch) throw new CalcError("schedule", `"${schedule}" is not a schedule listed here (${PIPE_SCHEDULES.join(", ")})`, "value");
  const i = NPS.indexOf(size as (typeof NPS)[number]);
  const wall = WALL[sch][i];
  if (!wall) throw new CalcError("schedule", `ASME ${sch.endsWith("S") ? "B36.19M" : "B36.10M"} lists no schedule ${sch} for NPS ${size}`, "value");
  return { outside: OD[i] * INCH, wall: wall * INCH, inside: (OD[i] - 2 * wall) * INCH };
}

/** Inside diameter, m. */
export function pipeInsideDiameter(nps: number | string, schedule: number | string): CalcResult {
  const d = pipeDimensions(nps, schedule);
  return ok(d.inside, [], [
    step("OD", "outside diameter", d.outside, "length", "ASME B36.10M / B36.19M table for the size"),
    step("t", "nominal wall thickness", d.wall, "length", "ASME B36.10M / B36.19M table for the size and schedule"),
  ]);
}

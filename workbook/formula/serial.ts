/**
 * Excel's serial dates (the 1900 date system): 1 is 1 January 1900, and 60 the 29 February 1900
 * that Excel keeps for compatibility ("Date systems in Excel"). Small on purpose: the recalculation
 * reads dated cells with it before the function library has loaded.
 */
const DAY_MS = 86400000;

/** The serial number of a date (month and day may overflow, as DATE allows). */
export function serialOf(y: number, m: number, d: number): number {
  const t = Date.UTC(y, m - 1, 1) + (d - 1) * DAY_MS;
  const days = Math.round((t - Date.UTC(1899, 11, 31)) / DAY_MS);
  // Excel counts a 29 February 1900: every date from 1 March 1900 is one more.
  return days >= 60 ? days + 1 : days;
}

/** An ISO date-time ("2026-01-15T00:00:00.000Z", as the reader writes dated cells) as a serial number. */
export function serialFromIso(s: string): number | undefined {
  const m = /^(\d{4})-(\d{2})-(\d{2})(?:[T ](\d{2}):(\d{2})(?::(\d{2}(?:\.\d+)?))?(?:Z|[+-]00:?00)?)?$/.exec(s);
  if (!m) return undefined;
  const day = serialOf(Number(m[1]), Number(m[2]), Number(m[3]));
  const time = m[4] ? (Number(m[4]) * 3600 + Number(m[5]) * 60 + Number(m[6] ?? 0)) / 86400 : 0;
  return day + time;
}

/** Year, month, day, weekday of a serial date in Excel's 1900 system (serial 60 is the 29 February 1900 it keeps). */
export function dateParts(serial: number): { y: number; m: number; d: number; wd: number } {
  const day = Math.floor(serial);
  if (day === 60) return { y: 1900, m: 2, d: 29, wd: 3 };
  const offset = day < 60 ? day : day - 1;
  const t = new Date(Date.UTC(1899, 11, 31) + offset * 86400000);
  return { y: t.getUTCFullYear(), m: t.getUTCMonth() + 1, d: t.getUTCDate(), wd: (day + 6) % 7 };
}


/**
 * Date and time functions over Excel's serial dates (the 1900 date system: 1 is 1 January 1900,
 * and 60 the 29 February 1900 that Excel keeps for compatibility), each written from its page in
 * Microsoft's Excel function reference ("Date and time functions (reference)").
 */
import { err, type Value } from "../values";
import { def, type Defs, num, numeric, optNum, text, array, flat } from "./_lib";
import { dateParts, serialFromIso, serialOf } from "../serial";
import type { Ctx } from "../evaluate";

const MONTH_NAMES = ["jan", "feb", "mar", "apr", "may", "jun", "jul", "aug", "sep", "oct", "nov", "dec"];

/** Date or time text as DATEVALUE/TIMEVALUE and VALUE read it (ISO dates, "15 Jan 2026", "Jan 15, 2026", "1/15/2026" as US, "13:30", "1:30 PM"). */
export function dateSerialFromText(s: string): number | undefined {
  const t = s.trim();
  const iso = serialFromIso(t);
  if (iso !== undefined) return iso;
  const time = /^(\d{1,2}):(\d{2})(?::(\d{2}(?:\.\d+)?))?\s*(AM|PM)?$/i.exec(t);
  if (time) {
    let h = Number(time[1]);
    if (time[4]) {
      if (h > 12) return undefined;
      h = (h % 12) + (time[4].toUpperCase() === "PM" ? 12 : 0);
    }
    return (h * 3600 + Number(time[2]) * 60 + Number(time[3] ?? 0)) / 86400;
  }
  let m = /^(\d{1,2})[\s-]([A-Za-z]{3,})[\s-,]*(\d{4})$/.exec(t);
  if (m) {
    const mo = MONTH_NAMES.indexOf(m[2].slice(0, 3).toLowerCase());
    return mo < 0 ? undefined : serialOf(Number(m[3]), mo + 1, Number(m[1]));
  }
  m = /^([A-Za-z]{3,})\s+(\d{1,2}),?\s+(\d{4})$/.exec(t);
  if (m) {
    const mo = MONTH_NAMES.indexOf(m[1].slice(0, 3).toLowerCase());
    return mo < 0 ? undefined : serialOf(Number(m[3]), mo + 1, Number(m[2]));
  }
  m = /^(\d{1,2})\/(\d{1,2})\/(\d{4})$/.exec(t);
  if (m) return serialOf(Number(m[3]), Number(m[1]), Number(m[2]));
  return undefined;
}

function serialArg(v: Value): number {
  if (typeof v === "string") {
    const n = dateSerialFromText(v);
    if (n === undefined) {
      const x = Number(v);
      if (v.trim() && Number.isFinite(x)) return x;
      throw err("#VALUE!", `"${v}" is not a date`);
    }
    return n;
  }
  const n = num(v);
  if (n < 0) throw err("#NUM!", "a date before 1900");
  return n;
}

function parts(v: Value) {
  return dateParts(serialArg(v));
}

function daysInMonth(y: number, m: number): number {
  return new Date(Date.UTC(y, m, 0)).getUTCDate();
}

function addMonths(serial: number, months: number, endOfMonth: boolean): number {
  const { y, m, d } = dateParts(serial);
  const total = y * 12 + (m - 1) + Math.trunc(months);
  const ny = Math.floor(total / 12);
  const nm = (total % 12) + 1;
  if (endOfMonth) return serialOf(ny, nm, daysInMonth(ny, nm));
  return serialOf(ny, nm, Math.min(d, daysInMonth(ny, nm)));
}

function holidays(args: Value[], i: number, c: Ctx): Set<number> {
  if (args.length <= i || args[i] === null) return new Set();
  return new Set(flat(array(args[i], c)).filter((v) => v !== null).map((v) => Math.floor(serialArg(v as Value))));
}

const isWeekend = (serial: number) => {
  const wd = dateParts(serial).wd;
  return wd === 0 || wd === 6;
};

function now(): number {
  const t = Date.now();
  const d = new Date(t);
  return serialOf(d.getFullYear(), d.getMonth() + 1, d.getDate()) + (d.getHours() * 3600 + d.getMinutes() * 60 + d.getSeconds()) / 86400;
}

export const DATE: Defs = {
  DATE: numeric(3, 3, ([y, m, d]) => {
    let year = Math.trunc(y);
    if (year < 0 || year > 9999) return err("#NUM!", "DATE: year 0 to 9999");
    if (year < 1900) year += 1900;
    const s = serialOf(year, Math.trunc(m), Math.trunc(d));
    return s < 0 ? err("#NUM!", "DATE: a date before 1900") : s;
  }),
  DATEDIF: def(3, 3, "s", (args) => {
    const a = serialArg(args[0]);
    const b = serialArg(args[1]);
    const unit = text(args[2]).toUpperCase();
    if (a > b) return err("#NUM!", "DATEDIF: the start date is after the end date");
    const p = dateParts(a);
    const q = dateParts(b);
    let months = (q.y - p.y) * 12 + (q.m - p.m);
    if (q.d < p.d) months--;
    switch (unit) {
      case "D":
        return Math.floor(b) - Math.floor(a);
      case "M":
        return months;
      case "Y":
        return Math.floor(months / 12);
      case "YM":
        return months % 12;
      case "MD":
        return q.d >= p.d ? q.d - p.d : q.d + daysInMonth(q.m === 1 ? q.y - 1 : q.y, q.m === 1 ? 12 : q.m - 1) - p.d;
      case "YD": {
        let start = serialOf(q.y, p.m, p.d);
        if (start > Math.floor(b)) start = serialOf(q.y - 1, p.m, p.d);
        return Math.floor(b) - start;
      }
      default:
        return err("#NUM!", 'DATEDIF: unit is "Y", "M", "D", "MD", "YM" or "YD"');
    }
  }),
  DATEVALUE: def(1, 1, "s", ([v]) => {
    const n = dateSerialFromText(text(v));
    return n === undefined ? err("#VALUE!", `DATEVALUE: "${text(v)}" is not a date`) : Math.floor(n);
  }),
  DAY: def(1, 1, "s", ([v]) => parts(v).d),
  DAYS: def(2, 2, "s", ([e, s]) => Math.floor(serialArg(e)) - Math.floor(serialArg(s))),
  DAYS360: def(2, 3, "s", (args) => {
    const p = dateParts(serialArg(args[0]));
    const q = dateParts(serialArg(args[1]));
    const european = args.length > 2 && args[2] !== null && args[2] !== false && args[2] !== 0;
    let d1 = p.d;
    let d2 = q.d;
    if (european) {
      if (d1 === 31) d1 = 30;
      if (d2 === 31) d2 = 30;
    } else {
      const lastFeb = (x: typeof p) => x.m === 2 && x.d === daysInMonth(x.y, 2);
      if (lastFeb(p)) d1 = 30;
      if (d1 >= 30 && d2 === 31) d2 = 30;
      if (d1 === 31) d1 = 30;
    }
    return (q.y - p.y) * 360 + (q.m - p.m) * 30 + (d2 - d1);
  }),
  EDATE: def(2, 2, "s", (args) => addMonths(serialArg(args[0]), num(args[1]), false)),
  EOMONTH: def(2, 2, "s", (args) => addMonths(serialArg(args[0]), num(args[1]), true)),
  HOUR: def(1, 1, "s", ([v]) => Math.floor(Math.round((serialArg(v) % 1) * 86400) / 3600) % 24),
  ISOWEEKNUM: def(1, 1, "s", ([v]) => {
    const s = Math.floor(serialArg(v));
    const wd = (dateParts(s).wd + 6) % 7; // Monday 0
    const thursday = s - wd + 3;
    const { y } = dateParts(thursday);
    return Math.floor((thursday - serialOf(y, 1, 1)) / 7) + 1;
  }),
  MINUTE: def(1, 1, "s", ([v]) => Math.floor(Math.round((serialArg(v) % 1) * 86400) / 60) % 60),
  MONTH: def(1, 1, "s", ([v]) => parts(v).m),
  NETWORKDAYS: def(2, 3, "ssa", (args, c) => {
    const a = Math.floor(serialArg(args[0]));
    const b = Math.floor(serialArg(args[1]));
    const off = holidays(args, 2, c);
    const [lo, hi, sign] = a <= b ? [a, b, 1] : [b, a, -1];
    let n = 0;
    for (let d = lo; d <= hi; d++) if (!isWeekend(d) && !off.has(d)) n++;
    return sign * n;
  }),
  NOW: def(0, 0, "s", () => now()),
  SECOND: def(1, 1, "s", ([v]) => Math.round((serialArg(v) % 1) * 86400) % 60),
  TIME: numeric(3, 3, ([h, m, s]) => {
    const total = Math.trunc(h) * 3600 + Math.trunc(m) * 60 + Math.trunc(s);
    if (total < 0) return err("#NUM!", "TIME: a negative time");
    return (total % 86400) / 86400;
  }),
  TIMEVALUE: def(1, 1, "s", ([v]) => {
    const n = dateSerialFromText(text(v));
    return n === undefined ? err("#VALUE!", `TIMEVALUE: "${text(v)}" is not a time`) : n - Math.floor(n);
  }),
  TODAY: def(0, 0, "s", () => Math.floor(now())),
  WEEKDAY: def(1, 2, "s", (args) => {
    const wd = dateParts(serialArg(args[0])).wd; // Sunday 0
    const type = Math.trunc(optNum(args, 1, 1));
    if (type === 1 || type === 17) return wd + 1;
    if (type === 2 || type === 11) return ((wd + 6) % 7) + 1;
    if (type === 3) return (wd + 6) % 7;
    if (type >= 12 && type <= 16) return ((wd - (type - 10) + 7) % 7) + 1;
    return err("#NUM!", "WEEKDAY: return_type is 1, 2, 3 or 11 to 17");
  }),
  WEEKNUM: def(1, 2, "s", (args) => {
    const s = Math.floor(serialArg(args[0]));
    const type = Math.trunc(optNum(args, 1, 1));
    if (type === 21) return (DATE.ISOWEEKNUM.fn([s], undefined as never) as number);
    const first = type === 1 || type === 17 ? 0 : type === 2 || type === 11 ? 1 : type >= 12 && type <= 16 ? type - 10 : -1;
    if (first < 0) return err("#NUM!", "WEEKNUM: return_type is 1, 2, 11 to 17 or 21");
    const { y } = dateParts(s);
    const jan1 = serialOf(y, 1, 1);
    const offset = (dateParts(jan1).wd - first + 7) % 7;
    return Math.floor((s - jan1 + offset) / 7) + 1;
  }),
  WORKDAY: def(2, 3, "ssa", (args, c) => {
    let d = Math.floor(serialArg(args[0]));
    let n = Math.trunc(num(args[1]));
    const off = holidays(args, 2, c);
    const step = n < 0 ? -1 : 1;
    while (n !== 0) {
      d += step;
      if (!isWeekend(d) && !off.has(d)) n -= step;
    }
    return d;
  }),
  YEAR: def(1, 1, "s", ([v]) => parts(v).y),
};


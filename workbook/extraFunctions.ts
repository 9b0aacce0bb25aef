/**
 * Excel functions the formula library lacks, written to Excel's documented rules: MIN, MAX,
 * MEDIAN, COUNTA, STDEV.S (and STDEV), MATCH; and SUM, AVERAGE and COUNT, which it has but
 * slowly. Each takes the library's argument objects
 * ({ value, isArray, isRangeRef, isCellRef, omitted }); errors are thrown as FormulaError.
 */
import { FormulaError, type FunctionArg } from "./formula";
type Arg = FunctionArg & { isRangeRef?: boolean; isCellRef?: boolean };

/**
 * Every value of an argument (a range's rows of cells, an array, or one value), in order. Plain
 * loops, not a generator: a generator's per-value cost dominated 200 whole-column SUMs.
 */
function forEachValue(value: unknown, visit: (v: unknown) => void): void {
  if (!Array.isArray(value)) return visit(value);
  for (const row of value) {
    if (!Array.isArray(row)) visit(row);
    else for (const v of row) if (Array.isArray(v)) forEachValue(v, visit);
    else visit(v);
  }
}

/**
 * The numbers a statistical function takes from its arguments: from ranges and arrays only the
 * numbers (text, logicals and blanks skipped); typed-in arguments also count logicals and
 * numeric text, and other text is #VALUE!. Any error value is passed on.
 */
function numbers(args: Arg[]): number[] {
  const out: number[] = [];
  for (const a of args) {
    if (a.omitted) continue;
    const fromRange = a.isArray || a.isRangeRef || a.isCellRef;
    forEachValue(a.value, (v) => {
      if (v instanceof FormulaError) throw v;
      if (typeof v === "number") out.push(v);
      else if (fromRange || v === null || v === undefined) return;
      else if (typeof v === "boolean") out.push(v ? 1 : 0);
      else if (typeof v === "string" && v.trim() !== "" && Number.isFinite(Number(v))) out.push(Number(v));
      else throw new FormulaError("#VALUE!", `"${String(v)}" is not a number`);
    });
  }
  return out;
}

function median(xs: number[]): number {
  if (!xs.length) throw new FormulaError("#NUM!", "no numbers to take the median of");
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

function stdevSample(xs: number[]): number {
  if (xs.length < 2) throw new FormulaError("#DIV/0!", "STDEV needs at least two numbers");
  const mean = xs.reduce((a, b) => a + b, 0) / xs.length;
  return Math.sqrt(xs.reduce((a, b) => a + (b - mean) ** 2, 0) / (xs.length - 1));
}

/** Excel's comparison for lookups: numbers by value, text without regard to case. */
function compare(a: unknown, b: unknown): number | undefined {
  if (typeof a === "number" && typeof b === "number") return a - b;
  if (typeof a === "string" && typeof b === "string") return a.toLowerCase().localeCompare(b.toLowerCase());
  if (typeof a === "boolean" && typeof b === "boolean") return Number(a) - Number(b);
  return undefined;
}

function match(lookup: Arg, within: Arg, type?: Arg): number {
  const key = lookup.value instanceof FormulaError ? (() => { throw lookup.value; })() : Array.isArray(lookup.value) ? (lookup.value as unknown[][])[0]?.[0] : lookup.value;
  const rows = Array.isArray(within.value) ? (within.value as unknown[][]) : [[within.value]];
  if (rows.length > 1 && rows[0].length > 1) throw new FormulaError("#N/A", "MATCH looks in one row or one column");
  const list = rows.length > 1 ? rows.map((r) => r[0]) : rows[0];
  const kind = type === undefined || type.omitted ? 1 : Number(type.value);
  if (![1, 0, -1].includes(kind)) throw new FormulaError("#N/A", "MATCH type is 1, 0 or -1");
  if (kind === 0) {
    const i = list.findIndex((v) => compare(v, key) === 0);
    if (i < 0) throw new FormulaError("#N/A", "MATCH found no exact match");
    return i + 1;
  }
  // Sorted lists: the last position whose value is at most (1) or at least (-1) the key.
  let found = -1;
  for (let i = 0; i < list.length; i++) {
    const c = compare(list[i], key);
    if (c === undefined) continue;
    if (kind === 1 ? c <= 0 : c >= 0) found = i;
    else break;
  }
  if (found < 0) throw new FormulaError("#N/A", "MATCH found no value in order before the key");
  return found + 1;
}

/**
 * COUNT: numbers in ranges and arrays; typed-in numbers, logicals and numeric text. Unlike the
 * other statistical functions it skips error values and other text instead of passing them on.
 */
function count(args: Arg[]): number {
  let n = 0;
  for (const a of args) {
    if (a.omitted) continue;
    const fromRange = a.isArray || a.isRangeRef || a.isCellRef;
    forEachValue(a.value, (v) => {
      if (typeof v === "number") n++;
      else if (!fromRange && (typeof v === "boolean" || (typeof v === "string" && v.trim() !== "" && Number.isFinite(Number(v))))) n++;
    });
  }
  return n;
}

export const EXTRA_FUNCTIONS: Record<string, (...args: Arg[]) => unknown> = {
  // SUM, AVERAGE and COUNT replace the library's own, which take time growing with the square
  // of a range's size: these take each value once (200 whole-column SUMs over 10 000 rows).
  SUM: (...args) => numbers(args).reduce((a, b) => a + b, 0),
  AVERAGE: (...args) => {
    const xs = numbers(args);
    if (!xs.length) throw new FormulaError("#DIV/0!", "AVERAGE of no numbers");
    return xs.reduce((a, b) => a + b, 0) / xs.length;
  },
  COUNT: (...args) => count(args),
  MIN: (...args) => {
    const xs = numbers(args);
    return xs.length ? xs.reduce((a, b) => Math.min(a, b)) : 0;
  },
  MAX: (...args) => {
    const xs = numbers(args);
    return xs.length ? xs.reduce((a, b) => Math.max(a, b)) : 0;
  },
  MEDIAN: (...args) => median(numbers(args)),
  "STDEV.S": (...args) => stdevSample(numbers(args)),
  STDEV: (...args) => stdevSample(numbers(args)),
  COUNTA: (...args) => {
    let n = 0;
    for (const a of args) {
      if (a.omitted) continue;
      forEachValue(a.value, (v) => {
        if (v !== null && v !== undefined && !(a.isRangeRef && v === "")) n++;
      });
    }
    return n;
  },
  MATCH: (lookup, within, type) => match(lookup, within, type),
};

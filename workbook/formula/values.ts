/**
 * The values a formula computes with, written from Excel's documented rules (ECMA-376 Part 1
 * §18.17.2 for the data types, Microsoft's "Calculation operators and precedence in Excel" for
 * coercion, "Dynamic array formulas and spilled array behavior" for arrays):
 *
 * - a scalar is a number, text, a logical, an error, or a blank (null: an empty cell, or an
 *   argument left out);
 * - an array is a frozen rectangle of scalars; no function can change what another formula reads;
 * - a reference is a rectangle on a sheet, read when a value is needed (ROW, OFFSET, SUMIF's
 *   ranges and NAPPE calls look at the reference itself);
 * - a lambda is a function value (LAMBDA, a named function).
 */

export type ErrorCode = "#NULL!" | "#DIV/0!" | "#VALUE!" | "#REF!" | "#NAME?" | "#NUM!" | "#N/A" | "#SPILL!" | "#CALC!" | "#GETTING_DATA" | "#FIELD!" | "#BLOCKED!" | "#UNKNOWN!" | "#BUSY!" | "#CONNECT!" | "#EXTERNAL!" | "#PYTHON!";

export const ERROR_CODES: readonly ErrorCode[] = ["#NULL!", "#DIV/0!", "#VALUE!", "#REF!", "#NAME?", "#NUM!", "#N/A", "#GETTING_DATA", "#SPILL!", "#CALC!", "#FIELD!", "#BLOCKED!", "#UNKNOWN!", "#BUSY!", "#CONNECT!", "#EXTERNAL!", "#PYTHON!"];

/**
 * An Excel error value, with a note for people saying where it came from. Not an Error: errors
 * are ordinary values here (ISERROR over a column makes thousands), and a stack costs.
 */
export class FormulaError {
  readonly message: string;
  constructor(
    readonly error: ErrorCode,
    message?: string,
  ) {
    this.message = message ?? error;
  }
}

export type Scalar = number | string | boolean | FormulaError | null;

/** A rectangle of scalars, frozen. */
export class XArray {
  readonly rows: number;
  readonly cols: number;
  constructor(readonly data: readonly (readonly Scalar[])[]) {
    this.rows = data.length;
    this.cols = data.length ? data[0].length : 0;
    Object.freeze(this);
  }
  at(r: number, c: number): Scalar {
    return this.data[r][c];
  }
  static of(rows: Scalar[][]): XArray {
    for (const row of rows) Object.freeze(row);
    return new XArray(Object.freeze(rows));
  }
}

/** A rectangle on a sheet: rows and columns from 1, inclusive. */
export class Ref {
  constructor(
    readonly sheet: string,
    readonly r1: number,
    readonly c1: number,
    readonly r2: number,
    readonly c2: number,
  ) {}
  get rows(): number {
    return this.r2 - this.r1 + 1;
  }
  get cols(): number {
    return this.c2 - this.c1 + 1;
  }
  get single(): boolean {
    return this.r1 === this.r2 && this.c1 === this.c2;
  }
}

/** A function value: LAMBDA's parameters and body, with the names it closed over. */
export class Lambda {
  constructor(
    readonly params: readonly string[],
    readonly call: (args: Value[]) => Value,
  ) {}
}

export type Value = Scalar | XArray | Ref | Lambda;

export const MAX_ROW = 1048576;
export const MAX_COLUMN = 16384;

export function err(code: ErrorCode, message?: string): FormulaError {
  return new FormulaError(code, message);
}

/** Text that Excel reads as a number where a number is wanted ("1.5", " 2e3 ", "50%", "-1"); undefined when it does not. */
export function numberFromText(s: string): number | undefined {
  const t = s.trim();
  if (!t) return undefined;
  const m = /^([+-]?)(\d+(?:\.\d*)?|\.\d+)(?:[eE]([+-]?\d+))?(%?)$/.exec(t.replace(/,(?=\d{3}(\D|$))/g, ""));
  if (!m) return undefined;
  let n = Number(`${m[1]}${m[2]}${m[3] !== undefined ? `e${m[3]}` : ""}`);
  if (m[4]) n /= 100;
  return Number.isFinite(n) ? n : undefined;
}

/** A scalar as a number, as operators and numeric parameters take it: blank 0, logicals 1/0, numeric text; other text #VALUE!. */
export function toNumber(v: Scalar): number | FormulaError {
  if (typeof v === "number") return v;
  if (v === null) return 0;
  if (typeof v === "boolean") return v ? 1 : 0;
  if (v instanceof FormulaError) return v;
  const n = numberFromText(v);
  return n === undefined ? err("#VALUE!", `"${v}" is not a number`) : n;
}

/** A scalar as text: numbers as Excel's General format writes them, logicals TRUE/FALSE, blank "". */
export function toText(v: Scalar): string | FormulaError {
  if (typeof v === "string") return v;
  if (v === null) return "";
  if (typeof v === "boolean") return v ? "TRUE" : "FALSE";
  if (v instanceof FormulaError) return v;
  return generalNumber(v);
}

/** A scalar as a logical (IF's test, AND's values): numbers non-zero, text "TRUE"/"FALSE" in any case; other text #VALUE!. */
export function toLogical(v: Scalar): boolean | FormulaError {
  if (typeof v === "boolean") return v;
  if (typeof v === "number") return v !== 0;
  if (v === null) return false;
  if (v instanceof FormulaError) return v;
  const u = v.trim().toUpperCase();
  if (u === "TRUE") return true;
  if (u === "FALSE") return false;
  return err("#VALUE!", `"${v}" is not TRUE or FALSE`);
}

/**
 * A number as Excel's General format shows it in a cell of ordinary width: up to 15 significant
 * figures (Excel keeps 15), no trailing zeros, an exponent for very large or small magnitudes.
 */
export function generalNumber(n: number): string {
  if (n === 0) return "0";
  const a = Math.abs(n);
  if (a >= 1e-9 && a < 1e15) {
    const s = Number(n.toPrecision(15)).toString();
    if (!/e/.test(s)) return s;
  }
  const [mant, exp] = n.toExponential(14).split("e");
  const m = mant.replace(/\.?0+$/, "");
  const e = Number(exp);
  return `${m}E${e < 0 ? "-" : "+"}${String(Math.abs(e)).padStart(2, "0")}`;
}

/**
 * Excel's comparison of two scalars for the comparison operators: numbers < text < logicals;
 * text without regard to case; blank as 0, "" or FALSE to match the other side.
 */
export function compareScalars(a: Exclude<Scalar, FormulaError>, b: Exclude<Scalar, FormulaError>): number {
  if (a === null) a = typeof b === "string" ? "" : typeof b === "boolean" ? false : 0;
  if (b === null) b = typeof a === "string" ? "" : typeof a === "boolean" ? false : 0;
  const rank = (v: number | string | boolean) => (typeof v === "number" ? 0 : typeof v === "string" ? 1 : 2);
  const ra = rank(a);
  const rb = rank(b);
  if (ra !== rb) return ra - rb;
  if (typeof a === "number") return numbersEqual(a, b as number) ? 0 : a < (b as number) ? -1 : 1;
  if (typeof a === "boolean") return a === b ? 0 : a ? 1 : -1;
  const x = a.toLowerCase();
  const y = (b as string).toLowerCase();
  return x === y ? 0 : x < y ? -1 : 1;
}

/** Whether a comparison operator (= <> < > <= >=) holds for the sign of a comparison's result. */
export function holds(op: string, d: number): boolean {
  switch (op) {
    case "=":
      return d === 0;
    case "<>":
      return d !== 0;
    case "<":
      return d < 0;
    case ">":
      return d > 0;
    case "<=":
      return d <= 0;
    default:
      return d >= 0;
  }
}

/** Excel's = on numbers: equal to 15 significant figures (documented: Excel keeps 15 digits of precision). */
export function numbersEqual(a: number, b: number): boolean {
  if (a === b) return true;
  const scale = Math.max(Math.abs(a), Math.abs(b));
  return Math.abs(a - b) <= scale * 1e-15;
}

/** Result of a function or operator: NaN and infinities become #NUM!, -0 becomes 0. */
export function finite(n: number, what = "the result"): number | FormulaError {
  if (Number.isNaN(n)) return err("#NUM!", `${what} is not a number`);
  if (!Number.isFinite(n)) return err("#NUM!", `${what} is too large`);
  return n === 0 ? 0 : n;
}

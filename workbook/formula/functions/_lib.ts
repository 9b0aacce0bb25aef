/**
 * Helpers the function groups share: how arguments become numbers (Microsoft's rules for SUM,
 * AVERAGE and the statistical functions: numbers typed as arguments count, and so do logicals and
 * numbers as text typed in; in a range or array only numbers count), criteria of SUMIF and its
 * kin, and the definition shorthand.
 */
import type { ArgKind, Ctx, FnDef } from "../evaluate";
import { asArray } from "../evaluate";
import { compareScalars, err, FormulaError, generalNumber, holds, numberFromText, toLogical, Ref, type Scalar, toNumber, type Value, XArray } from "../values";

export type Defs = Record<string, FnDef>;

/** A definition: argument counts, kinds (the last repeats), and the function. */
export function def(min: number, max: number, kinds: string, fn: FnDef["fn"]): FnDef {
  return { min, max, kinds: kinds.split("") as ArgKind[], fn };
}

/** A function of numbers only, lifted over arrays: errors and text that is not a number stop it. */
export function numeric(min: number, max: number, fn: (xs: number[], given: number) => Value, optionalDefaults: (number | undefined)[] = []): FnDef {
  return def(min, max, "s", (args) => {
    const xs: number[] = [];
    for (let i = 0; i < max; i++) {
      const a = args[i];
      if (i >= args.length || a === null) {
        const d = optionalDefaults[i];
        xs.push(d === undefined ? 0 : d);
        continue;
      }
      const n = toNumber(a as Scalar);
      if (n instanceof FormulaError) return n;
      xs.push(n);
    }
    return fn(xs, args.length);
  });
}

/** Calls `visit` with each value an argument holds: from a range or array (direct false), or the one typed in. */
export function eachValue(v: Value, c: Ctx, visit: (x: Scalar, direct: boolean) => void): void {
  if (v instanceof Ref) {
    const a = c.host.area(v);
    for (const row of a.data) for (const x of row) visit(x, false);
  } else if (v instanceof XArray) {
    for (const row of v.data) for (const x of row) visit(x, false);
  } else if (v !== null && typeof v === "object" && !(v instanceof FormulaError)) {
    visit(err("#VALUE!", "a LAMBDA is not a value"), true);
  } else visit(v as Scalar, true);
}

interface NumberRules {
  /** The A functions (AVERAGEA, MAXA...): text and logicals in ranges count (text 0, TRUE 1, FALSE 0). */
  countAll?: boolean;
  /** An argument left out is skipped (most functions), rather than 0. */
  skipOmitted?: boolean;
}

/** The numbers of a statistical function's arguments (first error thrown). */
export function numbersOf(args: Value[], c: Ctx, rules: NumberRules = {}): number[] {
  const out: number[] = [];
  for (const a of args) {
    if (a === null && rules.skipOmitted !== false) continue;
    eachValue(a, c, (x, direct) => {
      if (typeof x === "number") out.push(x);
      else if (x instanceof FormulaError) throw x;
      else if (direct) {
        if (x === null) return;
        if (typeof x === "boolean") out.push(x ? 1 : 0);
        else {
          const n = numberFromText(x);
          if (n === undefined) throw err("#VALUE!", `"${x}" is not a number`);
          out.push(n);
        }
      } else if (rules.countAll) {
        if (typeof x === "boolean") out.push(x ? 1 : 0);
        else if (typeof x === "string") out.push(0);
      }
    });
  }
  return out;
}

/** The numbers of one range or array argument, position kept (blank, text, logicals as undefined); errors thrown. */
function numberCells(v: Value, c: Ctx): { values: (number | undefined)[]; rows: number; cols: number } {
  const a = asArray(v, c);
  if (a instanceof FormulaError) throw a;
  const values: (number | undefined)[] = [];
  for (const row of a.data)
    for (const x of row) {
      if (x instanceof FormulaError) throw x;
      values.push(typeof x === "number" ? x : undefined);
    }
  return { values, rows: a.rows, cols: a.cols };
}

/** Paired numbers of two ranges of one size (SLOPE, CORREL...): pairs where either is not a number are left out. */
export function pairs(ys: Value, xs: Value, c: Ctx, name: string): { x: number[]; y: number[] } {
  const a = numberCells(ys, c);
  const b = numberCells(xs, c);
  if (a.values.length !== b.values.length) throw err("#N/A", `${name}: the two ranges have different numbers of values`);
  const x: number[] = [];
  const y: number[] = [];
  for (let i = 0; i < a.values.length; i++) {
    const p = a.values[i];
    const q = b.values[i];
    if (p !== undefined && q !== undefined) {
      y.push(p);
      x.push(q);
    }
  }
  return { x, y };
}

/** A scalar argument as a number (blank 0); errors and non-numeric text thrown. */
export function num(v: Value): number {
  const n = toNumber(v as Scalar);
  if (n instanceof FormulaError) throw n;
  return n;
}

/** An optional number: its default where left out or not given. */
export function optNum(args: Value[], i: number, d: number): number {
  return i >= args.length || args[i] === null ? d : num(args[i]);
}

export function text(v: Value): string {
  if (v instanceof FormulaError) throw v;
  if (typeof v === "string") return v;
  if (v === null) return "";
  if (typeof v === "boolean") return v ? "TRUE" : "FALSE";
  if (typeof v === "number") return generalNumber(v);
  throw err("#VALUE!", "a text was expected");
}


export function bool(v: Value): boolean {
  if (v instanceof XArray || v instanceof Ref || (v !== null && typeof v === "object" && !(v instanceof FormulaError))) throw err("#VALUE!", "TRUE or FALSE was expected");
  const b = toLogical(v as Scalar);
  if (b instanceof FormulaError) throw b;
  return b;
}

export function array(v: Value, c: Ctx): XArray {
  const a = asArray(v, c);
  if (a instanceof FormulaError) throw a;
  return a;
}

/** The values of a range or array in order, rows first. */
export function flat(a: XArray): Scalar[] {
  const out: Scalar[] = [];
  for (const row of a.data) for (const x of row) out.push(x);
  return out;
}

// ---------------------------------------------------------------------------------------------
// Criteria (SUMIF, COUNTIF, AVERAGEIF, their IFS forms, MAXIFS, MINIFS), as Microsoft documents
// them: an operator (=, <>, <, >, <=, >=) then a value; a number compares with numbers, text
// without regard to case with * ? and ~ as wildcards for = and <>; "" matches blank cells,
// "<>" every non-blank cell; a criteria cell left empty is 0.

/** A wildcard pattern (* any run, ? one character, ~ escapes) as a case-insensitive whole-text test. */
export function wildcard(pattern: string): RegExp {
  let re = "";
  for (let i = 0; i < pattern.length; i++) {
    const ch = pattern[i];
    if (ch === "~" && i + 1 < pattern.length && "*?~".includes(pattern[i + 1])) {
      re += `\\${pattern[++i]}`;
    } else if (ch === "*") re += "[\\s\\S]*";
    else if (ch === "?") re += "[\\s\\S]";
    else re += ch.replace(/[.*+?^${}()|[\]\\/]/g, "\\$&");
  }
  return new RegExp(`^${re}$`, "i");
}

function hasWildcard(s: string): boolean {
  return /[*?~]/.test(s);
}

type Criterion = (x: Scalar) => boolean;

export function criterion(crit: Scalar): Criterion {
  if (crit instanceof FormulaError) throw crit;
  if (crit === null) crit = 0;
  if (typeof crit === "number") return (x) => (typeof x === "number" ? compareScalars(x, crit as number) === 0 : typeof x === "string" && numberFromText(x) === crit);
  if (typeof crit === "boolean") return (x) => x === crit;
  const m = /^(<=|>=|<>|=|<|>)?([\s\S]*)$/.exec(crit)!;
  const op = m[1] ?? "=";
  const rest = m[2];
  const n = numberFromText(rest);
  const upper = rest.toUpperCase();
  if (rest === "") {
    if (op === "=") return (x) => x === null || x === "";
    if (op === "<>") return (x) => x !== null && x !== "";
    return () => false;
  }
  if (n !== undefined && !/%/.test(rest)) {
    return (x) => {
      if (typeof x !== "number") {
        if (op === "<>") return true;
        return op === "=" && typeof x === "string" && numberFromText(x) === n;
      }
      const d = compareScalars(x, n);
      return holds(op, d);
    };
  }
  if (upper === "TRUE" || upper === "FALSE") {
    const b = upper === "TRUE";
    return (x) => (typeof x === "boolean" ? holds(op, x === b ? 0 : x ? 1 : -1) : op === "<>");
  }
  const errorCode = /^#/.test(rest) ? upper : undefined;
  if (errorCode) return (x) => (x instanceof FormulaError ? (x.error === errorCode) === (op === "=") : op === "<>");
  if (op === "=" || op === "<>") {
    const re = hasWildcard(rest) ? wildcard(rest) : undefined;
    const lower = rest.toLowerCase();
    const eq = (x: Scalar) => typeof x === "string" && (re ? re.test(x) : x.toLowerCase() === lower);
    return op === "=" ? eq : (x) => !eq(x);
  }
  return (x) => typeof x === "string" && holds(op, compareScalars(x, rest));
}


/** A range of a criteria function as a reference or array (a range the same size as another is read from its top left). */
export function sameShape(v: Value, like: Ref | XArray, c: Ctx): XArray {
  if (v instanceof Ref) {
    const rows = like instanceof Ref ? like.rows : like.rows;
    const cols = like instanceof Ref ? like.cols : like.cols;
    return c.host.area(new Ref(v.sheet, v.r1, v.c1, v.r1 + rows - 1, v.c1 + cols - 1));
  }
  return array(v, c);
}

export function rangeOrArray(v: Value): Ref | XArray {
  if (v instanceof Ref || v instanceof XArray) return v;
  if (v instanceof FormulaError) throw v;
  return XArray.of([[v as Scalar]]);
}

/** Indexes (rows first) where every criteria pair holds. */
export function matching(pairsOf: Value[], c: Ctx, name: string): { shape: XArray; hits: boolean[] } {
  if (pairsOf.length < 2 || pairsOf.length % 2) throw err("#VALUE!", `${name} takes pairs of a range and a criterion`);
  let shape: XArray | undefined;
  let hits: boolean[] | undefined;
  for (let i = 0; i < pairsOf.length; i += 2) {
    const range = array(pairsOf[i], c);
    if (shape && (range.rows !== shape.rows || range.cols !== shape.cols)) throw err("#VALUE!", `${name}: every criteria range must have the same size`);
    shape ??= range;
    const crit = pairsOf[i + 1];
    const test = criterion((crit instanceof XArray ? crit.at(0, 0) : crit instanceof Ref ? c.host.cell(crit.sheet, crit.r1, crit.c1) : crit) as Scalar);
    const cells = flat(range);
    if (!hits) hits = cells.map(test);
    else for (let k = 0; k < cells.length; k++) hits[k] = hits[k] && test(cells[k]);
  }
  return { shape: shape!, hits: hits! };
}

/**
 * Our evaluator: a formula's tree (parser.ts) compiled once into closures, then run at each cell
 * that holds it. Written from Microsoft's documentation of Excel's calculation:
 *
 * - Operators work element by element on arrays, with Excel's broadcasting: a single row or
 *   column stretches to the other operand's size; beyond the smaller of two unequal arrays,
 *   #N/A ("Dynamic array formulas and spilled array behavior").
 * - A formula stored as an array formula (dynamic or legacy) is evaluated as an array: a range
 *   where one value is wanted becomes its values. A legacy formula keeps implicit intersection:
 *   such a range gives the one cell in the formula's row or column, else #VALUE! ("Implicit
 *   intersection operator: @"). Functions whose parameters take arrays (SUMPRODUCT, INDEX,
 *   MMULT...) evaluate their arguments as arrays in either case.
 * - A function whose parameter takes one value, given an array, is called for each element.
 * - Errors pass through operators left operand first.
 *
 * The workbook is reached through `Host` (workbook/recalc.ts); the function library through
 * `Library` (workbook/formula/functions), given by the caller so that the pane loads it as a
 * chunk of its own.
 */
import type { Node, CellNode } from "./parser";
import { compareScalars, err, FormulaError, generalNumber, holds, Lambda, MAX_COLUMN, MAX_ROW, numbersEqual, Ref, type Scalar, toLogical, toNumber, toText, type Value, XArray, type ErrorCode, finite } from "./values";

/** What the evaluator asks of the workbook. */
export interface Host {
  /** A cell's value, computing its formula first where it has one (a failed formula's error). */
  cell(sheet: string, row: number, col: number): Scalar;
  /** The values of a rectangle (whole columns and rows cut to the used part of the sheet), frozen. */
  area(ref: Ref): XArray;
  /** The spilled range of the array formula in a cell (B5#). */
  spill(sheet: string, row: number, col: number): Value;
  /** A defined name that the text substitution left (a named LAMBDA). */
  definedName(name: string, sheet: string, c: Ctx): Value | undefined;
  /** The catalogue id of a NAPPE function name in either stored form, if it is one. */
  nappeId(name: string): string | undefined;
  /** A cell's formula text, if it holds one (ISFORMULA, SUBTOTAL leaving out other subtotals). */
  formulaText?(sheet: string, row: number, col: number): string | undefined;
  /** A NAPPE call: each argument's value and the reference it was written as. */
  nappe(id: string, args: NappeArg[], c: Ctx): Value;
}

export interface NappeArg {
  value: Value;
  ref?: Ref;
  omitted: boolean;
}

/** Names bound by LET and LAMBDA. */
interface Env {
  name: string;
  value: Value;
  up: Env | undefined;
}

/** The evaluation of one formula at one cell. */
export interface Ctx {
  host: Host;
  lib: Library;
  sheet: string;
  row: number;
  col: number;
  /** Ranges where one value is wanted give their values (an array formula, an array parameter). */
  array: boolean;
  env: Env | undefined;
}

export type Compiled = (c: Ctx) => Value;

/**
 * How a function takes an argument:
 * - "s": one value; errors returned at once; an array is taken element by element (lifted)
 * - "S": one value, errors given to the function (ISERROR, IFERROR...); lifted
 * - "v": as written: a reference stays a reference, arrays and single values as they are
 * - "a": as "v", evaluated as an array (SUMPRODUCT, INDEX, MMULT...)
 * - "r": a reference, else #VALUE!
 */
export type ArgKind = "s" | "S" | "v" | "a" | "r";

export interface FnDef {
  min: number;
  max: number;
  /** Each argument's kind; the last one repeats. */
  kinds: readonly ArgKind[];
  fn: (args: Value[], c: Ctx) => Value;
}

export interface Library {
  /** A built-in function by its name in capitals, without _xlfn. or _xlws. */
  get(name: string): FnDef | undefined;
}

/** The name a function is known by: capitals, stored prefixes taken off. */
function functionKey(written: string): string {
  let n = written.toUpperCase();
  if (n.startsWith("_XLFN.")) n = n.slice(6);
  if (n.startsWith("_XLWS.")) n = n.slice(6);
  return n;
}

/** A LET or LAMBDA parameter's name as people write it (the file stores _xlpm.x). */
function paramKey(written: string): string {
  const n = written.toUpperCase();
  return n.startsWith("_XLPM.") ? n.slice(6) : n;
}

// ---------------------------------------------------------------------------------------------
// Values in and out

/**
 * Implicit intersection: the one cell of a range in the formula's row or column. A range on
 * another sheet is crossed by the formula's row or column number, as Excel does.
 */
export function intersect(ref: Ref, c: Ctx): Scalar {
  if (ref.r1 === ref.r2 && ref.c1 === ref.c2) return c.host.cell(ref.sheet, ref.r1, ref.c1);
  if (ref.c1 === ref.c2 && c.row >= ref.r1 && c.row <= ref.r2) return c.host.cell(ref.sheet, c.row, ref.c1);
  if (ref.r1 === ref.r2 && c.col >= ref.c1 && c.col <= ref.c2) return c.host.cell(ref.sheet, ref.r1, c.col);
  return err("#VALUE!", "the range does not cross the formula's row or column (implicit intersection; enter it as an array formula to use every value)");
}

/** A value where one value or an array is wanted: references read (as an array in array context, else intersected). */
function operand(v: Value, c: Ctx): Scalar | XArray {
  if (v instanceof Ref) {
    if (!c.array) return intersect(v, c);
    if (v.r1 === v.r2 && v.c1 === v.c2) return c.host.cell(v.sheet, v.r1, v.c1);
    return c.host.area(v);
  }
  if (v instanceof Lambda) return err("#CALC!", "a LAMBDA must be called with its arguments");
  return v;
}

/** A value as an array (a reference read whole, a single value 1×1), whatever the context. */
export function asArray(v: Value, c: Ctx): XArray | FormulaError {
  if (v instanceof Ref) return c.host.area(v);
  if (v instanceof XArray) return v;
  if (v instanceof Lambda) return err("#CALC!", "a LAMBDA must be called with its arguments");
  return XArray.of([[v]]);
}

/** One value from anything: a reference intersected (or its only cell), an array's first element. */
function scalarOf(v: Value, c: Ctx): Scalar {
  const o = operand(v, c);
  return o instanceof XArray ? o.at(0, 0) : o;
}

// ---------------------------------------------------------------------------------------------
// Operators

const NA_BEYOND = err("#N/A", "beyond the end of the smaller array");

/** Calls `f` on the elements of the operands, stretched to one size by Excel's rules. */
function broadcast(values: (Scalar | XArray)[], f: (xs: Scalar[]) => Scalar | Value): XArray {
  let rows = 1;
  let cols = 1;
  for (const v of values) {
    if (v instanceof XArray) {
      rows = Math.max(rows, v.rows);
      cols = Math.max(cols, v.cols);
    }
  }
  const out: Scalar[][] = [];
  const xs: Scalar[] = new Array(values.length);
  for (let i = 0; i < rows; i++) {
    const row: Scalar[] = new Array(cols);
    for (let j = 0; j < cols; j++) {
      for (let k = 0; k < values.length; k++) {
        const v = values[k];
        if (!(v instanceof XArray)) xs[k] = v;
        else {
          const r = v.rows === 1 ? 0 : i;
          const q = v.cols === 1 ? 0 : j;
          xs[k] = r < v.rows && q < v.cols ? v.data[r][q] : NA_BEYOND;
        }
      }
      const y = f(xs);
      row[j] = y instanceof XArray ? y.at(0, 0) : y instanceof Ref || y instanceof Lambda ? err("#VALUE!") : y;
    }
    out.push(row);
  }
  return XArray.of(out);
}

function arithmetic(op: string, a: Scalar, b: Scalar): Scalar {
  const x = typeof a === "number" ? a : toNumber(a);
  if (x instanceof FormulaError) return x;
  const y = typeof b === "number" ? b : toNumber(b);
  if (y instanceof FormulaError) return y;
  switch (op) {
    case "+":
      return finite(x + y);
    case "-": {
      const d = x - y;
      // Excel shows a difference of two numbers equal to 15 figures as 0 (documented rounding of results to 15 digits).
      return numbersEqual(x, y) ? 0 : finite(d);
    }
    case "*":
      return finite(x * y);
    case "/":
      return y === 0 ? err("#DIV/0!", "division by zero") : finite(x / y);
    default: {
      if (x === 0 && y === 0) return err("#NUM!", "0^0 is not defined");
      if (x === 0 && y < 0) return err("#DIV/0!", "0 to a negative power");
      const p = Math.pow(x, y);
      return Number.isNaN(p) ? err("#NUM!", `${generalNumber(x)}^${generalNumber(y)} has no real value`) : finite(p);
    }
  }
}

function comparison(op: string, a: Scalar, b: Scalar): Scalar {
  if (a instanceof FormulaError) return a;
  if (b instanceof FormulaError) return b;
  return holds(op, compareScalars(a, b));
}

function concatenate(a: Scalar, b: Scalar): Scalar {
  const x = toText(a);
  if (x instanceof FormulaError) return x;
  const y = toText(b);
  if (y instanceof FormulaError) return y;
  return x + y;
}

function binary(op: string, a: Scalar, b: Scalar): Scalar {
  if (op === "&") return concatenate(a, b);
  if (op === "+" || op === "-" || op === "*" || op === "/" || op === "^") return arithmetic(op, a, b);
  return comparison(op, a, b);
}

function negate(a: Scalar): Scalar {
  const x = toNumber(a);
  return x instanceof FormulaError ? x : x === 0 ? 0 : -x;
}

function percent(a: Scalar): Scalar {
  const x = toNumber(a);
  return x instanceof FormulaError ? x : x / 100;
}

function lift1(v: Scalar | XArray, f: (x: Scalar) => Scalar): Scalar | XArray {
  return v instanceof XArray ? broadcast([v], (xs) => f(xs[0])) : f(v);
}

// ---------------------------------------------------------------------------------------------
// Compiling

/** Where a shape's relative references are read from: the cell the formula was first met in. */
interface Origin {
  row: number;
  col: number;
}

const KNOWN_ERRORS = new Map<string, FormulaError>();
function errorConstant(code: string): FormulaError {
  let e = KNOWN_ERRORS.get(code);
  if (!e) KNOWN_ERRORS.set(code, (e = err(code as ErrorCode, `${code} written in the formula`)));
  return e;
}

/** A corner of a reference: fixed, or moved with the evaluating cell. */
function corner(n: CellNode, origin: Origin | undefined): { row: (c: Ctx) => number; col: (c: Ctx) => number } {
  const relative = origin !== undefined && n.upper && !(n.colFixed && n.rowFixed);
  const r = n.row;
  const q = n.col;
  const row = relative && !n.rowFixed ? ((dr) => (c: Ctx) => c.row + dr)(r - origin!.row) : () => r;
  const col = relative && !n.colFixed ? ((dc) => (c: Ctx) => c.col + dc)(q - origin!.col) : () => q;
  return { row, col };
}

function badCell(row: number, col: number): boolean {
  return row < 1 || row > MAX_ROW || col < 1 || col > MAX_COLUMN;
}

const REF_OFF_SHEET = err("#REF!", "the reference is off the sheet");

class Compiler {
  /** Names bound at this point of the formula (LET, LAMBDA). */
  private scopes: Set<string>[] = [];
  constructor(private readonly origin: Origin | undefined) {}

  private bound(name: string): boolean {
    const key = paramKey(name);
    return this.scopes.some((s) => s.has(key));
  }

  /** A node as a value (references kept as references). */
  /** An operator joining two references (range, intersection): each operand evaluated, errors passed on, anything else #VALUE!. */
  private refs(a: Node, b: Node, operator: string, join: (x: Ref, y: Ref) => Value): Compiled {
    const left = this.value(a);
    const right = this.value(b);
    return (c) => {
      const x = left(c);
      const y = right(c);
      if (x instanceof FormulaError) return x;
      if (y instanceof FormulaError) return y;
      if (!(x instanceof Ref) || !(y instanceof Ref)) return err("#VALUE!", `${operator} joins references only`);
      return join(x, y);
    };
  }

  value(n: Node): Compiled {
    switch (n.k) {
      case "num": {
        const v = n.v;
        return () => v;
      }
      case "str": {
        const v = n.v;
        return () => v;
      }
      case "bool": {
        const v = n.v;
        return () => v;
      }
      case "err": {
        const e = errorConstant(n.code);
        return () => e;
      }
      case "array": {
        const a = XArray.of(n.rows.map((r) => r.map((v) => (typeof v === "object" ? errorConstant(v.code) : v))));
        return () => a;
      }
      case "cell": {
        const { row, col } = corner(n, this.origin);
        const sheet = n.sheet;
        return (c) => {
          const r = row(c);
          const q = col(c);
          if (badCell(r, q)) return REF_OFF_SHEET;
          return new Ref(sheet ?? c.sheet, r, q, r, q);
        };
      }
      case "area": {
        const a = corner(n.a, this.origin);
        const b = corner(n.b, this.origin);
        const sheet = n.sheet;
        return (c) => {
          const r1 = a.row(c);
          const c1 = a.col(c);
          const r2 = b.row(c);
          const c2 = b.col(c);
          if (badCell(r1, c1) || badCell(r2, c2)) return REF_OFF_SHEET;
          return new Ref(sheet ?? c.sheet, Math.min(r1, r2), Math.min(c1, c2), Math.max(r1, r2), Math.max(c1, c2));
        };
      }
      case "cols": {
        const { sheet, c1, c2 } = n;
        return (c) => new Ref(sheet ?? c.sheet, 1, c1, MAX_ROW, c2);
      }
      case "rows": {
        const { sheet, r1, r2 } = n;
        return (c) => new Ref(sheet ?? c.sheet, r1, 1, r2, MAX_COLUMN);
      }
      case "range":
        return this.refs(n.a, n.b, "the range operator (:)", (x, y) => {
          if (x.sheet.toLowerCase() !== y.sheet.toLowerCase()) return err("#VALUE!", "the range operator (:) joins references on one sheet");
          return new Ref(x.sheet, Math.min(x.r1, y.r1), Math.min(x.c1, y.c1), Math.max(x.r2, y.r2), Math.max(x.c2, y.c2));
        });
      case "isect":
        return this.refs(n.a, n.b, "the intersection operator (a space)", (x, y) => {
          const r1 = Math.max(x.r1, y.r1);
          const c1 = Math.max(x.c1, y.c1);
          const r2 = Math.min(x.r2, y.r2);
          const c2 = Math.min(x.c2, y.c2);
          if (x.sheet.toLowerCase() !== y.sheet.toLowerCase() || r1 > r2 || c1 > c2) return err("#NULL!", "the two ranges do not intersect");
          return new Ref(x.sheet, r1, c1, r2, c2);
        });
      case "union":
        return () => err("#VALUE!", "unions of references, (A1:A3,C1:C3), are not supported");
      case "name":
        return this.name(n.name, n.sheet);
      case "call":
        return this.call(n.name, n.args);
      case "invoke": {
        const fn = this.value(n.fn);
        const args = n.args.map((a) => (a ? this.value(a) : null));
        return (c) => invoke(fn(c), args, c);
      }
      case "unary": {
        const x = this.value(n.x);
        if (n.op === "+") return x;
        return (c) => {
          const v = x(c);
          if (typeof v === "number") return v === 0 ? 0 : -v;
          return lift1(operand(v, c), negate);
        };
      }
      case "pct": {
        const x = this.value(n.x);
        return (c) => lift1(operand(x(c), c), percent);
      }
      case "bin":
        return this.binary(n.op, n.a, n.b);
      case "spill": {
        if (n.x.k !== "cell") {
          const x = this.value(n.x);
          return (c) => {
            const v = x(c);
            return v instanceof Ref ? c.host.spill(v.sheet, v.r1, v.c1) : err("#REF!", "a spill reference (#) must name one cell");
          };
        }
        const { row, col } = corner(n.x, this.origin);
        const sheet = n.x.sheet;
        return (c) => c.host.spill(sheet ?? c.sheet, row(c), col(c));
      }
      case "at": {
        const x = this.value(n.x);
        return (c) => {
          const v = x(c);
          if (v instanceof Ref) return intersect(v, c);
          return v instanceof XArray ? v.at(0, 0) : v;
        };
      }
    }
  }

  /** A node read for one value or an array: a plain cell read directly, without a reference made. */
  private operand(n: Node): (c: Ctx) => Scalar | XArray {
    if (n.k === "cell") {
      const { row, col } = corner(n, this.origin);
      const sheet = n.sheet;
      return (c) => {
        const r = row(c);
        const q = col(c);
        if (badCell(r, q)) return REF_OFF_SHEET;
        return c.host.cell(sheet ?? c.sheet, r, q);
      };
    }
    if (n.k === "num") {
      const v = n.v;
      return () => v;
    }
    const f = this.value(n);
    return (c) => operand(f(c), c);
  }

  private binary(op: string, an: Node, bn: Node): Compiled {
    const a = this.operand(an);
    const b = this.operand(bn);
    if (op === "+" || op === "-" || op === "*" || op === "/") {
      return (c) => {
        const x = a(c);
        const y = b(c);
        if (typeof x === "number" && typeof y === "number") {
          let r: number;
          if (op === "+") r = x + y;
          else if (op === "-") {
            if (numbersEqual(x, y)) return 0;
            r = x - y;
          } else if (op === "*") r = x * y;
          else {
            if (y === 0) return err("#DIV/0!", "division by zero");
            r = x / y;
          }
          return Number.isFinite(r) ? r + 0 : finite(r);
        }
        if (!(x instanceof XArray) && !(y instanceof XArray)) return arithmetic(op, x, y);
        return broadcast([x, y], (xs) => arithmetic(op, xs[0], xs[1]));
      };
    }
    return (c) => {
      const x = a(c);
      const y = b(c);
      if (!(x instanceof XArray) && !(y instanceof XArray)) return binary(op, x, y);
      return broadcast([x, y], (xs) => binary(op, xs[0], xs[1]));
    };
  }

  private name(written: string, sheet: string | undefined): Compiled {
    if (!sheet && this.bound(written)) {
      const key = paramKey(written);
      return (c) => {
        for (let e = c.env; e; e = e.up) if (e.name === key) return e.value;
        return err("#NAME?", `${written} is not bound`);
      };
    }
    return (c) => c.host.definedName(written, sheet ?? c.sheet, c) ?? err("#NAME?", `unknown name ${written}: not a defined name of the workbook`);
  }

  private call(written: string, argNodes: (Node | null)[]): Compiled {
    const key = functionKey(written);
    if (key === "LET") return this.let(argNodes);
    if (key === "LAMBDA") return this.lambda(argNodes);
    if (key === "IF") return this.ifCall(argNodes);
    if (key === "IFERROR" || key === "IFNA") return this.ifError(key, argNodes);
    if (key === "IFS") return this.ifs(argNodes);
    if (key === "SWITCH") return this.switchCall(argNodes);
    if (key === "CHOOSE") return this.choose(argNodes);
    if (key === "SINGLE") {
      const x = argNodes[0] ? this.value(argNodes[0]) : () => null;
      return (c) => {
        const v = x(c);
        if (v instanceof Ref) return intersect(v, c);
        return v instanceof XArray ? v.at(0, 0) : v;
      };
    }
    if (key === "ANCHORARRAY") {
      const x = argNodes[0] ? this.value(argNodes[0]) : () => null;
      return (c) => {
        const v = x(c);
        return v instanceof Ref ? c.host.spill(v.sheet, v.r1, v.c1) : err("#REF!", "a spill reference (#) must name one cell");
      };
    }
    if (!this.bound(written)) {
      const args = argNodes.map((a) => (a ? this.value(a) : null));
      // Array-taking parameters see their arguments as arrays: compiled once more for that context.
      let fn: FnDef | undefined | null = null;
      let nappe: string | undefined | null = null;
      return (c) => {
        if (nappe === null) nappe = c.host.nappeId(written);
        if (nappe !== undefined) return callNappe(nappe, args, c);
        if (fn === null) fn = c.lib.get(key);
        if (fn) return callFunction(key, fn, args, c);
        const named = c.host.definedName(written, c.sheet, c);
        if (named instanceof Lambda) return invoke(named, args, c);
        return err("#NAME?", `unsupported function ${key}: Nappe's formula engine does not compute it`);
      };
    }
    const self = this.name(written, undefined);
    const args = argNodes.map((a) => (a ? this.value(a) : null));
    return (c) => invoke(self(c), args, c);
  }

  private let(argNodes: (Node | null)[]): Compiled {
    if (argNodes.length < 3 || argNodes.length % 2 === 0) return () => err("#VALUE!", "LET takes name, value pairs and then a calculation");
    const scope = new Set<string>();
    this.scopes.push(scope);
    const steps: { name: string; value: Compiled }[] = [];
    try {
      for (let i = 0; i < argNodes.length - 1; i += 2) {
        const n = argNodes[i];
        if (!n || n.k !== "name" || n.sheet) return () => err("#VALUE!", "LET's names must be names");
        const value = argNodes[i + 1] ? this.value(argNodes[i + 1]!) : () => null;
        const name = paramKey(n.name);
        scope.add(name);
        steps.push({ name, value });
      }
      const body = argNodes[argNodes.length - 1] ? this.value(argNodes[argNodes.length - 1]!) : () => null;
      return (c) => {
        const saved = c.env;
        try {
          for (const s of steps) c.env = { name: s.name, value: s.value(c), up: c.env };
          return body(c);
        } finally {
          c.env = saved;
        }
      };
    } finally {
      this.scopes.pop();
    }
  }

  private lambda(argNodes: (Node | null)[]): Compiled {
    if (!argNodes.length || !argNodes[argNodes.length - 1]) return () => err("#VALUE!", "LAMBDA needs a calculation");
    const params: string[] = [];
    for (const n of argNodes.slice(0, -1)) {
      if (!n || n.k !== "name" || n.sheet) return () => err("#VALUE!", "LAMBDA's parameters must be names");
      params.push(paramKey(n.name));
    }
    const scope = new Set(params);
    this.scopes.push(scope);
    let body: Compiled;
    try {
      body = this.value(argNodes[argNodes.length - 1]!);
    } finally {
      this.scopes.pop();
    }
    return (c) => {
      const closure = c.env;
      return new Lambda(params, (args) => {
        const saved = c.env;
        let env = closure;
        params.forEach((p, i) => (env = { name: p, value: args[i] ?? null, up: env }));
        c.env = env;
        try {
          return body(c);
        } finally {
          c.env = saved;
        }
      });
    };
  }

  /** IF: only the branch taken is computed, unless the condition is an array (then both, element by element). */
  private ifCall(argNodes: (Node | null)[]): Compiled {
    if (argNodes.length < 2 || argNodes.length > 3) return () => err("#VALUE!", "IF takes 2 or 3 arguments");
    const test = this.operandOrBlank(argNodes[0]);
    const yes = this.valueOrBlank(argNodes[1], 0);
    const no = argNodes.length === 3 ? this.valueOrBlank(argNodes[2], 0) : () => false;
    return (c) => {
      const t = test(c);
      if (!(t instanceof XArray)) {
        const b = toLogical(t);
        if (b instanceof FormulaError) return b;
        return b ? yes(c) : no(c);
      }
      const y = operand(yes(c), c);
      const n = operand(no(c), c);
      return broadcast([t, y, n], ([x, p, q]) => {
        const b = toLogical(x);
        return b instanceof FormulaError ? b : b ? p : q;
      });
    };
  }

  private ifError(key: string, argNodes: (Node | null)[]): Compiled {
    if (argNodes.length !== 2) return () => err("#VALUE!", `${key} takes 2 arguments`);
    const value = this.operandOrBlank(argNodes[0]);
    const fallback = this.valueOrBlank(argNodes[1], 0);
    const catches = (v: Scalar) => v instanceof FormulaError && (key === "IFERROR" || v.error === "#N/A");
    return (c) => {
      const v = value(c);
      if (!(v instanceof XArray)) return catches(v) ? blankAsZero(fallback(c), c) : v === null ? 0 : v;
      const f = operand(fallback(c), c);
      return broadcast([v, f], ([x, y]) => (catches(x) ? (y === null ? 0 : y) : x === null ? 0 : x));
    };
  }

  private ifs(argNodes: (Node | null)[]): Compiled {
    if (argNodes.length < 2 || argNodes.length % 2) return () => err("#VALUE!", "IFS takes pairs of a test and a value");
    const pairs: [(c: Ctx) => Scalar | XArray, Compiled][] = [];
    for (let i = 0; i < argNodes.length; i += 2) pairs.push([this.operandOrBlank(argNodes[i]), this.valueOrBlank(argNodes[i + 1], 0)]);
    return (c) => {
      for (const [test, value] of pairs) {
        const t = test(c);
        if (t instanceof XArray) return err("#VALUE!", "IFS with an array test is not supported");
        const b = toLogical(t);
        if (b instanceof FormulaError) return b;
        if (b) return value(c);
      }
      return err("#N/A", "IFS: no test was TRUE");
    };
  }

  private switchCall(argNodes: (Node | null)[]): Compiled {
    if (argNodes.length < 3) return () => err("#VALUE!", "SWITCH takes an expression, then value and result pairs, then an optional default");
    const expr = this.operandOrBlank(argNodes[0]);
    const rest = argNodes.slice(1);
    const pairs: [(c: Ctx) => Scalar | XArray, Compiled][] = [];
    for (let i = 0; i + 1 < rest.length; i += 2) pairs.push([this.operandOrBlank(rest[i]), this.valueOrBlank(rest[i + 1], 0)]);
    const fallback = rest.length % 2 ? this.valueOrBlank(rest[rest.length - 1], 0) : undefined;
    return (c) => {
      const e = expr(c);
      if (e instanceof XArray) return err("#VALUE!", "SWITCH with an array expression is not supported");
      if (e instanceof FormulaError) return e;
      for (const [value, result] of pairs) {
        const v = value(c);
        if (v instanceof XArray) return err("#VALUE!", "SWITCH with an array value is not supported");
        if (v instanceof FormulaError) return v;
        if (compareScalars(e, v) === 0) return result(c);
      }
      return fallback ? fallback(c) : err("#N/A", "SWITCH: no value matched and there is no default");
    };
  }

  private choose(argNodes: (Node | null)[]): Compiled {
    if (argNodes.length < 2) return () => err("#VALUE!", "CHOOSE takes an index and at least one value");
    const index = this.operandOrBlank(argNodes[0]);
    const values = argNodes.slice(1).map((a) => this.valueOrBlank(a, 0));
    const pick = (x: Scalar): number | FormulaError => {
      const n = toNumber(x);
      if (n instanceof FormulaError) return n;
      const i = Math.trunc(n);
      return i < 1 || i > values.length ? err("#VALUE!", `CHOOSE: index ${generalNumber(n)} is not between 1 and ${values.length}`) : i;
    };
    return (c) => {
      const t = index(c);
      if (!(t instanceof XArray)) {
        const i = pick(t);
        return i instanceof FormulaError ? i : values[i - 1](c);
      }
      const all = values.map((v) => operand(v(c), c));
      return broadcast([t, ...all], (xs) => {
        const i = pick(xs[0]);
        return i instanceof FormulaError ? i : xs[i];
      });
    };
  }

  private operandOrBlank(n: Node | null): (c: Ctx) => Scalar | XArray {
    return n ? this.operand(n) : () => null;
  }

  private valueOrBlank(n: Node | null, blank: Scalar): Compiled {
    return n ? this.value(n) : () => blank;
  }
}

function blankAsZero(v: Value, c: Ctx): Value {
  if (v === null) return 0;
  if (v instanceof Ref && v.single) {
    const s = c.host.cell(v.sheet, v.r1, v.c1);
    return s === null ? 0 : v;
  }
  return v;
}

function invoke(fn: Value, args: (Compiled | null)[], c: Ctx): Value {
  if (fn instanceof FormulaError) return fn;
  if (!(fn instanceof Lambda)) return err("#VALUE!", "only a LAMBDA can be called with arguments");
  if (args.length > fn.params.length) return err("#VALUE!", `the LAMBDA takes ${fn.params.length} argument${fn.params.length === 1 ? "" : "s"}`);
  if (args.length < fn.params.length) return err("#VALUE!", `the LAMBDA takes ${fn.params.length} argument${fn.params.length === 1 ? "" : "s"}, given ${args.length}`);
  return fn.call(args.map((a) => (a ? a(c) : null)));
}

function callNappe(id: string, args: (Compiled | null)[], c: Ctx): Value {
  const given: NappeArg[] = args.map((a) => {
    if (!a) return { value: null, omitted: true };
    const v = a(c);
    return v instanceof Ref ? { value: v, ref: v, omitted: false } : { value: v, omitted: false };
  });
  return c.host.nappe(id, given, c);
}

function kindAt(def: FnDef, i: number): ArgKind {
  return def.kinds[Math.min(i, def.kinds.length - 1)];
}

/** A built-in function called: arguments taken by their kinds, lifted over arrays where they take one value. */
function callFunction(name: string, def: FnDef, args: (Compiled | null)[], c: Ctx): Value {
  if (args.length < def.min) return err("#VALUE!", `${name} takes at least ${def.min} argument${def.min === 1 ? "" : "s"}`);
  if (args.length > def.max) return err("#VALUE!", `${name} takes at most ${def.max} argument${def.max === 1 ? "" : "s"}`);
  const values: Value[] = new Array(args.length);
  let lifted: number[] | undefined;
  for (let i = 0; i < args.length; i++) {
    const a = args[i];
    const kind = kindAt(def, i);
    if (!a) {
      values[i] = null;
      continue;
    }
    if (kind === "a") {
      const saved = c.array;
      c.array = true;
      try {
        values[i] = a(c);
      } finally {
        c.array = saved;
      }
      continue;
    }
    const v = a(c);
    if (kind === "v") values[i] = v;
    else if (kind === "r") {
      if (v instanceof FormulaError) return v;
      if (!(v instanceof Ref)) return err("#VALUE!", `${name}: argument ${i + 1} must be a reference`);
      values[i] = v;
    } else {
      const o = operand(v, c);
      if (o instanceof XArray) (lifted ??= []).push(i);
      else if (kind === "s" && o instanceof FormulaError) return o;
      values[i] = o;
    }
  }
  const run = (vs: Value[]): Value => {
    try {
      return def.fn(vs, c);
    } catch (e) {
      if (e instanceof FormulaError) return e;
      throw e;
    }
  };
  if (!lifted) return run(values);
  const arrays = lifted.map((i) => values[i] as XArray);
  return broadcast(arrays, (xs) => {
    const vs = values.slice();
    for (let k = 0; k < lifted!.length; k++) {
      const x = xs[k];
      if (kindAt(def, lifted![k]) === "s" && x instanceof FormulaError) return x;
      vs[lifted![k]] = x;
    }
    const r = run(vs);
    return r instanceof Ref ? scalarOf(r, c) : r;
  });
}

/** The tree compiled. With an origin, capitalised relative references move with the evaluating cell. */
export function compileTree(tree: Node, origin?: Origin): Compiled {
  return new Compiler(origin).value(tree);
}

/** A formula's final value at its cell: a legacy formula's reference intersected; an array formula's read whole. */
export function finish(v: Value, c: Ctx): Value {
  if (v instanceof Ref) {
    if (v.single) return c.host.cell(v.sheet, v.r1, v.c1) ?? 0;
    return c.array ? c.host.area(v) : intersect(v, c) ?? 0;
  }
  if (v instanceof Lambda) return err("#CALC!", "a LAMBDA must be called with its arguments");
  return v;
}

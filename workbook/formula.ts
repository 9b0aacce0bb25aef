/**
 * What the rest of Nappe asks of formulas, from our own formula engine (workbook/formula/):
 * evaluating a formula at a cell, the references its text names (to order a recalculation), its
 * direct precedents (the pane's snapshot), and its calls with their arguments' source text and
 * position (to show arguments "as written" and apply unit fixes).
 *
 * Formulas are parsed and compiled once per shape (workbook/formula/shapes.ts): a formula filled
 * down a column is one shape, evaluated at each of its cells.
 */
import { compileTree, type Compiled, type Ctx, finish, type Host, type Library } from "./formula/evaluate";
import { lex, SyntaxProblem, type Token } from "./formula/lexer";
import { type CellNode, type Node, parse, ParseProblem } from "./formula/parser";
import { matchesTemplate, shapeText, type Template } from "./formula/shapes";
import { err, FormulaError, MAX_COLUMN, MAX_ROW, type Value } from "./formula/values";
import { dottedName } from "./storedForm";

export { FormulaError, MAX_COLUMN, MAX_ROW };
export type { Host };

/**
 * A formula's shape: its tree as read at the cell it was first met in, compiled and its
 * references found when first asked for. Formulas filled down a column share one.
 */
interface Shape {
  text: string;
  origin: { row: number; col: number };
  tree?: Node | FormulaError;
  compiled?: Compiled | FormulaError;
  refs?: ShapeRef[];
}

/** Shapes by key, a bounded cache: a recalculation reads a formula's references and then evaluates it, and the pane analyses the same formulas again and again. */
const SHAPES = new Map<string, Shape>();
/** The last formula asked about, at its cell: its references and its evaluation come one after the other. */
let last: { formula: string; row: number; col: number; shape: Shape } | undefined;
/** The last shape met in each column, with its template: a copy filled down is matched by comparing text. */
const BY_COLUMN = new Map<number, { template: Template; shape: Shape }>();

/** The formula's shape at a cell (text the lexer cannot read gets a shape of its own holding the error). */
function shapeOf(formula: string, at: { row: number; col: number }): Shape {
  if (last && last.formula === formula && last.row === at.row && last.col === at.col) return last.shape;
  const above = BY_COLUMN.get(at.col);
  let shape: Shape | undefined;
  if (above && matchesTemplate(above.template, formula, at.row, at.col)) shape = above.shape;
  else {
    const template = shapeText(formula, at.row, at.col);
    const key = template ? template.key : `\0bad\0${formula}`;
    shape = SHAPES.get(key);
    if (!shape) {
      if (SHAPES.size >= 5_000) SHAPES.clear();
      shape = { text: formula, origin: { row: at.row, col: at.col } };
      SHAPES.set(key, shape);
    }
    if (template) {
      if (BY_COLUMN.size >= 5_000) BY_COLUMN.clear();
      BY_COLUMN.set(at.col, { template, shape });
    }
  }
  last = { formula, row: at.row, col: at.col, shape };
  return shape;
}

function problemOf(e: unknown): FormulaError {
  if (e instanceof SyntaxProblem || e instanceof ParseProblem) return err("#NAME?", `the formula could not be parsed: ${e.message}`);
  throw e;
}

function treeOf(shape: Shape): Node | FormulaError {
  if (shape.tree === undefined) {
    try {
      shape.tree = parse(shape.text);
    } catch (e) {
      shape.tree = problemOf(e);
    }
  }
  return shape.tree;
}

function compiledOf(shape: Shape): Compiled | FormulaError {
  if (shape.compiled === undefined) {
    const tree = treeOf(shape);
    shape.compiled = tree instanceof FormulaError ? tree : compileTree(tree, shape.origin);
  }
  return shape.compiled;
}

/** One evaluation context per nesting depth, reused (a formula's references may compute others inside it). */
const contexts: Ctx[] = [];

/**
 * A formula's value at a cell. `array` evaluates it as an array formula (stored with t="array":
 * ranges where one value is wanted give their values); otherwise implicit intersection applies.
 * `depth` is how many formulas are being computed around this one.
 */
export function evaluateFormula(formula: string, position: { sheet: string; row: number; col: number }, host: Host, lib: Library, array: boolean, depth: number): Value {
  const compiled = compiledOf(shapeOf(formula, position));
  if (compiled instanceof FormulaError) return compiled;
  const c = (contexts[depth] ??= { host, lib, sheet: "", row: 0, col: 0, array: false, env: undefined });
  c.host = host;
  c.lib = lib;
  c.sheet = position.sheet;
  c.row = position.row;
  c.col = position.col;
  c.array = array;
  c.env = undefined;
  return finish(compiled(c), c);
}

/** Texts of defined names, compiled once each. */
const NAMED = new Map<string, Compiled | FormulaError>();

/** A defined name's formula evaluated where it is used (a named LAMBDA gives its function). */
export function evaluateText(text: string, c: Ctx): Value {
  let compiled = NAMED.get(text);
  if (compiled === undefined) {
    try {
      compiled = compileTree(parse(text));
    } catch (e) {
      compiled = problemOf(e);
    }
    if (NAMED.size >= 1000) NAMED.clear();
    NAMED.set(text, compiled);
  }
  return compiled instanceof FormulaError ? compiled : compiled(c);
}

// ---------------------------------------------------------------------------------------------
// References in the text

/** One corner of a reference in a shape: row 0 for a whole column, column 0 for a whole row; relative parts as offsets from the formula's cell. */
interface ShapePoint {
  row: number;
  col: number;
  rowRelative: boolean;
  colRelative: boolean;
}

interface ShapeRef {
  sheet?: string;
  a: ShapePoint;
  b: ShapePoint;
}

function point(n: CellNode, origin: { row: number; col: number } | undefined): ShapePoint {
  const relative = origin !== undefined && n.upper && !(n.colFixed && n.rowFixed);
  const rowRelative = relative && !n.rowFixed;
  const colRelative = relative && !n.colFixed;
  return { row: rowRelative ? n.row - origin!.row : n.row, col: colRelative ? n.col - origin!.col : n.col, rowRelative, colRelative };
}

/** Each reference node of a tree, in the order written. */
function walk(n: Node | null, visit: (n: Node) => void): void {
  if (!n) return;
  visit(n);
  switch (n.k) {
    case "range":
    case "isect":
    case "bin":
      walk(n.a, visit);
      walk(n.b, visit);
      return;
    case "call":
      n.args.forEach((a) => walk(a, visit));
      return;
    case "invoke":
      walk(n.fn, visit);
      n.args.forEach((a) => walk(a, visit));
      return;
    case "unary":
    case "pct":
    case "spill":
    case "at":
      walk(n.x, visit);
      return;
    case "union":
      n.items.forEach((a) => walk(a, visit));
      return;
    default:
      return;
  }
}

/** The references in a tree, relative to `origin` where shapeKey writes them relative (none given: as written). */
function shapeRefs(tree: Node, origin?: { row: number; col: number }): ShapeRef[] {
  const out: ShapeRef[] = [];
  walk(tree, (n) => {
    if (n.k === "cell") {
      const p = point(n, origin);
      out.push({ sheet: n.sheet, a: p, b: p });
    } else if (n.k === "area") out.push({ sheet: n.sheet, a: point(n.a, origin), b: point(n.b, origin) });
    else if (n.k === "cols") out.push({ sheet: n.sheet, a: { row: 0, col: n.c1, rowRelative: false, colRelative: false }, b: { row: 0, col: n.c2, rowRelative: false, colRelative: false } });
    else if (n.k === "rows") out.push({ sheet: n.sheet, a: { row: n.r1, col: 0, rowRelative: false, colRelative: false }, b: { row: n.r2, col: 0, rowRelative: false, colRelative: false } });
  });
  return out;
}

/** What eachReference calls for each reference: the sheet named (undefined for the formula's own) and the rectangle; false stops. */
type ReferenceVisitor = (sheet: string | undefined, fromRow: number, fromCol: number, toRow: number, toCol: number) => boolean | void;

function eachPlaced(refs: readonly ShapeRef[], at: { row: number; col: number }, visit: ReferenceVisitor): boolean {
  for (const { sheet, a, b } of refs) {
    const ar = a.rowRelative ? at.row + a.row : a.row;
    const ac = a.colRelative ? at.col + a.col : a.col;
    const br = b.rowRelative ? at.row + b.row : b.row;
    const bc = b.colRelative ? at.col + b.col : b.col;
    const ok = visit(sheet, Math.min(ar, br) || 1, Math.min(ac, bc) || 1, ar && br ? Math.max(ar, br) : MAX_ROW, ac && bc ? Math.max(ac, bc) : MAX_COLUMN);
    if (ok === false) return false;
  }
  return true;
}

/**
 * Calls `visit` for each cell and range reference a formula names in its text (not those reached
 * through INDIRECT or OFFSET), without building a list: a recalculation asks for every formula.
 * False when a visit returned false. Text that is not a formula names nothing.
 */
export function eachReference(formula: string, at: { row: number; col: number }, visit: ReferenceVisitor): boolean {
  const shape = shapeOf(formula, at);
  if (!shape.refs) {
    const tree = treeOf(shape);
    shape.refs = tree instanceof FormulaError ? [] : shapeRefs(tree, shape.origin);
  }
  return eachPlaced(shape.refs, at, visit);
}

/** A reference found in a formula's text: one cell, or a rectangle (whole columns end at the last row). */
interface FormulaRef {
  sheet?: string;
  from: { row: number; col: number };
  to: { row: number; col: number };
}

/** The references a formula names in its text, as a list (see eachReference). */
export function references(formula: string, at: { row: number; col: number } = { row: 1, col: 1 }): FormulaRef[] {
  const out: FormulaRef[] = [];
  eachReference(formula, at, (sheet, fromRow, fromCol, toRow, toCol) => {
    out.push({ sheet, from: { row: fromRow, col: fromCol }, to: { row: toRow, col: toCol } });
  });
  return out;
}

/** A direct precedent of a formula: one cell (row, col) or a range (from, to). */
export interface PrecedentRef {
  sheet: string;
  row?: number;
  col?: number;
  from?: { row: number; col: number };
  to?: { row: number; col: number };
}

/** The cells and ranges a formula reads directly, each once, in the order written. Throws on text that is not a formula. */
export function directPrecedents(formula: string, position: { sheet: string; row: number; col: number }): PrecedentRef[] {
  const tree = parse(formula);
  const seen = new Set<string>();
  const out: PrecedentRef[] = [];
  for (const r of shapeRefs(tree)) {
    const sheet = r.sheet ?? position.sheet;
    const fromRow = Math.min(r.a.row, r.b.row) || 1;
    const fromCol = Math.min(r.a.col, r.b.col) || 1;
    const toRow = r.a.row && r.b.row ? Math.max(r.a.row, r.b.row) : MAX_ROW;
    const toCol = r.a.col && r.b.col ? Math.max(r.a.col, r.b.col) : MAX_COLUMN;
    const key = `${sheet}!${fromRow}:${fromCol}:${toRow}:${toCol}`;
    if (seen.has(key)) continue;
    seen.add(key);
    if (fromRow === toRow && fromCol === toCol) out.push({ sheet, row: fromRow, col: fromCol });
    else out.push({ sheet, from: { row: fromRow, col: fromCol }, to: { row: toRow, col: toCol } });
  }
  return out;
}

// ---------------------------------------------------------------------------------------------
// Calls as written

interface ArgSite {
  /** Source text of the argument, trimmed ("" when left out). */
  text: string;
  /** Offsets in the formula of the trimmed text: [start, end). */
  start: number;
  end: number;
}

export interface CallSite {
  /** Function name, upper case, without "(": NAPPE calls in the dotted form whichever form was stored ("NAPPE.HEAD"). */
  name: string;
  start: number;
  end: number;
  args: ArgSite[];
  /** Calls nested in the arguments, in source order. */
  children: CallSite[];
}

/** Every function call in a formula (without "="), outermost first. Throws on text the lexer cannot read. */
export function callSites(formula: string): CallSite[] {
  const tokens: Token[] = lex(formula);
  const roots: CallSite[] = [];
  const stack: { call?: CallSite; argStart: number }[] = [];
  const closeArg = (frame: { call?: CallSite; argStart: number }, at: number) => {
    if (!frame.call) return;
    const raw = formula.slice(frame.argStart, at);
    const lead = raw.length - raw.trimStart().length;
    const text = raw.trim();
    frame.call.args.push({ text, start: frame.argStart + lead, end: frame.argStart + lead + text.length });
  };
  for (const t of tokens) {
    if (t.type === "Func") {
      const written = formula.slice(t.start, t.end - 1).trim();
      const call: CallSite = { name: dottedName(written) ?? written.toUpperCase(), start: t.start, end: -1, args: [], children: [] };
      const parent = [...stack].reverse().find((f) => f.call)?.call;
      (parent ? parent.children : roots).push(call);
      stack.push({ call, argStart: t.end });
    } else if (t.type === "LParen" || t.type === "LBrace") {
      stack.push({ argStart: t.end });
    } else if (t.type === "Comma") {
      const frame = stack[stack.length - 1];
      if (frame?.call) {
        closeArg(frame, t.start);
        frame.argStart = t.end;
      }
    } else if (t.type === "RParen" || t.type === "RBrace") {
      const frame = stack.pop();
      if (frame?.call) {
        if (frame.call.args.length || formula.slice(frame.argStart, t.start).trim()) closeArg(frame, t.start);
        frame.call.end = t.end;
      }
    }
  }
  return roots;
}

/** Calls in the order they finish evaluating (arguments before the call that uses them). */
export function evaluationOrder(sites: readonly CallSite[]): CallSite[] {
  const out: CallSite[] = [];
  const visit = (s: CallSite) => {
    s.children.forEach(visit);
    out.push(s);
  };
  sites.forEach(visit);
  return out;
}

/** The formula with one argument's text replaced. */
export function replaceArgument(formula: string, arg: ArgSite, text: string): string {
  return formula.slice(0, arg.start) + text + formula.slice(arg.end);
}

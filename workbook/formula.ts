/**
 * The adapter of the formula library, fast-formula-parser (MIT, pinned to an exact version in
 * package.json): the only module that uses it (formulaLibrary.ts and its twins, formulaSteps.ts
 * and formulaGroups.ts only load it), and with formulaEvaluator.ts (the library's evaluation
 * steps, adapted to run without its parser) the only one that touches its internals (its lexer,
 * its list of functions whose arguments keep their references, its dependency parser, the
 * wording of its "not implemented" error). test/architecture.test.ts fails if any of those
 * internals change; test/formulaFast.test.ts compares the fast path with the library itself.
 *
 * Formulas are parsed once per shape (a formula filled down a column is one shape, see
 * formulaFast.ts's shapeKey), evaluated by formulaEvaluator.ts, and left to the library's own
 * parser where the fast front end does not read them.
 *
 * What it offers: a formula's calls with their arguments' source text and position (to show
 * arguments "as written" and apply unit fixes), the references its text names (to order a
 * recalculation), its direct precedents (the pane's snapshot), and evaluating parsers.
 */
import type { CellRef, FunctionArg, RangeRef } from "fast-formula-parser";
import type { Token } from "fast-formula-parser/grammar/lexing";
import FormulaErrorClass from "fast-formula-parser/formulas/error";
import { type FormulaLibrary, formulaLibrary } from "./formulaLibrary";
import { Evaluator } from "./formulaEvaluator";
import { columnNumber } from "./address";
import { dottedName } from "./storedForm";
import { cellParts, compile, matchesTemplate, relativeInShape, shapeText, type Compiled, type FastToken, type Template, tokenize } from "./formulaFast";

export type { FunctionArg, RangeRef };
/** The library's error value (its small module of its own: usable before the parser is loaded). */
export const FormulaError = FormulaErrorClass;
export type FormulaErrorValue = InstanceType<typeof FormulaError>;
/** The sheet's last row and column, as the library bounds whole-column and whole-row ranges. */
export const MAX_ROW = 1048576;
export const MAX_COLUMN = 16384;

export interface EvaluatingParser {
  /** Evaluates a formula (without "=") at a position; arrays allowed. */
  parse(formula: string, position: { sheet: string; row: number; col: number }): unknown;
}

/**
 * A parser that calls back for cells and ranges and knows our functions. The arguments of the
 * functions named in `keepReferences` arrive with the reference they were written as (`ref`).
 */
export function evaluatingParser(options: {
  functions: Record<string, (...args: FunctionArg[]) => unknown>;
  keepReferences: readonly string[];
  onCell: (ref: CellRef) => unknown;
  onRange: (ref: RangeRef) => unknown[][];
}): EvaluatingParser {
  // The library's parser, made only for a formula the fast front end leaves to it: making one
  // loads its grammar, which costs more than most workbooks take to evaluate.
  let parser: InstanceType<FormulaLibrary["FormulaParser"]> | undefined;
  const libraryParser = () => {
    if (!parser) {
      parser = new (formulaLibrary().FormulaParser)({ functions: options.functions, onCell: options.onCell, onRange: options.onRange });
      // Internal: the list of functions whose arguments keep their references.
      parser.funsPreserveRef.push(...options.keepReferences.map((n) => n.toUpperCase()));
    }
    return parser;
  };
  let evaluator: Evaluator | undefined;
  return {
    parse: (formula, position) => {
      const compiled = compiledFormula(formula, position);
      if (!compiled) return libraryParser().parse(formula, position, true);
      // The library's own parse(), with our front end in place of its lexer and parser.
      evaluator ??= new Evaluator(formulaLibrary().steps, options);
      evaluator.position = position;
      try {
        return evaluator.checkFormulaResult(compiled(evaluator), true);
      } catch (e) {
        throw FormulaError.ERROR((e as Error).message, e);
      }
    },
  };
}

/**
 * A formula's shape (see shapeKey): its tokens as read at the cell it was first met in, parsed
 * and its references found when first asked for. Formulas filled down a column share one.
 */
interface Shape {
  tokens: FastToken[];
  origin: { row: number; col: number };
  compiled?: Compiled | null;
  refs?: ShapeRef[];
}

/** Shapes by key, a bounded cache: a recalculation reads a formula's references and then evaluates it, and the pane analyses the same formulas again and again. */
const SHAPES = new Map<string, Shape>();
/** The last formula asked about, at its cell: its references and its evaluation come one after the other. */
let last: { formula: string; row: number; col: number; shape: Shape | undefined } | undefined;

/**
 * The last shape met in each column, with its template: a formula filled down a column is
 * matched against it by comparing text (matchesTemplate), without tokenizing it again.
 */
const BY_COLUMN = new Map<number, { template: Template; shape: Shape }>();

/** The formula's shape at a cell, or undefined when the fast front end cannot tokenize it. */
function shapeOf(formula: string, at: { row: number; col: number }): Shape | undefined {
  if (last && last.formula === formula && last.row === at.row && last.col === at.col) return last.shape;
  const above = BY_COLUMN.get(at.col);
  let shape: Shape | undefined;
  if (above && matchesTemplate(above.template, formula, at.row, at.col)) shape = above.shape;
  else {
    const template = shapeText(formula, at.row, at.col);
    shape = template === undefined ? undefined : SHAPES.get(template.key);
    if (template !== undefined && !shape) {
      if (SHAPES.size >= 5_000) SHAPES.clear();
      shape = { tokens: tokenize(formula)!, origin: { row: at.row, col: at.col } };
      SHAPES.set(template.key, shape);
    }
    if (template !== undefined && shape) {
      if (BY_COLUMN.size >= 5_000) BY_COLUMN.clear();
      BY_COLUMN.set(at.col, { template, shape });
    }
  }
  last = { formula, row: at.row, col: at.col, shape };
  return shape;
}

function compiledFormula(formula: string, at: { row: number; col: number }): Compiled | undefined {
  const shape = shapeOf(formula, at);
  if (!shape) return undefined;
  if (shape.compiled === undefined) shape.compiled = compile(shape.tokens, shape.origin) ?? null;
  return shape.compiled ?? undefined;
}

/** The name of the function the library does not implement, when that is what an error says. */
export function notImplementedFunction(e: FormulaErrorValue): string | undefined {
  return /^Function (.+) is not implemented\.?$/.exec(e.message ?? "")?.[1];
}

/** Where the library says a formula could not be parsed, when it does. */
export function isParseError(e: FormulaErrorValue): boolean {
  const details = e.details as { errorLocation?: unknown } | undefined;
  return e.error === "#ERROR!" || Boolean(details?.errorLocation);
}

/** A direct precedent of a formula: one cell (row, col) or a range (from, to). */
export interface PrecedentRef {
  sheet: string;
  row?: number;
  col?: number;
  from?: { row: number; col: number };
  to?: { row: number; col: number };
}

type DependencyParser = { parse(f: string, pos: { sheet: string; row: number; col: number }): PrecedentRef[] };

/** One dependency parser, made on first use: making one costs far more than a parse, and parse starts afresh each time. */
let depParser: DependencyParser | undefined;

/** The cells and ranges a formula reads directly, from the library's dependency parser. */
export function directPrecedents(formula: string, position: { sheet: string; row: number; col: number }): PrecedentRef[] {
  const { DepParser } = formulaLibrary().FormulaParser as unknown as { DepParser: new () => DependencyParser };
  return [...(depParser ??= new DepParser()).parse(formula, position)];
}

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
  const { tokens } = formulaLibrary().lex(formula);
  const roots: CallSite[] = [];
  const stack: { call?: CallSite; argStart: number }[] = [];
  const closeArg = (frame: { call?: CallSite; argStart: number }, at: number) => {
    if (!frame.call) return;
    const raw = formula.slice(frame.argStart, at);
    const lead = raw.length - raw.trimStart().length;
    const text = raw.trim();
    frame.call.args.push({ text, start: frame.argStart + lead, end: frame.argStart + lead + text.length });
  };
  for (const t of tokens as Token[]) {
    const type = t.tokenType.name;
    if (type === "Function") {
      const written = t.image.slice(0, -1).trim();
      const call: CallSite = { name: dottedName(written) ?? written.toUpperCase(), start: t.startOffset, end: -1, args: [], children: [] };
      const parent = [...stack].reverse().find((f) => f.call)?.call;
      (parent ? parent.children : roots).push(call);
      stack.push({ call, argStart: t.endOffset + 1 });
    } else if (type === "OpenParen" || type === "OpenCurlyParen") {
      stack.push({ argStart: t.endOffset + 1 });
    } else if (type === "Comma" || type === "Semicolon") {
      const frame = stack[stack.length - 1];
      if (frame?.call) {
        closeArg(frame, t.startOffset);
        frame.argStart = t.endOffset + 1;
      }
    } else if (type === "CloseParen" || type === "CloseCurlyParen") {
      const frame = stack.pop();
      if (frame?.call) {
        if (frame.call.args.length || formula.slice(frame.argStart, t.startOffset).trim()) closeArg(frame, t.startOffset);
        frame.call.end = t.endOffset + 1;
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

/** A reference found in a formula's text: one cell, or a rectangle (whole columns end at the last row). */
interface FormulaRef {
  /** Sheet named in the reference, or undefined for the formula's own sheet. */
  sheet?: string;
  from: { row: number; col: number };
  to: { row: number; col: number };
}

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

function sheetOf(image: string): string {
  const name = image.slice(0, -1);
  return name.startsWith("'") ? name.slice(1, -1).replace(/''/g, "'") : name;
}

/** The references in a formula's tokens, relative to `origin` where shapeKey writes them relative (none given: as written). */
function shapeRefs(tokens: readonly { type: string; image: string }[], origin?: { row: number; col: number }): ShapeRef[] {
  const out: ShapeRef[] = [];
  const point = (image: string, type: string): ShapePoint | undefined => {
    if (type === "Cell") {
      const c = cellParts(image);
      const relative = origin !== undefined && relativeInShape(c);
      const rowRelative = relative && !c.rowFixed;
      const colRelative = relative && !c.colFixed;
      return { row: rowRelative ? c.row - origin!.row : c.row, col: colRelative ? c.col - origin!.col : c.col, rowRelative, colRelative };
    }
    if (type === "Column") return { row: 0, col: columnNumber(image), rowRelative: false, colRelative: false };
    if (type === "Number" && /^\d+$/.test(image)) return { row: Number(image), col: 0, rowRelative: false, colRelative: false };
    return undefined;
  };
  for (let i = 0; i < tokens.length; i++) {
    let sheet: string | undefined;
    let j = i;
    if (tokens[j].type === "Sheet" || tokens[j].type === "SheetQuoted") {
      sheet = sheetOf(tokens[j].image);
      j++;
    }
    const a = tokens[j] && point(tokens[j].image, tokens[j].type);
    if (!a) continue;
    let b = a;
    let end = j;
    if (tokens[j + 1]?.type === "Colon") {
      let k = j + 2;
      if (tokens[k]?.type === "Sheet" || tokens[k]?.type === "SheetQuoted") k++;
      const p = tokens[k] && point(tokens[k].image, tokens[k].type);
      if (p) {
        b = p;
        end = k;
      }
    }
    // A bare number or column letters alone is not a reference: only as part of A:A or 1:1.
    if (end === j && tokens[j].type !== "Cell") continue;
    out.push({ sheet, a, b });
    i = end;
  }
  return out;
}

/** What eachReference calls for each reference: the sheet named (undefined for the formula's own) and the rectangle; false stops. */
type ReferenceVisitor = (sheet: string | undefined, fromRow: number, fromCol: number, toRow: number, toCol: number) => boolean | void;

/** Calls `visit` for each of a shape's references placed at a cell; false when a visit stopped it. */
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
 * through INDIRECT or OFFSET), from the same lexer that evaluates it, without building a list:
 * a recalculation asks for every formula. False when a visit returned false. The cell the
 * formula is in (`at`) lets formulas filled down a column share the work.
 */
export function eachReference(formula: string, at: { row: number; col: number }, visit: ReferenceVisitor): boolean {
  const shape = shapeOf(formula, at);
  if (!shape) {
    const tokens = (formulaLibrary().lex(formula).tokens as Token[]).map((t) => ({ type: t.tokenType.name, image: t.image }));
    return eachPlaced(shapeRefs(tokens), at, visit);
  }
  shape.refs ??= shapeRefs(shape.tokens, shape.origin);
  return eachPlaced(shape.refs, at, visit);
}

/** The references a formula names in its text, as a list (see eachReference). */
export function references(formula: string, at: { row: number; col: number } = { row: 1, col: 1 }): FormulaRef[] {
  const out: FormulaRef[] = [];
  eachReference(formula, at, (sheet, fromRow, fromCol, toRow, toCol) => {
    out.push({ sheet, from: { row: fromRow, col: fromCol }, to: { row: toRow, col: toCol } });
  });
  return out;
}

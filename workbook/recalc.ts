/**
 * Recalculates a workbook's formulas outside Excel with the same calculation core: formulas
 * are parsed and evaluated by fast-formula-parser (references, ranges, arithmetic, &,
 * comparisons and Excel's common functions); every NAPPE.* call goes through the catalogue's
 * evaluate(), and is recorded with its inputs, result and warnings for the audit.
 */
import { CalcError } from "../functions/calc/_lib/result";
import { evaluate, type Evaluation, type RawArg } from "../functions/bind/evaluate";
import { CATALOG } from "../functions/catalog";
import { type EvaluatingParser, evaluatingParser, FormulaError, type FormulaErrorValue, type FunctionArg, eachReference, isParseError, MAX_COLUMN, MAX_ROW, notImplementedFunction, type RangeRef } from "./formula";
import { addressOf, type CellModel, cellKey, type CellValue, findSheet, parseAddress, type SheetModel, type WorkbookModel } from "./model";
import { sheetPrefix } from "./address";
import { displayFormula, dottedName, expandLet, externalLinkIndexes, hasNappeCall, otherAddinFunctions, resolveNames, UDF_PREFIX, unknownNappeFunctions } from "./storedForm";
import { EXTRA_FUNCTIONS } from "./extraFunctions";
import { formatNumber } from "./format";

/** One NAPPE call made while computing a cell. */
export interface CallRecord {
  id: string;
  /** What each argument referred to ("Inputs!B4", "Pump!A2:D8"), if a reference. */
  refs: (string | undefined)[];
  evaluation?: Evaluation;
  error?: { kind: "num" | "value"; message: string };
}

export type Status = "ok" | "warning" | "error";

export interface CellOutcome {
  sheet: string;
  address: string;
  formula: string;
  /** Recalculated value: a scalar, or rows of a spilled result. */
  value: CellValue | CellValue[][];
  /** Unit of the value when the formula is a single NAPPE call. */
  unit: string;
  cached: CellValue;
  /** Relative difference from the cached value, when both are numbers. */
  difference: number | null;
  status: Status;
  messages: string[];
  calls: CallRecord[];
  /** False when the engine could not compute the formula (an error of its own or of a precedent, another workbook, another add-in). */
  recalculated: boolean;
}

/** A time and memory budget the recalculation checks as it goes (headless/package.ts). */
interface Budget {
  check(stage: string): void;
}

interface RecalcOptions {
  /** Relative tolerance against cached values (default 1e-6). */
  tolerance?: number;
  /** Called as formulas are computed. */
  onProgress?: (done: number, total: number) => void;
  /** Report every formula cell, not only those calling NAPPE. */
  all?: boolean;
  /** Time and memory budget, checked as formulas are computed. */
  budget?: Budget;
}

interface Computed {
  value: CellValue | CellValue[][];
  error?: string;
  message?: string;
  calls: CallRecord[];
  /** Where a failure started: this cell, or the precedent it came from. */
  cause?: { cell: string; message: string };
  /** The cell reads another workbook: its cached value is used, not recalculated. */
  external?: string;
}

/**
 * Deepest chain of formulas computed inside one another. Formulas are put in dependency order
 * before they are computed, so chains only nest through references the text does not show
 * (INDIRECT, OFFSET).
 */
const MAX_DEPTH = 400;

/** True when the whole formula is one NAPPE call, such as NAPPE.HEAD(B2, , "ft"). */
function isSingleNappeCall(formula: string): boolean {
  const m = /^\s*NAPPE\.[A-Z0-9.]+\s*\(/i.exec(formula);
  if (!m) return false;
  let depth = 0;
  let inString = false;
  for (let i = m[0].length - 1; i < formula.length; i++) {
    const ch = formula[i];
    if (ch === '"') inString = !inString;
    else if (!inString && ch === "(") depth++;
    else if (!inString && ch === ")") {
      depth--;
      if (depth === 0) return formula.slice(i + 1).trim() === "";
    }
  }
  return false;
}

function rangeText(ref: FunctionArg["ref"], here: string): string | undefined {
  if (!ref) return undefined;
  const prefix = ref.sheet && ref.sheet !== here ? sheetPrefix(ref.sheet) : "";
  if (ref.from && ref.to) return `${prefix}${addressOf(ref.from.row, ref.from.col)}:${addressOf(ref.to.row, ref.to.col)}`;
  if (ref.row && ref.col) return `${prefix}${addressOf(ref.row, ref.col)}`;
  return undefined;
}

function toCellValue(v: unknown): CellValue {
  if (v === undefined || v === null) return null;
  if (typeof v === "number" || typeof v === "string" || typeof v === "boolean") return v;
  if (v instanceof FormulaError) return v.error;
  return String(v);
}

/** A cell as messages name it: "Sheet!B4". */
function cellText(cell: CellModel): string {
  return `${cell.sheet}!${addressOf(cell.row, cell.col)}`;
}

const NO_CALLS: CallRecord[] = Object.freeze([]) as unknown as CallRecord[];

/** The formula parsers of every Recalculation, one per nesting depth (see parserAt). */
const SHARED_PARSERS: { parser: EvaluatingParser; route: { to?: Recalculation } }[] = [];

export class Recalculation {
  /** The formula cells being computed, outermost first. */
  private readonly visiting: CellModel[] = [];
  private readonly spillOwner = new Map<string, CellModel>();
  /** The NAPPE calls of each formula being computed (null until its first call). */
  private readonly calls: (CallRecord[] | null)[] = [];
  /** Formula cells whose failed results the formula being computed has read. */
  private readonly failedReads: (CellModel[] | null)[] = [];
  /** Formula cells of each sheet, for ordering ranges. */
  private readonly formulaCells = new Map<string, CellModel[]>();
  private computedCount = 0;

  constructor(
    private readonly wb: WorkbookModel,
    private readonly budget?: Budget,
  ) {
    for (const sheet of wb.sheets) this.formulaCells.set(sheet.name, [...sheet.cells.values()].filter((c) => c.formula));
    for (const sheet of wb.sheets) {
      for (const cell of sheet.cells.values()) {
        if (!cell.arrayRef) continue;
        const [a, b] = cell.arrayRef.split(":");
        const from = parseAddress(a);
        const to = parseAddress(b ?? a);
        for (let r = from.row; r <= to.row; r++) for (let c = from.col; c <= to.col; c++) if (r !== cell.row || c !== cell.col) this.spillOwner.set(`${sheet.name}!${cellKey(r, c)}`, cell);
      }
    }
  }

  /**
   * A parser for the current nesting depth: fast-formula-parser is not re-entrant, and a
   * formula's references may need other formulas computed while it is being parsed.
   */
  private parserAt(depth: number): EvaluatingParser {
    // Making a parser costs far more than a parse (the pane analyses cells one by one, each with
    // a new Recalculation), so the parsers are shared: each depth's callbacks go to the
    // Recalculation that last took that depth. Parsing is synchronous, so none is shared at once.
    while (SHARED_PARSERS.length <= depth) {
      const route: { to?: Recalculation } = {};
      const functions: Record<string, (...args: FunctionArg[]) => unknown> = {};
      // Both forms a NAPPE call takes: dotted as typed, and as Excel stores it (_xldudf_NAPPE_X_Y).
      for (const spec of CATALOG) {
        const call = (...args: FunctionArg[]) => route.to!.callNappe(spec.id, args);
        functions[`NAPPE.${spec.id}`] = call;
        functions[`${UDF_PREFIX}NAPPE_${spec.id.replace(/\./g, "_")}`.toUpperCase()] = call;
      }
      Object.assign(functions, EXTRA_FUNCTIONS, {
        ANCHORARRAY: (arg: FunctionArg) => route.to!.spillOf(arg),
        SINGLE: (arg: FunctionArg) => route.to!.implicitIntersection(arg),
      });
      const parser = evaluatingParser({
        functions,
        // References on our functions' arguments let the audit say where each input came from.
        keepReferences: [...Object.keys(functions).filter((n) => n.startsWith("NAPPE.") || n.startsWith("_XLDUDF_")), "ANCHORARRAY", "SINGLE"],
        onCell: (ref) => route.to!.scalarAt(ref.sheet, ref.row, ref.col),
        onRange: (ref) => route.to!.rangeValues(ref),
      });
      SHARED_PARSERS.push({ parser, route });
    }
    SHARED_PARSERS[depth].route.to = this;
    return SHARED_PARSERS[depth].parser;
  }

  private callNappe(id: string, args: FunctionArg[]): unknown {
    const here = this.currentSheet();
    const record: CallRecord = { id, refs: args.map((a) => rangeText(a.ref, here)) };
    if (this.calls.length) (this.calls[this.calls.length - 1] ??= []).push(record);
    const raws: RawArg[] = [];
    for (const a of args) {
      if (a.value instanceof FormulaError) throw a.value;
      if (a.omitted) raws.push(null);
      else if (Array.isArray(a.value)) {
        const rows = a.value as unknown[][];
        for (const row of rows) for (const v of row) if (v instanceof FormulaError) throw v;
        raws.push(rows.map((row) => row.map((v) => (v as RawArg) ?? null)));
      }
      else raws.push((a.value as RawArg) ?? null);
    }
    try {
      const spec = CATALOG.find((s) => s.id === id)!;
      record.evaluation = evaluate(spec, raws);
      return record.evaluation.value;
    } catch (e) {
      if (e instanceof CalcError) {
        record.error = { kind: e.kind, message: e.message };
        return new FormulaError(e.kind === "num" ? "#NUM!" : "#VALUE!", e.message);
      }
      throw e;
    }
  }

  /** The whole spilled result of the cell a spill reference (B5#) names. */
  private spillOf(arg: FunctionArg): CellValue[][] {
    const ref = arg.ref;
    if (!ref || ref.row === undefined || ref.col === undefined) throw new FormulaError("#REF!", "a spill reference (#) must name one cell");
    const v = this.valueAt(ref.sheet ?? this.currentSheet(), ref.row, ref.col);
    if (v instanceof FormulaError) throw v;
    return Array.isArray(v) ? v : [[v]];
  }

  /** Excel's implicit intersection (@): one value from a range, in the formula's own row or column. */
  private implicitIntersection(arg: FunctionArg): CellValue {
    const ref = arg.ref;
    if (!ref?.from || !ref.to) {
      const v = arg.value as unknown;
      return Array.isArray(v) ? ((v as CellValue[][])[0]?.[0] ?? null) : (v as CellValue);
    }
    const { row: r, col: c } = this.visiting[this.visiting.length - 1];
    const sheet = ref.sheet ?? this.currentSheet();
    if (ref.from.row === ref.to.row && ref.from.col === ref.to.col) return this.scalarAt(sheet, ref.from.row, ref.from.col);
    if (ref.from.col === ref.to.col && r >= ref.from.row && r <= ref.to.row) return this.scalarAt(sheet, r, ref.from.col);
    if (ref.from.row === ref.to.row && c >= ref.from.col && c <= ref.to.col) return this.scalarAt(sheet, ref.from.row, c);
    throw new FormulaError("#VALUE!", "@ (implicit intersection): the range does not cross the formula's row or column");
  }

  private currentSheet(): string {
    return this.visiting[this.visiting.length - 1]?.sheet ?? "";
  }

  /** Each sheet's cells by a number made from row and column, built on first use (no key text to make per read). */
  private readonly cellIndexes = new Map<SheetModel, Map<number, CellModel>>();
  private cellAt(sheet: SheetModel, row: number, col: number): CellModel | undefined {
    let index = this.cellIndexes.get(sheet);
    if (!index) {
      index = new Map();
      for (const c of sheet.cells.values()) index.set(c.row * (MAX_COLUMN + 1) + c.col, c);
      this.cellIndexes.set(sheet, index);
    }
    return index.get(row * (MAX_COLUMN + 1) + col);
  }

  private readonly sheetsByName = new Map<string, SheetModel | undefined>();
  /** findSheet, remembered by name (every cell read asks). */
  private sheet(name: string): SheetModel | undefined {
    let s = this.sheetsByName.get(name);
    if (s === undefined && !this.sheetsByName.has(name)) {
      s = findSheet(this.wb, name);
      this.sheetsByName.set(name, s);
    }
    return s;
  }

  private scalarAt(sheet: string, row: number, col: number): CellValue {
    const v = this.valueAt(sheet, row, col);
    return Array.isArray(v) ? (v[0]?.[0] ?? null) : v;
  }

  private rangeValues(ref: RangeRef): CellValue[][] {
    const sheet = this.sheet(ref.sheet);
    let lastRow = ref.to.row;
    let lastCol = ref.to.col;
    if (sheet && (lastRow >= MAX_ROW || lastCol >= MAX_COLUMN)) {
      const { maxR, maxC } = this.extent(sheet.name);
      lastRow = Math.min(lastRow, Math.max(maxR, ref.from.row));
      lastCol = Math.min(lastCol, Math.max(maxC, ref.from.col));
    }
    // A range read once is read again from here (200 formulas over the same column read it once):
    // every value in it is final once read, formulas included (they are computed on the way).
    const key = `${ref.sheet}!${ref.from.row}:${ref.from.col}:${lastRow}:${lastCol}`;
    const known = this.ranges.get(key);
    if (known) return known;
    const rows: CellValue[][] = [];
    for (let r = ref.from.row; r <= lastRow; r++) {
      const row: CellValue[] = [];
      for (let c = ref.from.col; c <= lastCol; c++) row.push(this.scalarAt(ref.sheet, r, c));
      rows.push(row);
    }
    if (!this.visiting.some((k) => this.inRange(k, ref.sheet, ref.from, lastRow, lastCol))) this.ranges.set(key, rows);
    return rows;
  }

  private readonly ranges = new Map<string, CellValue[][]>();

  /** True when a cell being computed lies in the range (its value is not final yet). */
  private inRange(cell: CellModel, sheet: string, from: { row: number; col: number }, lastRow: number, lastCol: number): boolean {
    if (cell.sheet.toLowerCase() !== sheet.toLowerCase()) return false;
    const { row: r, col: c } = cell;
    return r >= from.row && r <= lastRow && c >= from.col && c <= lastCol;
  }

  private readonly extents = new Map<string, { maxR: number; maxC: number }>();
  /** The last used row and column of a sheet, spills included (computed once). */
  private extent(name: string): { maxR: number; maxC: number } {
    let e = this.extents.get(name);
    if (!e) {
      e = { maxR: 0, maxC: 0 };
      const sheet = findSheet(this.wb, name)!;
      for (const c of sheet.cells.values()) {
        e.maxR = Math.max(e.maxR, c.row);
        e.maxC = Math.max(e.maxC, c.col);
      }
      for (const [key] of this.spillOwner) {
        if (!key.startsWith(`${sheet.name}!`)) continue;
        const [r, c] = key.slice(sheet.name.length + 1).split(":").map(Number);
        e.maxR = Math.max(e.maxR, r);
        e.maxC = Math.max(e.maxC, c);
      }
      this.extents.set(name, e);
    }
    return e;
  }

  /** Notes that the formula being computed read a failed formula cell. */
  private readFailed(cell: CellModel): void {
    if (!this.failedReads.length) return;
    const list = (this.failedReads[this.failedReads.length - 1] ??= []);
    if (!list.includes(cell)) list.push(cell);
  }

  /** Value of a cell, computing its formula (or the array formula it belongs to) when needed. */
  valueAt(sheetName: string, row: number, col: number): CellValue | CellValue[][] {
    const sheet = this.sheet(sheetName);
    if (!sheet) throw new FormulaError("#REF!", `there is no sheet named "${sheetName}"`);
    const cell = this.cellAt(sheet, row, col);
    if (cell?.formula) {
      const c = this.computeNow(cell);
      if (c.error) {
        this.readFailed(cell);
        return new FormulaError(c.error, c.message ?? c.error) as unknown as CellValue;
      }
      return c.value;
    }
    const owner = this.spillOwner.size ? this.spillOwner.get(`${sheet.name}!${cellKey(row, col)}`) : undefined;
    if (owner) {
      const c = this.computeNow(owner);
      if (c.error) {
        this.readFailed(owner);
        return new FormulaError(c.error, c.message ?? c.error) as unknown as CellValue;
      }
      if (Array.isArray(c.value)) return toCellValue(c.value[row - owner.row]?.[col - owner.col]);
      return row === owner.row && col === owner.col ? c.value : null;
    }
    return cell ? cell.value : null;
  }

  /**
   * Calls `visit` for each formula cell a formula's text refers to (spill owners included), until
   * a visit returns false; false then. Most formulas read a few single cells: no list is made.
   */
  private eachPrecedent(cell: CellModel, visit: (precedent: CellModel) => boolean | void): boolean {
    try {
      return eachReference(this.prepared(cell), cell, (sheetName, fromRow, fromCol, toRow, toCol) => {
        const sheet = this.sheet(sheetName ?? cell.sheet);
        if (!sheet) return true;
        if (fromRow === toRow && fromCol === toCol) {
          const c = this.cellAt(sheet, fromRow, fromCol);
          if (c?.formula && visit(c) === false) return false;
          const owner = this.spillOwner.size ? this.spillOwner.get(`${sheet.name}!${cellKey(fromRow, fromCol)}`) : undefined;
          return !owner || visit(owner) !== false;
        }
        for (const c of this.formulaCells.get(sheet.name) ?? []) {
          let inside = c.row >= fromRow && c.row <= toRow && c.col >= fromCol && c.col <= toCol;
          if (!inside && c.arrayRef) {
            const [a, b] = c.arrayRef.split(":");
            const p = parseAddress(a);
            const q = parseAddress(b ?? a);
            inside = q.row >= fromRow && p.row <= toRow && q.col >= fromCol && p.col <= toCol;
          }
          if (inside && visit(c) === false) return false;
        }
        return true;
      });
    } catch {
      return true; // text the lexer cannot read has no references to order by
    }
  }

  private readonly preparedText = new Map<CellModel, string>();
  /** The formula as the parser takes it: defined names and LET written out (kept only where that changes it). */
  private prepared(cell: CellModel): string {
    const formula = cell.formula!;
    if (!this.wb.names?.length && !/LET\s*\(/i.test(formula)) return formula;
    let text = this.preparedText.get(cell);
    if (text === undefined) {
      text = formula;
      if (this.wb.names?.length) text = resolveNames(text, cell.sheet, this.wb.names);
      if (/LET\s*\(/i.test(text)) text = expandLet(text);
      this.preparedText.set(cell, text);
    }
    return text;
  }

  /**
   * Computes a formula cell once, after the formula cells it refers to, in dependency order
   * (an explicit stack, so a running total 20,000 rows long needs no deep recursion).
   */
  compute(cell: CellModel): Computed {
    const known = this.done.get(cell);
    if (known) return known;
    // Most formulas read only constants and formulas already computed: no ordering to do.
    if (this.eachPrecedent(cell, (p) => this.done.has(p))) return this.computeNow(cell);
    const state = new Map<CellModel, 1 | 2>();
    const stack: CellModel[] = [cell];
    while (stack.length) {
      const top = stack[stack.length - 1];
      if (this.done.has(top) || state.get(top) === 2) {
        stack.pop();
        continue;
      }
      if (state.get(top) === 1) {
        stack.pop();
        state.set(top, 2);
        this.computeNow(top);
        continue;
      }
      state.set(top, 1);
      this.eachPrecedent(top, (p) => {
        if (!this.done.has(p) && !state.has(p)) stack.push(p);
      });
    }
    return this.computeNow(cell);
  }

  /** Computed formula cells. */
  private readonly done = new Map<CellModel, Computed>();

  private computeNow(cell: CellModel): Computed {
    const known = this.done.get(cell);
    if (known) return known;
    if (this.visiting.includes(cell)) {
      const cycle = [...this.visiting.slice(this.visiting.indexOf(cell)), cell].map(cellText);
      return { value: "#REF!", error: "#REF!", message: `circular reference: ${cycle.join(" → ")}`, calls: [] };
    }
    if (this.visiting.length >= MAX_DEPTH) {
      return { value: "#REF!", error: "#REF!", message: `a chain of more than ${MAX_DEPTH} formulas reached through INDIRECT or OFFSET, each waiting on the next; Nappe cannot order it in advance`, calls: [] };
    }
    if (++this.computedCount % 1024 === 0) this.budget?.check("recalculating formulas");
    const result = this.evaluateCell(cell);
    this.done.set(cell, result);
    return result;
  }

  private evaluateCell(cell: CellModel): Computed {
    const external = externalLinkIndexes(cell.formula!);
    if (external.length) {
      const files = external.map((i) => `[${i}] ${this.wb.externalLinks?.get(i) ?? "(link not found in the file)"}`);
      return { value: cell.value, calls: [], external: `reads another workbook, ${files.join(", ")}: not recalculated; the value cached in the file is used` };
    }
    const unknown = unknownNappeFunctions(cell.formula!);
    if (unknown.length) {
      const message = `${dottedName(unknown[0]) ?? unknown[0]} is not a Nappe function: check its name in the function guide`;
      return { value: "#NAME?", error: "#NAME?", message, calls: [], cause: { cell: cellText(cell), message } };
    }
    const others = otherAddinFunctions(cell.formula!);
    if (others.length) {
      const message = `calls ${others.join(", ")} of another add-in: Nappe cannot recalculate it; the value cached in the file is used`;
      return { value: cell.value, calls: [], external: message };
    }
    this.visiting.push(cell);
    // Most formulas call nothing of ours and read no failed cell: their lists are made only when needed.
    this.calls.push(null);
    this.failedReads.push(null);
    let result: Computed;
    const calls = () => this.calls[this.calls.length - 1] ?? NO_CALLS;
    try {
      const out = this.parserAt(this.visiting.length - 1).parse(this.prepared(cell), { sheet: cell.sheet, row: cell.row, col: cell.col });
      if (out instanceof FormulaError) {
        result = { value: out.error, error: out.error, message: describeFormulaError(out), calls: calls() };
      } else if (Array.isArray(out)) {
        result = { value: (out as unknown[][]).map((r) => (Array.isArray(r) ? r.map(toCellValue) : [toCellValue(r)])), calls: calls() };
      } else {
        result = { value: toCellValue(out), calls: calls() };
      }
    } catch (e) {
      if (e instanceof FormulaError) {
        result = { value: e.error, error: e.error, message: describeFormulaError(e), calls: calls() };
      } else {
        result = { value: "#ERROR!", error: "#ERROR!", message: `the formula could not be evaluated: ${e instanceof Error ? e.message.split("\n")[0] : String(e)}`, calls: calls() };
      }
    }
    const failed = this.failedReads[this.failedReads.length - 1] ?? [];
    this.visiting.pop();
    this.calls.pop();
    this.failedReads.pop();
    if (result.error) {
      // A failure that came from a precedent names it, and the cell where it started.
      const first = failed.map((c) => [`${c.sheet}!${c.address}`, this.done.get(c)] as const).find(([, c]) => c?.error);
      if (first && first[1] && !result.calls.some((c) => c.error)) {
        const cause = first[1].cause ?? { cell: first[0], message: first[1].message ?? first[1].error! };
        const from = cause.cell !== first[0] ? ` (it starts at ${cause.cell})` : "";
        result.message = `reads ${first[0]}, which failed${from}: ${cause.message}`;
        result.cause = cause;
      } else {
        result.cause = { cell: cellText(cell), message: result.message ?? result.error };
      }
    }
    return result;
  }
}

function describeFormulaError(e: FormulaErrorValue): string {
  const missing = notImplementedFunction(e);
  if (missing) return `unsupported function ${missing}: Nappe's formula engine does not compute it`;
  if (isParseError(e)) {
    const first = (e.message ?? "").split("\n")[0].trim();
    return `the formula could not be parsed${first ? `: ${first}` : " (check brackets, commas and quotes)"}`;
  }
  if (e.error === "#NAME?") return `unknown function or name${e.message ? `: ${e.message.split("\n")[0]}` : ""}`;
  return e.message || e.error;
}

function relativeDifference(value: number, cached: number): number {
  if (value === cached) return 0;
  return Math.abs(value - cached) / Math.max(Math.abs(cached), 1e-300);
}

/** A formula cell's report: status, messages and the comparison with the cached value. */
export function outcomeFor(cell: CellModel, computed: Computed, tolerance = 1e-6): CellOutcome {
  const messages: string[] = [];
  let status: Status = "ok";
  for (const call of computed.calls) {
    if (call.error) messages.push(`NAPPE.${call.id}: ${call.error.message}`);
    for (const w of call.evaluation?.warnings ?? []) messages.push(`NAPPE.${call.id}: ${w}`);
    if (call.evaluation?.warnings.length) status = "warning";
  }
  if (computed.error) {
    status = "error";
    if (computed.message && !messages.some((m) => m.endsWith(computed.message!))) messages.unshift(computed.message);
    if (!messages.length) messages.push(`the formula returns ${computed.error}`);
  }
  const formula = displayFormula(cell.formula!);
  if (computed.external) {
    return { sheet: cell.sheet, address: cell.address, formula: `=${formula}`, value: computed.value, unit: "", cached: cell.value, difference: null, status: "warning", messages: [computed.external], calls: [], recalculated: false };
  }
  const top = computed.calls[computed.calls.length - 1];
  const unit = isSingleNappeCall(formula) && top?.evaluation ? top.evaluation.unit : "";
  const shown = Array.isArray(computed.value) ? computed.value[0]?.[0] ?? null : computed.value;
  let difference: number | null = null;
  if (typeof shown === "number" && typeof cell.value === "number") {
    difference = relativeDifference(shown, cell.value);
    if (difference > tolerance) {
      status = "error";
      // The cached value in full: the difference may sit beyond the figures views show.
      messages.push(`differs from the value cached in the file (${cell.value}) by ${formatNumber(difference * 100, 3)} %`);
    }
  } else if (cell.value !== null && shown !== cell.value && !computed.error) {
    status = "error";
    messages.push(`differs from the value cached in the file (${String(cell.value)})`);
  }
  return { sheet: cell.sheet, address: cell.address, formula: `=${formula}`, value: computed.value, unit, cached: cell.value, difference, status, messages, calls: computed.calls, recalculated: !computed.error };
}

/** What a run found and did, for the summary line. */
interface RecalcCounts {
  /** Formula cells in the workbook. */
  formulas: number;
  /** Formula cells that call a NAPPE function (either stored form). */
  nappe: number;
  /** NAPPE formula cells computed to a value (ok, warning, or differing from the cache). */
  recalculated: number;
  /** NAPPE formula cells that could not be computed. */
  notRecalculated: number;
  /** Custom functions of other add-ins the workbook calls, by name. */
  otherAddins: string[];
}

export interface RecalcResult {
  /** The NAPPE formula cells (or every formula cell, with options.all), in sheet order. */
  cells: CellOutcome[];
  counts: RecalcCounts;
  /** Recalculated value of any cell ("Summary", "B4"); errors as their code. */
  valueOf(sheet: string, address: string): CellValue | CellValue[][];
}

/** Recalculates every formula and reports the NAPPE ones (or all, with options.all). */
export function recalculate(wb: WorkbookModel, options: RecalcOptions = {}): RecalcResult {
  const tolerance = options.tolerance ?? 1e-6;
  const engine = new Recalculation(wb, options.budget);
  const formulaCells = wb.sheets.flatMap((s) => [...s.cells.values()].filter((c) => c.formula));
  const isNappe = new Set(formulaCells.filter((c) => hasNappeCall(c.formula!)));
  const reported = formulaCells.filter((c) => options.all || isNappe.has(c));
  formulaCells.forEach((cell, i) => {
    engine.compute(cell);
    options.onProgress?.(i + 1, formulaCells.length);
  });
  const outcomes = reported.map((cell) => outcomeFor(cell, engine.compute(cell), tolerance));
  const nappeOutcomes = outcomes.filter((_, i) => isNappe.has(reported[i]));
  const counts: RecalcCounts = {
    formulas: formulaCells.length,
    nappe: isNappe.size,
    recalculated: nappeOutcomes.filter((c) => c.recalculated).length,
    notRecalculated: nappeOutcomes.filter((c) => !c.recalculated).length,
    otherAddins: [...new Set(formulaCells.flatMap((c) => otherAddinFunctions(c.formula!)))].sort(),
  };
  return {
    cells: outcomes,
    counts,
    valueOf: (sheet, address) => {
      const { row, col } = parseAddress(address);
      const v = engine.valueAt(sheet, row, col);
      return v instanceof FormulaError ? v.error : v;
    },
  };
}

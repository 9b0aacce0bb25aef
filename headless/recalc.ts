/**
 * Recalculates a workbook's formulas outside Excel with the same calculation core: formulas
 * are parsed and evaluated by fast-formula-parser (references, ranges, arithmetic, &,
 * comparisons and Excel's common functions); every NAPPE.* call goes through the catalogue's
 * evaluate(), and is recorded with its inputs, result and warnings for the audit.
 */
import FormulaParser, { type FunctionArg, type RangeRef } from "fast-formula-parser";
import { CalcError } from "../functions/calc/_lib/result";
import { evaluate, type Evaluation, type RawArg } from "../functions/bind/evaluate";
import { CATALOG } from "../functions/catalog";
import { addressOf, type CellModel, cellKey, type CellValue, findSheet, parseAddress, type WorkbookModel } from "./model";

const { FormulaError } = FormulaParser;

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
}

export interface RecalcOptions {
  /** Relative tolerance against cached values (default 1e-6). */
  tolerance?: number;
  /** Called as formulas are computed. */
  onProgress?: (done: number, total: number) => void;
  /** Report every formula cell, not only those calling NAPPE. */
  all?: boolean;
}

export interface Computed {
  value: CellValue | CellValue[][];
  error?: string;
  message?: string;
  calls: CallRecord[];
}

const NAPPE_CALL = /\bNAPPE\./i;
/** Deepest chain of formulas computed inside one another. */
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

function rangeText(sheet: string, ref: FunctionArg["ref"], here: string): string | undefined {
  if (!ref) return undefined;
  const prefix = ref.sheet && ref.sheet !== here ? `${ref.sheet}!` : "";
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

export class Recalculation {
  private readonly memo = new Map<string, Computed>();
  private readonly visiting: string[] = [];
  private readonly spillOwner = new Map<string, CellModel>();
  private readonly calls: CallRecord[][] = [];
  private readonly parsers: FormulaParser[] = [];

  constructor(private readonly wb: WorkbookModel) {
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
  private parserAt(depth: number): FormulaParser {
    while (this.parsers.length <= depth) {
      const functions: Record<string, (...args: FunctionArg[]) => unknown> = {};
      for (const spec of CATALOG) functions[`NAPPE.${spec.id}`] = (...args) => this.callNappe(spec.id, args);
      const parser = new FormulaParser({
        functions,
        onCell: (ref) => this.scalarAt(ref.sheet, ref.row, ref.col),
        onRange: (ref) => this.rangeValues(ref),
      });
      // Keep references on our functions' arguments so the audit can say where each input came from.
      parser.funsPreserveRef.push(...Object.keys(functions));
      this.parsers.push(parser);
    }
    return this.parsers[depth];
  }

  private callNappe(id: string, args: FunctionArg[]): unknown {
    const here = this.visiting[this.visiting.length - 1]?.split("!")[0] ?? "";
    const record: CallRecord = { id, refs: args.map((a) => rangeText(here, a.ref, here)) };
    this.calls[this.calls.length - 1]?.push(record);
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

  private scalarAt(sheet: string, row: number, col: number): CellValue {
    const v = this.valueAt(sheet, row, col);
    return Array.isArray(v) ? (v[0]?.[0] ?? null) : v;
  }

  private rangeValues(ref: RangeRef): CellValue[][] {
    const sheet = findSheet(this.wb, ref.sheet);
    let lastRow = ref.to.row;
    let lastCol = ref.to.col;
    if (sheet && (lastRow >= FormulaParser.MAX_ROW || lastCol >= FormulaParser.MAX_COLUMN)) {
      let maxR = 0;
      let maxC = 0;
      for (const c of sheet.cells.values()) {
        maxR = Math.max(maxR, c.row);
        maxC = Math.max(maxC, c.col);
      }
      lastRow = Math.min(lastRow, Math.max(maxR, ref.from.row));
      lastCol = Math.min(lastCol, Math.max(maxC, ref.from.col));
    }
    const rows: CellValue[][] = [];
    for (let r = ref.from.row; r <= lastRow; r++) {
      const row: CellValue[] = [];
      for (let c = ref.from.col; c <= lastCol; c++) row.push(this.scalarAt(ref.sheet, r, c));
      rows.push(row);
    }
    return rows;
  }

  /** Value of a cell, computing its formula (or the array formula it belongs to) when needed. */
  valueAt(sheetName: string, row: number, col: number): CellValue | CellValue[][] {
    const sheet = findSheet(this.wb, sheetName);
    if (!sheet) throw new FormulaError("#REF!", `there is no sheet named "${sheetName}"`);
    const cell = sheet.cells.get(cellKey(row, col));
    if (cell?.formula) {
      const c = this.compute(cell);
      if (c.error) return new FormulaError(c.error, c.message ?? c.error) as unknown as CellValue;
      return c.value;
    }
    const owner = this.spillOwner.get(`${sheet.name}!${cellKey(row, col)}`);
    if (owner) {
      const c = this.compute(owner);
      if (c.error) return new FormulaError(c.error, c.message ?? c.error) as unknown as CellValue;
      if (Array.isArray(c.value)) return toCellValue(c.value[row - owner.row]?.[col - owner.col]);
      return row === owner.row && col === owner.col ? c.value : null;
    }
    return cell ? cell.value : null;
  }

  /** Computes a formula cell once. */
  compute(cell: CellModel): Computed {
    const key = `${cell.sheet}!${cellKey(cell.row, cell.col)}`;
    const done = this.memo.get(key);
    if (done) return done;
    if (this.visiting.includes(key)) {
      const cycle = [...this.visiting.slice(this.visiting.indexOf(key)), key].map((k) => {
        const [s, rc] = k.split("!");
        const [r, c] = rc.split(":").map(Number);
        return `${s}!${addressOf(r, c)}`;
      });
      return { value: "#REF!", error: "#REF!", message: `circular reference: ${cycle.join(" → ")}`, calls: [] };
    }
    if (this.visiting.length >= MAX_DEPTH) {
      return { value: "#REF!", error: "#REF!", message: `a chain of more than ${MAX_DEPTH} formulas each waiting on the next; break the chain or report it`, calls: [] };
    }
    this.visiting.push(key);
    this.calls.push([]);
    let result: Computed;
    try {
      const out = this.parserAt(this.visiting.length - 1).parse(cell.formula!, { sheet: cell.sheet, row: cell.row, col: cell.col }, true);
      const calls = this.calls[this.calls.length - 1];
      if (out instanceof FormulaError) {
        result = { value: out.error, error: out.error, message: out.message || undefined, calls };
      } else if (Array.isArray(out)) {
        result = { value: (out as unknown[][]).map((r) => (Array.isArray(r) ? r.map(toCellValue) : [toCellValue(r)])), calls };
      } else {
        result = { value: toCellValue(out), calls };
      }
    } catch (e) {
      const calls = this.calls[this.calls.length - 1];
      if (e instanceof FormulaError) {
        result = { value: e.error, error: e.error, message: describeFormulaError(e), calls };
      } else {
        result = { value: "#ERROR!", error: "#ERROR!", message: `the formula could not be evaluated: ${e instanceof Error ? e.message.split("\n")[0] : String(e)}`, calls };
      }
    } finally {
      this.visiting.pop();
      this.calls.pop();
    }
    this.memo.set(key, result!);
    return result!;
  }
}

function describeFormulaError(e: InstanceType<typeof FormulaError>): string {
  const details = e.details as { errorLocation?: { line: number; column: number } } | undefined;
  if (e.error === "#ERROR!" || details?.errorLocation) {
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
  const top = computed.calls[computed.calls.length - 1];
  const unit = isSingleNappeCall(cell.formula!) && top?.evaluation ? top.evaluation.unit : "";
  const shown = Array.isArray(computed.value) ? computed.value[0]?.[0] ?? null : computed.value;
  let difference: number | null = null;
  if (typeof shown === "number" && typeof cell.value === "number") {
    difference = relativeDifference(shown, cell.value);
    if (difference > tolerance) {
      status = "error";
      messages.push(`differs from the value cached in the file (${cell.value}) by ${(difference * 100).toPrecision(3)} %`);
    }
  } else if (cell.value !== null && shown !== cell.value && !computed.error) {
    status = "error";
    messages.push(`differs from the value cached in the file (${String(cell.value)})`);
  }
  return { sheet: cell.sheet, address: cell.address, formula: `=${cell.formula}`, value: computed.value, unit, cached: cell.value, difference, status, messages, calls: computed.calls };
}

export interface RecalcResult {
  /** The NAPPE formula cells (or every formula cell, with options.all), in sheet order. */
  cells: CellOutcome[];
  /** Recalculated value of any cell ("Summary", "B4"); errors as their code. */
  valueOf(sheet: string, address: string): CellValue | CellValue[][];
}

/** Recalculates every formula and reports the NAPPE ones (or all, with options.all). */
export function recalculate(wb: WorkbookModel, options: RecalcOptions = {}): RecalcResult {
  const tolerance = options.tolerance ?? 1e-6;
  const engine = new Recalculation(wb);
  const formulaCells = wb.sheets.flatMap((s) => [...s.cells.values()].filter((c) => c.formula));
  const reported = formulaCells.filter((c) => options.all || NAPPE_CALL.test(c.formula!));
  // Compute in sheet order first, so most references are ready before they are needed.
  formulaCells.forEach((cell, i) => {
    engine.compute(cell);
    options.onProgress?.(i + 1, formulaCells.length);
  });
  const outcomes = reported.map((cell) => outcomeFor(cell, engine.compute(cell), tolerance));
  return {
    cells: outcomes,
    valueOf: (sheet, address) => {
      const { row, col } = parseAddress(address);
      const v = engine.valueAt(sheet, row, col);
      return v instanceof FormulaError ? v.error : v;
    },
  };
}

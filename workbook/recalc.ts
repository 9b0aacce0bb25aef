/**
 * Recalculates a workbook's formulas outside Excel with the same calculation core: formulas
 * are parsed and evaluated by our formula engine (workbook/formula/), which reaches the workbook
 * through the Host this module implements; every NAPPE.* call goes through the catalogue's
 * evaluate(), and is recorded with its inputs, result and warnings for the audit.
 */
import { CalcError } from "../functions/calc/_lib/result";
import { evaluate, type Evaluation, type RawArg } from "../functions/bind/evaluate";
import { CATALOG } from "../functions/catalog";
import { eachReference, evaluateFormula, evaluateText, FormulaError, type Host, MAX_COLUMN, MAX_ROW } from "./formula";
import type { Ctx, NappeArg } from "./formula/evaluate";
import { type ErrorCode, Lambda, Ref, type Scalar, type Value, XArray } from "./formula/values";
import { serialFromIso } from "./formula/serial";
import { formulaLibrary } from "./formulaLibrary";
import { addressOf, type CellModel, cellKey, type CellValue, findSheet, parseAddress, type SheetModel, type WorkbookModel } from "./model";
import { sheetPrefix } from "./address";
import { displayFormula, dottedName, externalLinkIndexes, hasNappeCall, otherAddinFunctions, resolveNames, unknownNappeFunctions } from "./storedForm";
import { formatNumber, plural } from "./format";
import type { Diagnosis } from "./crossCheck";
import { addFindings, type KeptDiagnosis } from "./findings";
import { labelSource } from "./model";

/** One NAPPE call made while computing a cell. */
export interface CallRecord {
  id: string;
  /** What each argument referred to ("Inputs!B4", "Pump!A2:D8"), if a reference. */
  refs: (string | undefined)[];
  evaluation?: Evaluation;
  error?: { kind: "num" | "value"; message: string };
  /** A kept cross-check's diagnosis (NAPPE.CROSSCHECK), added by findings.ts. */
  diagnosis?: Diagnosis;
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
  /** Diagnoses kept cross-checks (workbook/crossCheck.ts diagnoseKeptCheck); without it they keep their own verdict. */
  diagnose?: KeptDiagnosis;
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

function rangeText(ref: Ref | undefined, here: string): string | undefined {
  if (!ref) return undefined;
  const prefix = ref.sheet && ref.sheet !== here ? sheetPrefix(ref.sheet) : "";
  if (ref.single) return `${prefix}${addressOf(ref.r1, ref.c1)}`;
  return `${prefix}${addressOf(ref.r1, ref.c1)}:${addressOf(ref.r2, ref.c2)}`;
}

function toCellValue(v: unknown): CellValue {
  if (v === undefined || v === null) return null;
  if (typeof v === "number" || typeof v === "string" || typeof v === "boolean") return v;
  if (v instanceof FormulaError) return v.error;
  return String(v);
}

/** Error values as a constant cell holds them (t="e" in the file). */
const ERROR_TEXT = /^#(NULL!|DIV\/0!|VALUE!|REF!|NAME\?|NUM!|N\/A|GETTING_DATA|SPILL!|CALC!)$/;

/** Functions whose value changes at every recalculation: not compared with the value cached in the file. */
const VOLATILE = /(?:^|[^A-Za-z0-9_.])(?:_xlfn\.)?(NOW|TODAY|RAND|RANDBETWEEN|RANDARRAY)\s*\(/i;

/** A cell as messages name it: "Sheet!B4". */
function cellText(cell: CellModel): string {
  return `${cell.sheet}!${addressOf(cell.row, cell.col)}`;
}

const NO_CALLS: CallRecord[] = Object.freeze([]) as unknown as CallRecord[];

const NAPPE_IDS = new Set(CATALOG.map((s) => s.id));

export class Recalculation implements Host {
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

  /** The catalogue id of a NAPPE function name in either stored form. */
  nappeId(name: string): string | undefined {
    const dotted = dottedName(name);
    if (!dotted) return undefined;
    const id = dotted.slice("NAPPE.".length);
    return NAPPE_IDS.has(id) ? id : undefined;
  }

  nappe(id: string, args: NappeArg[], c: Ctx): Value {
    const record: CallRecord = { id, refs: args.map((a) => rangeText(a.ref, c.sheet)) };
    if (this.calls.length) (this.calls[this.calls.length - 1] ??= []).push(record);
    const raws: RawArg[] = [];
    for (const a of args) {
      if (a.omitted) {
        raws.push(null);
        continue;
      }
      let v = a.value;
      if (v instanceof Ref) v = v.single ? this.cell(v.sheet, v.r1, v.c1) : this.area(v);
      if (v instanceof FormulaError) return v;
      if (v instanceof Lambda) return new FormulaError("#VALUE!", "a LAMBDA is not an argument of a NAPPE function");
      if (v instanceof XArray) {
        for (const row of v.data) for (const x of row) if (x instanceof FormulaError) return x;
        raws.push(v.data.map((row) => row.map((x) => (x as RawArg) ?? null)));
      } else raws.push((v as RawArg) ?? null);
    }
    try {
      const spec = CATALOG.find((s) => s.id === id)!;
      record.evaluation = evaluate(spec, raws);
      const out = record.evaluation.value;
      return Array.isArray(out) ? XArray.of((out as CellValue[][]).map((r) => r.slice())) : (out as Scalar);
    } catch (e) {
      if (e instanceof CalcError) {
        record.error = { kind: e.kind, message: e.message };
        return new FormulaError(e.kind === "num" ? "#NUM!" : "#VALUE!", e.message);
      }
      throw e;
    }
  }

  /** A defined name the text substitution leaves: a named LAMBDA called as a function. */
  definedName(name: string, sheet: string, c: Ctx): Value | undefined {
    const lower = name.toLowerCase();
    const names = this.wb.names ?? [];
    const found = names.find((n) => n.name.toLowerCase() === lower && n.sheet === sheet) ?? names.find((n) => n.name.toLowerCase() === lower && !n.sheet);
    if (!found) return undefined;
    return evaluateText(found.refersTo.replace(/^=/, ""), c);
  }

  formulaText(sheetName: string, row: number, col: number): string | undefined {
    const sheet = this.sheet(sheetName);
    return sheet ? this.cellAt(sheet, row, col)?.formula : undefined;
  }

  /** A cell's value for a formula: a failed formula's error, a dated cell's serial number, a stored error value. */
  cell(sheetName: string, row: number, col: number): Scalar {
    const v = this.valueAt(sheetName, row, col);
    if (Array.isArray(v)) return (v[0]?.[0] ?? null) as Scalar;
    if (typeof v !== "string" || !(v.charCodeAt(0) === 35 || (v.length >= 10 && v.charCodeAt(4) === 45))) return v as Scalar;
    // A constant cell's stored error (t="e", read as its text), or a dated cell (read as an ISO date).
    const sheet = this.sheet(sheetName);
    const c = sheet && this.cellAt(sheet, row, col);
    if (!c || c.formula) return v;
    if (ERROR_TEXT.test(v)) return new FormulaError(v as ErrorCode, `${v} stored in ${sheetName}!${addressOf(row, col)}`);
    return c.numFmt ? (serialFromIso(v) ?? v) : v;
  }

  spill(sheetName: string, row: number, col: number): Value {
    const v = this.valueAt(sheetName, row, col);
    if (v instanceof FormulaError) return v;
    if (Array.isArray(v)) return XArray.of(v.map((r) => r.map((x) => (typeof x === "string" && ERROR_TEXT.test(x) ? new FormulaError(x as never) : x))));
    return v as Scalar;
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

  /** The values of a rectangle, whole columns and rows cut to the used part of the sheet; frozen, read once. */
  area(ref: Ref): XArray {
    const sheet = this.sheet(ref.sheet);
    let lastRow = ref.r2;
    let lastCol = ref.c2;
    if (sheet && (lastRow >= MAX_ROW || lastCol >= MAX_COLUMN)) {
      const { maxR, maxC } = this.extent(sheet.name);
      lastRow = Math.min(lastRow, Math.max(maxR, ref.r1));
      lastCol = Math.min(lastCol, Math.max(maxC, ref.c1));
    }
    // A range read once is read again from here (200 formulas over the same column read it once):
    // every value in it is final once read, formulas included (they are computed on the way). The
    // values are frozen: no function can change what another formula reads.
    const key = `${ref.sheet}!${ref.r1}:${ref.c1}:${lastRow}:${lastCol}`;
    const known = this.ranges.get(key);
    if (known) return known;
    const rows: Scalar[][] = [];
    for (let r = ref.r1; r <= lastRow; r++) {
      const row: Scalar[] = [];
      for (let c = ref.c1; c <= lastCol; c++) row.push(this.cell(ref.sheet, r, c));
      rows.push(row);
    }
    const values = XArray.of(rows);
    if (!this.visiting.some((k) => this.inRange(k, ref.sheet, { row: ref.r1, col: ref.c1 }, lastRow, lastCol))) this.ranges.set(key, values);
    return values;
  }

  private readonly ranges = new Map<string, XArray>();

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
        return new FormulaError(c.error as ErrorCode, c.message ?? c.error) as unknown as CellValue;
      }
      return c.value;
    }
    const owner = this.spillOwner.size ? this.spillOwner.get(`${sheet.name}!${cellKey(row, col)}`) : undefined;
    if (owner) {
      const c = this.computeNow(owner);
      if (c.error) {
        this.readFailed(owner);
        return new FormulaError(c.error as ErrorCode, c.message ?? c.error) as unknown as CellValue;
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
  /** The formula as the engine takes it: defined names written out (kept only where that changes it). */
  private prepared(cell: CellModel): string {
    const formula = cell.formula!;
    if (!this.wb.names?.length) return formula;
    let text = this.preparedText.get(cell);
    if (text === undefined) {
      text = resolveNames(formula, cell.sheet, this.wb.names);
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
    const out = evaluateFormula(this.prepared(cell), { sheet: cell.sheet, row: cell.row, col: cell.col }, this, formulaLibrary(), !!cell.arrayRef || !!this.wb.dynamicArrays, this.visiting.length - 1);
    if (out instanceof FormulaError) result = { value: out.error, error: out.error, message: out.message || out.error, calls: calls() };
    else if (out instanceof XArray) result = { value: out.data.map((r) => r.map(toCellValue)), calls: calls() };
    else result = { value: toCellValue(out), calls: calls() };
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

function relativeDifference(value: number, cached: number): number {
  if (value === cached) return 0;
  return Math.abs(value - cached) / Math.max(Math.abs(cached), 1e-300);
}

/** What the engine could not compute, as its messages say: an unsupported function, text that is no formula, a name that is no Nappe function. */
const CANNOT = /unsupported function|could not be parsed|is not a Nappe function|circular reference/;

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
  if (cell.value === "#NAME?" && hasNappeCall(cell.formula!)) {
    // Saved where the add-in was not loaded (LibreOffice, Excel without Nappe): the cache proves nothing.
  } else if (VOLATILE.test(formula)) {
    // NOW, TODAY, RAND...: a new value at every recalculation, so the cached one proves nothing.
  } else if (typeof shown === "number" && typeof cell.value === "number") {
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
  // A formula that returns an Excel error (#N/A from a lookup, #NUM! from a bad input) was recalculated; one the engine could not compute was not.
  const recalculated = !computed.error || !CANNOT.test(computed.message ?? "");
  return { sheet: cell.sheet, address: cell.address, formula: `=${formula}`, value: computed.value, unit, cached: cell.value, difference, status, messages, calls: computed.calls, recalculated };
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
  /** NAPPE formula cells whose cached value is #NAME?: saved where the add-in was not loaded. */
  savedWithoutAddin: number;
}

/**
 * The one summary line every command and view prints, in one format: "34 NAPPE formulas found in
 * 68 formulas (34 recalculated): 23 ok, 11 warning, 0 error". Statuses are the outcomes' own,
 * which include the unit check and kept cross-checks (findings.ts).
 */
export function summaryLine(counts: RecalcCounts, statuses: readonly { status: Status }[], all = false): string {
  const n = { ok: 0, warning: 0, error: 0 };
  for (const c of statuses) n[c.status]++;
  const done = `${counts.recalculated} recalculated${counts.notRecalculated ? `, ${counts.notRecalculated} not recalculated` : ""}`;
  const tally = `${n.ok} ok, ${n.warning} warning, ${n.error} error`;
  if (all) return `${plural(counts.formulas, "formula")}, ${counts.nappe} of them calling NAPPE (${done}): ${tally}`;
  return `${plural(counts.nappe, "NAPPE formula")} found in ${plural(counts.formulas, "formula")} (${done}): ${tally}`;
}

/** Said once, at the top, of a copy saved where the add-in was not loaded (every NAPPE cell cached as #NAME?). */
export function savedWithoutAddinNotice(counts: RecalcCounts): string | undefined {
  const n = counts.savedWithoutAddin;
  if (!n) return undefined;
  return `${n === counts.nappe ? `Every NAPPE formula (${n}) was` : `${plural(n, "NAPPE formula")} ${n === 1 ? "was" : "were"}`} saved where the add-in was not loaded (the file caches #NAME?, as LibreOffice or Excel without Nappe leave it): recalculated here, not compared with the cache.`;
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
  const src = { wb, value: (sheet: string, row: number, col: number) => {
    const v = engine.valueAt(sheet, row, col);
    return v instanceof FormulaError ? v.error : v;
  } };
  const labels = labelSource(wb);
  const outcomes = reported.map((cell) => {
    const outcome = outcomeFor(cell, engine.compute(cell), tolerance);
    return isNappe.has(cell) ? addFindings(outcome, src, labels, options.diagnose) : outcome;
  });
  const nappeOutcomes = outcomes.filter((_, i) => isNappe.has(reported[i]));
  const counts: RecalcCounts = {
    formulas: formulaCells.length,
    nappe: isNappe.size,
    recalculated: nappeOutcomes.filter((c) => c.recalculated).length,
    notRecalculated: nappeOutcomes.filter((c) => !c.recalculated).length,
    otherAddins: [...new Set(formulaCells.flatMap((c) => otherAddinFunctions(c.formula!)))].sort(),
    savedWithoutAddin: [...isNappe].filter((c) => c.value === "#NAME?").length,
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

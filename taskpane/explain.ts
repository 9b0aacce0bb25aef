/**
 * The explanation of a selected cell: every NAPPE call in its formula (nested ones too) with
 * its purpose, equation, each argument as written and as read (unit and why), the result in
 * base units and in the requested unit, assumptions, checks, cautions and sources, plus the
 * unit check of arguments read from labelled cells, with one-click fixes. Pure: it reads the
 * workbook through the HostPort only, and evaluates with the same recalculation engine as the
 * headless command (over a snapshot of the formula's direct precedents).
 */
import { CATALOG_BY_ID } from "../functions/catalog";
import { DIMENSIONS } from "../functions/units/dimensions";
import { callView, type CallView, pairCalls } from "../workbook/callView";
import { exactNumber, formatQuantity, formatValue } from "../workbook/format";
import { callSites, directPrecedents, evaluationOrder, type PrecedentRef, replaceArgument, type CallSite } from "../workbook/formula";
import { addressOf, cellKey, type CellModel, type CellValue, type DefinedName, getCell, parseAddress, type WorkbookModel } from "../workbook/model";
import { addFindings } from "../workbook/findings";
import { splitReference } from "../workbook/address";
import { type CallRecord, type CellOutcome, outcomeFor, Recalculation } from "../workbook/recalc";
import { displayFormula, hasNappeCall, resolveNames } from "../workbook/storedForm";
import type { LabelSource, UnitFinding } from "../workbook/unitCheck";
import { type ChartData, chartFor, withNpsha } from "./chartData";
import { toBase } from "../functions/units/quantity";
import type { CellSnapshot, HostPort } from "./host/port";
import { formulaLibraryReady } from "../workbook/formulaLibrary";

interface UnitWarning {
  message: string;
  /** The whole formula with the fix applied, ready to write back. */
  fixedFormula?: string;
  /** Short label for the fix button: Inputs!B14&" ft". */
  fixLabel?: string;
  /** The input cell the fix joins a unit to, and that unit: other formulas reading it are offered the same fix. */
  input?: { sheet: string; address: string; unit: string };
  /** The label that declared the unit, and its text corrected to the unit the number is read in. */
  label?: UnitFinding["label"];
}

/** One call as the pane shows it: the one call-view model, its text in the formula, and the unit fixes it offers. */
export interface CallExplanation extends CallView {
  /** The call's own text in the formula. */
  text: string;
  unitWarnings: UnitWarning[];
}

export interface CellExplanation {
  sheet: string;
  address: string;
  formula?: string;
  value: string;
  /** Every digit of a numeric value, to copy. */
  exact?: string;
  /** A short message when there is nothing to explain (empty cell, constant, no NAPPE call). */
  message?: string;
  /** An error of the whole formula (parse error, circular reference...). */
  error?: string;
  calls: CallExplanation[];
  /** Curves to draw when the formula calls a pump or system function. */
  chart?: ChartData;
}


/** The cells a label may sit in: up to three to the left on the same row, then the one above. */
function labelRequests(sheet: string, row: number, col: number): { sheet: string; range: string }[] {
  const out: { sheet: string; range: string }[] = [];
  if (col > 1) out.push({ sheet, range: `${addressOf(row, Math.max(1, col - 3))}:${addressOf(row, col - 1)}` });
  if (row > 1) out.push({ sheet, range: addressOf(row - 1, col) });
  return out;
}

/** The labels read by labelRequests: the nearest text to the left, then the text above (as HostPort.labelsNear). */
function labelsFrom(reads: CellSnapshot[][][], hasLeft: boolean): string[] {
  const text = (v: CellValue) => (typeof v === "string" && v.trim() && !/^#/.test(v) ? v : undefined);
  const found: string[] = [];
  const left = hasLeft ? reads[0]?.[0] ?? [] : [];
  const nearest = [...left].reverse().map((c) => text(c.value)).find(Boolean);
  if (nearest) found.push(nearest);
  const above = reads[hasLeft ? 1 : 0]?.[0]?.[0];
  const t = above ? text(above.value) : undefined;
  if (t) found.push(t);
  return found;
}

/** Reads the formula's direct precedents from the host into a small workbook model. */
async function snapshot(port: HostPort, sheet: string, address: string, formula: string, names: DefinedName[]): Promise<{ wb: WorkbookModel; labels: Map<string, string[]>; formats: Map<string, string | undefined>; formulas: Map<string, string> }> {
  const target = parseAddress(address);
  const wb: WorkbookModel = { sheets: [], ...(port.dynamicArrays ? { dynamicArrays: true } : {}) };
  const sheetModel = (name: string) => {
    let s = wb.sheets.find((x) => x.name === name);
    if (!s) wb.sheets.push((s = { name, cells: new Map() }));
    return s;
  };
  const put = (c: CellModel) => sheetModel(c.sheet).cells.set(cellKey(c.row, c.col), c);
  put({ sheet, address, row: target.row, col: target.col, value: null, formula });
  // Defined names go with the snapshot, and their cells are read like any other precedent.
  if (names.length) wb.names = names;
  let refs: PrecedentRef[] = [];
  try {
    refs = directPrecedents(resolveNames(formula, sheet, names), { sheet, row: target.row, col: target.col });
  } catch {
    refs = [];
  }
  const labels = new Map<string, string[]>();
  const formats = new Map<string, string | undefined>();
  // Precedents' own formulas, for the unit check to follow plain references (=Inputs!B14) to the input they copy.
  const formulas = new Map<string, string>();
  const follow: { sheet: string; address: string; formula: string }[] = [];
  // Every precedent range, and the label cells of every single-cell precedent, in one read.
  const wanted = refs.filter((ref) => {
    const from = ref.from ?? { row: ref.row!, col: ref.col! };
    const to = ref.to ?? from;
    return to.row - from.row <= 5000 && to.col - from.col <= 100;
  });
  const requests = wanted.flatMap((ref) => {
    const from = ref.from ?? { row: ref.row!, col: ref.col! };
    const to = ref.to ?? from;
    return [{ sheet: ref.sheet, range: `${addressOf(from.row, from.col)}:${addressOf(to.row, to.col)}` }, ...(ref.from ? [] : labelRequests(ref.sheet, from.row, from.col))];
  });
  const answers = await port.ranges(requests);
  let next = 0;
  for (const ref of wanted) {
    const from = ref.from ?? { row: ref.row!, col: ref.col! };
    const cells = answers[next++];
    cells.forEach((row, i) =>
      row.forEach((c, j) => {
        const r = from.row + i;
        const col = from.col + j;
        if (ref.sheet === sheet && r === target.row && col === target.col) return;
        // Precedents keep the host's values: their own formulas were already calculated there.
        put({ sheet: ref.sheet, address: addressOf(r, col), row: r, col, value: c.value, numFmt: c.numberFormat });
        if (c.formula) {
          formulas.set(`${ref.sheet}!${addressOf(r, col)}`, c.formula);
          follow.push({ sheet: ref.sheet, address: addressOf(r, col), formula: c.formula });
        }
      }),
    );
    if (!ref.from) {
      const a = addressOf(from.row, from.col);
      const count = labelRequests(ref.sheet, from.row, from.col).length;
      labels.set(`${ref.sheet}!${a}`, labelsFrom(answers.slice(next, next + count), from.col > 1));
      next += count;
      formats.set(`${ref.sheet}!${a}`, cells[0]?.[0]?.numberFormat);
    }
  }
  // Up to three plain references deep: the cells they copy with their labels, one read per depth.
  for (let depth = 0; depth < 3 && follow.length; depth++) {
    const targets = new Map<string, { sheet: string; address: string }>();
    for (const f of follow.splice(0)) {
      const m = /^\s*((?:'(?:[^']|'')+'|[A-Za-z_][A-Za-z0-9_.]*)!)?\$?([A-Za-z]{1,3})\$?(\d+)\s*$/.exec(f.formula);
      if (!m) continue;
      const t = splitReference(`${m[1] ?? ""}${m[2]}${m[3]}`, f.sheet);
      const key = `${t.sheet}!${t.address.toUpperCase()}`;
      if (!labels.has(key) && !targets.has(key)) targets.set(key, { sheet: t.sheet, address: t.address.toUpperCase() });
    }
    if (!targets.size) break;
    const list = [...targets.entries()];
    const reads = await port.ranges(
      list.flatMap(([, t]) => {
        const { row, col } = parseAddress(t.address);
        return [{ sheet: t.sheet, range: t.address }, ...labelRequests(t.sheet, row, col)];
      }),
    );
    let k = 0;
    for (const [key, t] of list) {
      const { row, col } = parseAddress(t.address);
      const cell = reads[k++][0][0];
      const count = labelRequests(t.sheet, row, col).length;
      labels.set(key, labelsFrom(reads.slice(k, k + count), col > 1));
      k += count;
      formats.set(key, cell.numberFormat);
      if (cell.formula) {
        formulas.set(key, cell.formula);
        follow.push({ sheet: t.sheet, address: t.address, formula: cell.formula });
      }
    }
  }
  return { wb, labels, formats, formulas };
}

function labelSourceFrom(labels: Map<string, string[]>, formats: Map<string, string | undefined>, formulas: Map<string, string>): LabelSource {
  return {
    labelsNear: (sheet, row, col) => labels.get(`${sheet}!${addressOf(row, col)}`) ?? [],
    numberFormat: (sheet, row, col) => formats.get(`${sheet}!${addressOf(row, col)}`),
    formula: (sheet, row, col) => formulas.get(`${sheet}!${addressOf(row, col)}`),
  };
}

function explainCall(rec: CallRecord, site: CallSite | undefined, formula: string, sheet: string, labels: LabelSource): CallExplanation {
  const view = callView(rec, site, sheet, labels);
  const spec = CATALOG_BY_ID.get(rec.id)!;
  const unitWarnings = view.unitFindings.map((f): UnitWarning => {
    const arg = site?.args[spec.params.findIndex((p) => p.name === f.arg)];
    const joined = arg && f.unit ? `${/^[A-Za-z0-9_$!'. ]+$/.test(arg.text) ? arg.text : `(${arg.text})`}&" ${f.unit}"` : undefined;
    const plain = arg && /^((?:'(?:[^']|'')+'|[A-Za-z_][A-Za-z0-9_.]*)!)?\$?[A-Za-z]{1,3}\$?\d+$/.test(arg.text);
    const input = plain && f.unit ? { ...splitReference(arg.text.replace(/\$/g, ""), sheet), unit: f.unit } : undefined;
    return { message: f.message, fixedFormula: arg && joined ? displayFormula(replaceArgument(formula, arg, joined)) : undefined, fixLabel: joined, input, label: f.label };
  });
  return { ...view, text: site ? displayFormula(formula.slice(site.start, site.end)) : `NAPPE.${rec.id}(…)`, unitWarnings };
}

/**
 * NPSH available as the workbook computes it: the first NAPPE.NPSHA formula's result, in m.
 * (A workbook with several pumps should keep one NPSHA per pump; the first one is drawn.)
 */
async function workbookNpsha(port: HostPort): Promise<{ value: number; cell: string } | undefined> {
  const cells = (await port.nappeFormulaCells()).filter((c) => /\bNAPPE\.NPSHA\s*\(/i.test(displayFormula(c.formula)));
  for (const c of cells) {
    const snap = await snapshot(port, c.sheet, c.address, c.formula, (await port.cellAndNames(c.sheet, c.address)).names);
    const { row, col } = parseAddress(c.address);
    const computed = new Recalculation(snap.wb).compute(snap.wb.sheets.find((s) => s.name === c.sheet)!.cells.get(cellKey(row, col))!);
    const call = computed.calls.find((x) => x.id === "NPSHA" && x.evaluation);
    if (call) return { value: baseValue(call), cell: `${c.sheet}!${c.address}` };
  }
  return undefined;
}

/** A scalar call result in its dimension's base unit. */
function baseValue(rec: CallRecord): number {
  const ev = rec.evaluation!;
  return ev.unit && ev.unit !== DIMENSIONS[ev.dim].base ? toBase("npsha", ev.value as number, ev.dim, ev.unit) : (ev.value as number);
}

/** A cell's explanation, and its outcome in the audit model (status, messages, calls). */
interface CellAnalysis {
  explanation: CellExplanation;
  outcome?: CellOutcome;
  /** Labels and formats of the referenced cells, for the audit's unit check. */
  labels: LabelSource;
}

const NO_LABELS: LabelSource = { labelsNear: () => [], numberFormat: () => undefined };

/**
 * What the analyses of one workbook check share, so that it is found once: the workbook's NPSHa
 * (drawn on every pump cell's chart).
 */
interface AnalysisCache {
  npsha?: Promise<{ value: number; cell: string } | undefined>;
  /** The whole workbook, for kept cross-checks. */
  workbook?: Promise<WorkbookModel>;
}

/** Explains the cell at sheet!address. */
export async function explainCell(port: HostPort, sheet: string, address: string): Promise<CellExplanation> {
  return (await analyseCell(port, sheet, address)).explanation;
}

/** Evaluates the cell's formula over a snapshot of its precedents and explains every NAPPE call. */
export async function analyseCell(port: HostPort, sheet: string, address: string, shared: AnalysisCache = {}): Promise<CellAnalysis> {
  await formulaLibraryReady();
  const { cell, names } = await port.cellAndNames(sheet, address);
  const base = { sheet, address, value: formatValue(cell.value), calls: [] as CallExplanation[] };
  if (!cell.formula) {
    if (cell.value === null || cell.value === "") return { labels: NO_LABELS, explanation: { ...base, message: "Empty cell. Select a cell with a NAPPE formula to see its equation, inputs and units." } };
    return { labels: NO_LABELS, explanation: { ...base, message: "A constant, not a formula. If a NAPPE formula reads it as a bare number, that number is taken in the base unit of the argument: select that formula to check." } };
  }
  const formula = cell.formula;
  if (!hasNappeCall(formula)) {
    return { labels: NO_LABELS, explanation: { ...base, formula, message: "This formula calls no NAPPE function. Use the function guide to insert one." } };
  }
  let sites: CallSite[] = [];
  try {
    sites = evaluationOrder(callSites(formula));
  } catch {
    sites = [];
  }
  const snap = await snapshot(port, sheet, address, formula, names);
  const engine = new Recalculation(snap.wb);
  const { row, col } = parseAddress(address);
  const model = snap.wb.sheets.find((s) => s.name === sheet)!.cells.get(cellKey(row, col))!;
  const computed = engine.compute(model);
  const labels = labelSourceFrom(snap.labels, snap.formats, snap.formulas);
  // The unit check, and a kept cross-check's diagnosis over the whole workbook (read once per check).
  const kept = /CROSSCHECK/i.test(formula);
  const whole = kept ? await (shared.workbook ??= port.workbookSnapshot()) : snap.wb;
  // The diagnosis loads as a chunk of its own, the first time a kept check is analysed.
  const diagnose = kept ? (await import(/* webpackChunkName: "crosscheck" */ "../workbook/crossCheck")).diagnoseKeptCheck : undefined;
  const outcome = addFindings(outcomeFor({ ...model, value: cell.value }, computed), { wb: whole, value: (s, r, c) => getCell(whole, s, r, c)?.value ?? null }, labels, diagnose);
  const pairs = pairCalls(outcome.calls, sites);
  const calls = outcome.calls.map((rec, i) => explainCall(rec, pairs[i], formula, sheet, labels));
  // Outermost first reads best: reverse evaluation order.
  calls.reverse();
  const error = computed.error ? computed.message ?? computed.error : undefined;
  let chart: ChartData | undefined;
  try {
    chart = chartFor(computed.calls);
    if (chart?.series.some((x) => x.name === "NPSHr")) {
      const npsha = await (shared.npsha ??= workbookNpsha(port));
      if (npsha) chart = withNpsha(chart, npsha.value, npsha.cell);
    }
  } catch {
    chart = undefined;
  }
  // The value line carries the unit of a single NAPPE call; a spilled result is labelled in its call's card.
  const v = computed.value as CellValue | CellValue[][];
  const value = Array.isArray(v) ? `spills ${v.length} ${v.length === 1 ? "row" : "rows"} (the table is below)` : typeof v === "number" && outcome.unit ? formatQuantity(v, outcome.unit) : formatValue(v);
  return { labels, outcome, explanation: { ...base, formula: displayFormula(formula), value, ...(typeof v === "number" ? { exact: exactNumber(v) } : {}), error, calls, chart } };
}

/**
 * The explanation of a selected cell: every NAPPE call in its formula (nested ones too) with
 * its purpose, equation, each argument as written and as read (unit and why), the result in
 * base units and in the requested unit, assumptions, checks, cautions and sources, plus the
 * unit check of arguments read from labelled cells, with one-click fixes. Pure: it reads the
 * workbook through the HostPort only, and evaluates with the same recalculation engine as the
 * headless command (over a snapshot of the formula's direct precedents).
 */
import { CATALOG_BY_ID } from "../functions/catalog";
import { resultDimension } from "../functions/catalog/types";
import type { ArgReading } from "../functions/bind/evaluate";
import type { Table } from "../functions/tables/table";
import { DIMENSIONS } from "../functions/units/dimensions";
import { formatNumber, formatValue } from "../workbook/audit";
import { callSites, directPrecedents, evaluationOrder, type PrecedentRef, replaceArgument, type CallSite } from "../workbook/formula";
import { addressOf, cellKey, type CellModel, type CellValue, parseAddress, type WorkbookModel } from "../workbook/model";
import { type CallRecord, type CellOutcome, outcomeFor, Recalculation } from "../workbook/recalc";
import { displayFormula, hasNappeCall, resolveNames } from "../workbook/storedForm";
import { checkCallUnits, type LabelSource } from "../workbook/unitCheck";
import { type ChartData, chartFor, withNpsha } from "./chartData";
import { toBase } from "../functions/units/quantity";
import type { HostPort } from "./host/port";

interface ArgExplanation {
  name: string;
  /** The argument as written in the formula ("Inputs!B14", "\"6 in\"", or "" when left out). */
  written: string;
  /** Value as read, for people. */
  value: string;
  /** Unit it was read in. */
  unit: string;
  /** Why that unit: bare number (base unit), text quantity, percent, table header, default. */
  why: string;
  /** Base-unit value with its unit. */
  base: string;
}

interface UnitWarning {
  message: string;
  /** The whole formula with the fix applied, ready to write back. */
  fixedFormula?: string;
  /** Short label for the fix button: Inputs!B14&" ft". */
  fixLabel?: string;
}

export interface CallExplanation {
  id: string;
  /** The call's own text in the formula. */
  text: string;
  purpose: string;
  equation: string;
  args: ArgExplanation[];
  resultBase?: string;
  resultRequested?: string;
  assumptions: readonly string[];
  checks: readonly string[];
  warnings: string[];
  unitWarnings: UnitWarning[];
  cautions: readonly string[];
  sources: readonly string[];
  error?: string;
}

export interface CellExplanation {
  sheet: string;
  address: string;
  formula?: string;
  value: string;
  /** A short message when there is nothing to explain (empty cell, constant, no NAPPE call). */
  message?: string;
  /** An error of the whole formula (parse error, circular reference...). */
  error?: string;
  calls: CallExplanation[];
  /** Curves to draw when the formula calls a pump or system function. */
  chart?: ChartData;
}


function howWhy(r: ArgReading): { unit: string; why: string } {
  switch (r.how) {
    case "base unit":
      return { unit: r.unit, why: "bare number, so the base unit" };
    case "text quantity":
      return { unit: r.unit, why: "unit written with the number" };
    case "percent":
      return { unit: "%", why: "percent text" };
    case "default":
      return { unit: r.unit, why: "left out, so the default" };
    case "table":
      return { unit: "", why: "units from the header row (base units without one)" };
    default:
      return { unit: "", why: r.how };
  }
}

/** "81.56041424282913 m^3/h" → "81.5604 m^3/h" (the number as people read it, the unit as written). */
function shortenQuantity(text: string): string {
  const m = /^\s*([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)(\s*.*)$/.exec(text);
  return m ? `${formatNumber(Number(m[1]))}${m[2]}` : text;
}

function describeArg(r: ArgReading, written: string, baseUnit: string): ArgExplanation {
  const { unit, why } = howWhy(r);
  if (r.how === "table") {
    const t = r.value as Table;
    const cols = t.columns.map((c) => `${c.header ?? c.role} → ${c.role} in ${c.unit || DIMENSIONS[c.dim].baseLabel}`).join("; ");
    return { name: r.name, written, value: `${t.rows} rows`, unit: "", why, base: cols };
  }
  const raw = r.raw === null || r.raw === undefined ? undefined : Array.isArray(r.raw) ? "(range)" : typeof r.raw === "number" ? formatNumber(r.raw) : shortenQuantity(String(r.raw));
  if (typeof r.value !== "number") return { name: r.name, written, value: raw ?? String(r.value), unit, why, base: String(r.value) };
  return { name: r.name, written, value: raw ?? formatNumber(r.value), unit, why, base: `${formatNumber(r.value)}${baseUnit ? ` ${baseUnit}` : ""}` };
}

/** Reads the formula's direct precedents from the host into a small workbook model. */
async function snapshot(port: HostPort, sheet: string, address: string, formula: string): Promise<{ wb: WorkbookModel; labels: Map<string, string[]>; formats: Map<string, string | undefined> }> {
  const target = parseAddress(address);
  const wb: WorkbookModel = { sheets: [] };
  const sheetModel = (name: string) => {
    let s = wb.sheets.find((x) => x.name === name);
    if (!s) wb.sheets.push((s = { name, cells: new Map() }));
    return s;
  };
  const put = (c: CellModel) => sheetModel(c.sheet).cells.set(cellKey(c.row, c.col), c);
  put({ sheet, address, row: target.row, col: target.col, value: null, formula });
  // Defined names go with the snapshot, and their cells are read like any other precedent.
  const names = await port.definedNames();
  if (names.length) wb.names = names;
  let refs: PrecedentRef[] = [];
  try {
    refs = directPrecedents(resolveNames(formula, sheet, names), { sheet, row: target.row, col: target.col });
  } catch {
    refs = [];
  }
  const labels = new Map<string, string[]>();
  const formats = new Map<string, string | undefined>();
  for (const ref of refs) {
    const from = ref.from ?? { row: ref.row!, col: ref.col! };
    const to = ref.to ?? from;
    if (to.row - from.row > 5000 || to.col - from.col > 100) continue;
    const rangeText = `${addressOf(from.row, from.col)}:${addressOf(to.row, to.col)}`;
    const cells = await port.range(ref.sheet, rangeText);
    cells.forEach((row, i) =>
      row.forEach((c, j) => {
        const r = from.row + i;
        const col = from.col + j;
        if (ref.sheet === sheet && r === target.row && col === target.col) return;
        // Precedents keep the host's values: their own formulas were already calculated there.
        put({ sheet: ref.sheet, address: addressOf(r, col), row: r, col, value: c.value, numFmt: c.numberFormat });
      }),
    );
    if (!ref.from) {
      const a = addressOf(from.row, from.col);
      labels.set(`${ref.sheet}!${a}`, await port.labelsNear(ref.sheet, a));
      formats.set(`${ref.sheet}!${a}`, cells[0]?.[0]?.numberFormat);
    }
  }
  return { wb, labels, formats };
}

function labelSourceFrom(labels: Map<string, string[]>, formats: Map<string, string | undefined>): LabelSource {
  return {
    labelsNear: (sheet, row, col) => labels.get(`${sheet}!${addressOf(row, col)}`) ?? [],
    numberFormat: (sheet, row, col) => formats.get(`${sheet}!${addressOf(row, col)}`),
  };
}

/** Pairs recorded calls with their places in the formula (both in evaluation order). */
function pairCalls(records: CallRecord[], sites: CallSite[]): (CallSite | undefined)[] {
  const nappe = sites.filter((s) => s.name.startsWith("NAPPE."));
  const used = new Set<CallSite>();
  return records.map((rec) => {
    const site = nappe.find((s) => !used.has(s) && s.name === `NAPPE.${rec.id}`);
    if (site) used.add(site);
    return site;
  });
}

function explainCall(rec: CallRecord, site: CallSite | undefined, formula: string, sheet: string, labels: LabelSource): CallExplanation {
  const spec = CATALOG_BY_ID.get(rec.id)!;
  const ev = rec.evaluation;
  const args = spec.params.flatMap((p, i) => {
    const written = site?.args[i]?.text ?? "";
    const r = ev?.readings.find((x) => x.name === p.name);
    if (!r) return written ? [{ name: p.name, written, value: "", unit: "", why: "", base: "" }] : [];
    const dim = p.kind === "quantity" ? p.dim : p.kind === "anyQuantity" && ev ? resultDimension(spec, Object.fromEntries(ev.readings.map((x) => [x.name, x.value])) as never) : undefined;
    return [describeArg(r, written, dim ? DIMENSIONS[dim].base || (dim === "efficiency" ? "(fraction)" : "") : "")];
  });
  const unitWarnings: UnitWarning[] = [];
  if (ev) {
    for (const f of checkCallUnits(spec, ev, rec.refs, sheet, labels)) {
      const i = spec.params.findIndex((p) => p.name === f.arg);
      const arg = site?.args[i];
      const joined = arg && f.unit ? `${/^[A-Za-z0-9_$!'. ]+$/.test(arg.text) ? arg.text : `(${arg.text})`}&" ${f.unit}"` : undefined;
      unitWarnings.push({ message: f.message, fixedFormula: arg && joined ? displayFormula(replaceArgument(formula, arg, joined)) : undefined, fixLabel: joined });
    }
  }
  const requested = ev && ev.unit && typeof ev.value === "number" ? `${formatNumber(ev.value)} ${ev.unit}` : ev ? formatValue(ev.value) : undefined;
  return {
    id: rec.id,
    text: site ? displayFormula(formula.slice(site.start, site.end)) : `NAPPE.${rec.id}(…)`,
    purpose: spec.purpose,
    equation: spec.equation,
    args,
    resultRequested: requested,
    resultBase: ev && typeof ev.value === "number" ? baseResult(rec) : undefined,
    assumptions: spec.assumptions,
    checks: spec.validity,
    warnings: ev?.warnings ?? [],
    unitWarnings,
    cautions: spec.cautions,
    sources: spec.sources,
    error: rec.error?.message,
  };
}

/** The result in the result dimension's base unit (undoing any `unit` argument). */
function baseResult(rec: CallRecord): string {
  const ev = rec.evaluation!;
  const base = DIMENSIONS[ev.dim].base;
  if (ev.unit === base || !ev.unit) return `${formatNumber(ev.value as number)}${base ? ` ${base}` : ""}`;
  const spec = CATALOG_BY_ID.get(rec.id)!;
  const args: Record<string, unknown> = {};
  for (const r of ev.readings) args[r.name] = r.value;
  const value = spec.compute(args as never).value;
  return typeof value === "number" ? `${formatNumber(value)} ${base}` : "";
}

/**
 * NPSH available as the workbook computes it: the first NAPPE.NPSHA formula's result, in m.
 * (A workbook with several pumps should keep one NPSHA per pump; the first one is drawn.)
 */
async function workbookNpsha(port: HostPort): Promise<{ value: number; cell: string } | undefined> {
  const cells = (await port.nappeFormulaCells()).filter((c) => /\bNAPPE\.NPSHA\s*\(/i.test(displayFormula(c.formula)));
  for (const c of cells) {
    const snap = await snapshot(port, c.sheet, c.address, c.formula);
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

/** Explains the cell at sheet!address. */
export async function explainCell(port: HostPort, sheet: string, address: string): Promise<CellExplanation> {
  return (await analyseCell(port, sheet, address)).explanation;
}

/** Evaluates the cell's formula over a snapshot of its precedents and explains every NAPPE call. */
export async function analyseCell(port: HostPort, sheet: string, address: string): Promise<CellAnalysis> {
  const cell = await port.cell(sheet, address);
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
  const snap = await snapshot(port, sheet, address, formula);
  const engine = new Recalculation(snap.wb);
  const { row, col } = parseAddress(address);
  const model = snap.wb.sheets.find((s) => s.name === sheet)!.cells.get(cellKey(row, col))!;
  const computed = engine.compute(model);
  const labels = labelSourceFrom(snap.labels, snap.formats);
  const pairs = pairCalls(computed.calls, sites);
  const calls = computed.calls.map((rec, i) => explainCall(rec, pairs[i], formula, sheet, labels));
  // Outermost first reads best: reverse evaluation order.
  calls.reverse();
  const outcome = outcomeFor({ ...model, value: cell.value }, computed);
  const error = computed.error ? computed.message ?? computed.error : undefined;
  let chart: ChartData | undefined;
  try {
    chart = chartFor(computed.calls);
    if (chart?.series.some((x) => x.name === "NPSHr")) {
      const npsha = await workbookNpsha(port);
      if (npsha) chart = withNpsha(chart, npsha.value, npsha.cell);
    }
  } catch {
    chart = undefined;
  }
  return { labels, outcome, explanation: { ...base, formula: displayFormula(formula), value: formatValue(computed.value as CellValue), error, calls, chart } };
}

/**
 * The audit model: every NAPPE formula of a workbook with what a reviewer needs to follow it
 * without code. Each call is the one call-view model (callView.ts) the pane shows too; the
 * renderers (text, HTML, the .xlsx audit sheet written headless and the one the pane writes)
 * all read this model, and the audit sheet's layout is defined here once.
 */
import { GENERAL_CAUTIONS } from "../functions/catalog/_shared";
import { callView, type CallView, pairCalls } from "./callView";
import { exactNumber, formatQuantity, formatSpillText, formatValue } from "./format";
import type { WorkbookModel } from "./model";
import { type AuditSummary, auditSummary, spillsRows } from "./summary";
import { callSites, evaluationOrder } from "./formula";
import type { CellOutcome, Status } from "./recalc";
import type { LabelSource } from "./unitCheck";

export { GENERAL_CAUTIONS };

/** One argument on one line: "flow: B11&" m^3/h" → 81.5604 m^3/h [unit written with the number]". */
function argLine(a: CallView["args"][number]): string {
  const read = a.value ? `${a.value}${a.unit && !a.value.endsWith(a.unit) ? ` ${a.unit}` : ""}` : "";
  return `${a.name}: ${a.written || "(left out)"} → ${read}${a.why ? ` [${a.why}]` : ""}`;
}

interface AuditEntry {
  sheet: string;
  address: string;
  formula: string;
  status: Status;
  result: string;
  /** Every digit of a numeric result ("" otherwise). */
  exact: string;
  messages: string[];
  calls: CallView[];
}

export interface AuditReport {
  title: string;
  /** The workbook's file name. */
  source: string;
  /** When, as people read it ("2 December 2026, 14:05 UTC"). */
  generated: string;
  /** Key results and inputs, when the workbook itself was at hand. */
  summary?: AuditSummary;
  /** What the run found and did ("30 NAPPE formulas found in 45 formulas (30 recalculated): …"). */
  found?: string;
  /** Said once at the top: a copy saved where the add-in was not loaded. */
  notice?: string;
  counts: Record<Status, number>;
  cautions: string[];
  entries: AuditEntry[];
}

const MONTHS = ["January", "February", "March", "April", "May", "June", "July", "August", "September", "October", "November", "December"];

/** A date as a report's reader reads it: "2 December 2026, 14:05 UTC" (UTC, so every reader sees the same). */
export function readableDate(d: Date): string {
  const two = (n: number) => String(n).padStart(2, "0");
  return `${d.getUTCDate()} ${MONTHS[d.getUTCMonth()]} ${d.getUTCFullYear()}, ${two(d.getUTCHours())}:${two(d.getUTCMinutes())} UTC`;
}

/**
 * Builds the audit from recalculated cells. `labels` enables the unit check of referenced cells;
 * `workbook` (the model the cells came from) lets the audit open with the key results and inputs.
 */
export function buildAudit(cells: readonly CellOutcome[], meta: { title: string; source: string; generated?: string; found?: string; notice?: string; workbook?: WorkbookModel }, labels?: LabelSource): AuditReport {
  const counts: Record<Status, number> = { ok: 0, warning: 0, error: 0 };
  const entries = cells.map((cell): AuditEntry => {
    // Status and messages are the outcome's own: they already hold the unit check and a kept check's diagnosis (findings.ts).
    const { messages, status } = cell;
    let sites: ReturnType<typeof callSites> = [];
    try {
      sites = evaluationOrder(callSites(cell.formula.replace(/^=/, "")));
    } catch {
      sites = [];
    }
    const pairs = pairCalls(cell.calls, sites);
    const calls = cell.calls.map((call, i) => callView(call, pairs[i], cell.sheet, labels));
    counts[status]++;
    const result = typeof cell.value === "number" ? formatQuantity(cell.value, cell.unit) : Array.isArray(cell.value) ? `${spillsRows(cell.value.length)} (table in the derivation)` : formatValue(cell.value);
    return { sheet: cell.sheet, address: cell.address, formula: cell.formula, status, result, exact: typeof cell.value === "number" ? exactNumber(cell.value) : "", messages, calls };
  });
  const summary = meta.workbook ? auditSummary(meta.workbook, cells, entries.map((e) => e.calls), labels) : undefined;
  return { title: meta.title, source: meta.source, generated: meta.generated ?? readableDate(new Date()), summary, found: meta.found, notice: meta.notice, counts, cautions: [...GENERAL_CAUTIONS], entries };
}

/**
 * The audit as rows of text: the audit sheet's layout (header row first). Seven columns, so
 * that the sheet prints one page wide at a readable scale in landscape.
 */
export const AUDIT_COLUMNS = ["Cell", "Formula", "Status", "Result", "Exact", "Function and purpose", "Inputs (as written → as read)", "Warnings, assumptions, sources, cautions"];

/** Column widths of the audit sheet, in characters (about 220 in all: landscape A4 or Letter at 65 % or more). */
export const AUDIT_WIDTHS = [12, 25, 8, 12, 14, 23, 31, 38];

/** Said at the top of an audit that found nothing to check. */
export const NOTHING_FOUND = "No NAPPE formulas found in this workbook: nothing was checked.";

function auditRows(report: AuditReport): string[][] {
  const rows: string[][] = [AUDIT_COLUMNS];
  for (const e of report.entries) {
    const calls = e.calls.length ? e.calls : [undefined];
    calls.forEach((c, i) => {
      const notes = [
        ...(c?.error ? [`Error: ${c.error}`] : []),
        ...(c?.diagnosis ?? []),
        ...(c?.warnings ?? []).map((w) => `Warning: ${w}`),
        ...(c?.unitFindings ?? []).map((f) => `Warning: Unit check: ${f.message}`),
        ...(i === 0 && !c ? e.messages : []),
        ...(c?.assumptions ?? []).map((a) => `Assumes: ${a}`),
        ...(c?.sources ?? []).map((x) => `Source: ${x}`),
        ...(c?.cautions ?? []).map((x) => `Caution: ${x}`),
      ];
      rows.push([
        i === 0 ? `${e.sheet}!${e.address}` : "",
        i === 0 ? e.formula : "",
        i === 0 ? e.status : "",
        i === 0 ? e.result : "",
        i === 0 ? e.exact : "",
        c ? [`NAPPE.${c.id}: ${c.purpose}${c.result && e.calls.length > 1 ? ` = ${c.result}` : ""}`, ...(c.substituted ? [c.substituted] : []), ...c.steps.map((s) => `${s.symbol} = ${s.value} (${s.name})`), ...(c.table ? [formatSpillText(c.table)] : [])].join("\n") : "",
        c ? c.args.map(argLine).join("\n") : "",
        notes.join("\n"),
      ]);
    });
  }
  return rows;
}

/** Headings of the summary blocks that open the audit sheet. */
const KEY_RESULTS = "Key results";
const INPUTS = "Inputs";

/**
 * The audit sheet, headless or written by the pane, summary first: title, workbook and date with
 * the counts, the cautions, a line that says when nothing was found; the key results and the
 * inputs (each a heading, a header row and rows); then the table of every NAPPE formula (its
 * header at `headerRow`, 0-based). `preamble` is the number of one-cell lines at the top.
 */
export function auditSheetRows(report: AuditReport): { rows: string[][]; headerRow: number; preamble: number; blockHeaders: number[] } {
  const rows: string[][] = [
    [report.title],
    [`Workbook: ${report.source} · ${report.generated} · ${report.found ?? `${report.entries.length} NAPPE formulas: ${report.counts.ok} ok, ${report.counts.warning} warning, ${report.counts.error} error`}`],
    ...(report.notice ? [[report.notice]] : []),
    [report.cautions.join(" ")],
    [report.entries.length ? "" : NOTHING_FOUND],
  ];
  const preamble = rows.length;
  const blockHeaders: number[] = [];
  const s = report.summary;
  if (s && s.results.length) {
    rows.push([KEY_RESULTS, s.basis]);
    blockHeaders.push(rows.length);
    // The value takes the room of three of the table's columns (C to E; merged in the printed sheet).
    rows.push(["Cell", "Label", "Value", "", "", "Exact"]);
    for (const r of s.results) rows.push([r.cell, r.label, r.value, "", "", r.exact]);
    rows.push([]);
  }
  if (s && s.inputs.length) {
    rows.push([INPUTS, "The constant cells the NAPPE formulas read, and how each was read."]);
    blockHeaders.push(rows.length);
    rows.push(["Cell", "Label", "Value", "", "", "Exact", "Read as"]);
    for (const r of s.inputs) rows.push([r.cell, r.label, r.value, "", "", r.exact, r.readAs]);
    rows.push([]);
  }
  if (blockHeaders.length) rows.push(["Every NAPPE formula, with its derivation"]);
  const headerRow = rows.length;
  // One at a time: push(...rows) overflows the call stack for a few hundred thousand rows.
  for (const row of auditRows(report)) rows.push(row);
  return { rows, headerRow, preamble, blockHeaders };
}

/** Lines a text takes in a wrapped cell of the given width (characters), for row heights. */
export function wrappedLines(text: string, width: number): number {
  return text.split("\n").reduce((n, line) => n + Math.max(1, Math.ceil((line.length * 1.1) / Math.max(1, width - 1))), 0);
}

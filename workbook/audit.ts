/**
 * The audit model: every NAPPE formula of a workbook with what a reviewer needs to follow it
 * without code. Each call is the one call-view model (callView.ts) the pane shows too; the
 * renderers (text, HTML, the .xlsx audit sheet written headless and the one the pane writes)
 * all read this model, and the audit sheet's layout is defined here once.
 */
import { GENERAL_CAUTIONS } from "../functions/catalog/_shared";
import { callView, type CallView, pairCalls } from "./callView";
import { formatValue } from "./format";
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
  messages: string[];
  calls: CallView[];
}

export interface AuditReport {
  title: string;
  source: string;
  generated: string;
  /** What the run found and did ("30 NAPPE formulas found in 45 formulas (30 recalculated): …"). */
  found?: string;
  counts: Record<Status, number>;
  cautions: string[];
  entries: AuditEntry[];
}

/** Builds the audit from recalculated cells. `labels` enables the unit check of referenced cells. */
export function buildAudit(cells: readonly CellOutcome[], meta: { title: string; source: string; generated?: string; found?: string }, labels?: LabelSource): AuditReport {
  const counts: Record<Status, number> = { ok: 0, warning: 0, error: 0 };
  const entries = cells.map((cell): AuditEntry => {
    const messages = [...cell.messages];
    let status = cell.status;
    let sites: ReturnType<typeof callSites> = [];
    try {
      sites = evaluationOrder(callSites(cell.formula.replace(/^=/, "")));
    } catch {
      sites = [];
    }
    const pairs = pairCalls(cell.calls, sites);
    const calls = cell.calls.map((call, i) => {
      const view = callView(call, pairs[i], cell.sheet, labels);
      for (const f of view.unitFindings) {
        messages.push(`NAPPE.${call.id}: unit check: ${f.message}`);
        if (status === "ok") status = "warning";
      }
      return view;
    });
    counts[status]++;
    return { sheet: cell.sheet, address: cell.address, formula: cell.formula, status, result: `${formatValue(cell.value)}${cell.unit ? ` ${cell.unit}` : ""}`, messages, calls };
  });
  return { title: meta.title, source: meta.source, generated: meta.generated ?? new Date().toISOString(), found: meta.found, counts, cautions: [...GENERAL_CAUTIONS], entries };
}

/**
 * The audit as rows of text: the audit sheet's layout (header row first). Seven columns, so
 * that the sheet prints one page wide at a readable scale in landscape.
 */
export const AUDIT_COLUMNS = ["Cell", "Formula", "Status", "Result", "Function and purpose", "Inputs (as written → as read)", "Warnings, assumptions, sources, cautions"];

/** Column widths of the audit sheet, in characters (about 210 in all: landscape A4 or Letter at 65 % or more). */
export const AUDIT_WIDTHS = [16, 34, 9, 16, 30, 46, 58];

/** Said at the top of an audit that found nothing to check. */
export const NOTHING_FOUND = "No NAPPE formulas found in this workbook: nothing was checked.";

function auditRows(report: AuditReport): string[][] {
  const rows: string[][] = [AUDIT_COLUMNS];
  for (const e of report.entries) {
    const calls = e.calls.length ? e.calls : [undefined];
    calls.forEach((c, i) => {
      const notes = [
        ...(c?.error ? [`Error: ${c.error}`] : []),
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
        c ? [`NAPPE.${c.id}: ${c.purpose}${c.result && e.calls.length > 1 ? ` = ${c.result}` : ""}`, ...(c.substituted ? [c.substituted] : []), ...c.steps.map((s) => `${s.symbol} = ${s.value} (${s.name})`)].join("\n") : "",
        c ? c.args.map(argLine).join("\n") : "",
        notes.join("\n"),
      ]);
    });
  }
  return rows;
}

/**
 * The audit sheet, headless or written by the pane: title, what was found, the cautions, a
 * line that says when nothing was found, then the table (its header at `headerRow`, 0-based).
 */
export function auditSheetRows(report: AuditReport): { rows: string[][]; headerRow: number } {
  const rows = [
    [report.title],
    [`Workbook: ${report.source} · generated ${report.generated} · ${report.found ?? `${report.entries.length} NAPPE formulas`} · ${report.counts.ok} ok, ${report.counts.warning} warning, ${report.counts.error} error`],
    [report.cautions.join(" ")],
    [report.entries.length ? "" : NOTHING_FOUND],
    ...auditRows(report),
  ];
  return { rows, headerRow: 4 };
}

/** Lines a text takes in a wrapped cell of the given width (characters), for row heights. */
export function wrappedLines(text: string, width: number): number {
  return text.split("\n").reduce((n, line) => n + Math.max(1, Math.ceil((line.length * 1.1) / Math.max(1, width - 1))), 0);
}

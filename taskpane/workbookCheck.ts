/**
 * The whole-workbook check (pure): every NAPPE formula analysed from one read of the workbook, with
 * status and counts, yielding to the page between cells so long scans stay responsive; and the
 * audit sheet built from the same audit model as the headless report.
 */
import { type AuditReport, AUDIT_WIDTHS, auditSheetRows, buildAudit } from "../workbook/audit";
import { formulaLibraryReady } from "../workbook/formulaLibrary";
import { type CellOutcome, type Status, summaryLine } from "../workbook/recalc";
import type { LabelSource } from "../workbook/unitCheck";
import type { WorkbookModel } from "../workbook/model";
import { displayFormula } from "../workbook/storedForm";
import { analyseCell } from "./explain";
import type { HostPort } from "./host/port";
import { MemoryHost } from "./host/memory";

interface CheckRow {
  sheet: string;
  address: string;
  formula: string;
  status: Status;
  /** First message, for the list. */
  note: string;
}

export interface WorkbookCheck {
  rows: CheckRow[];
  counts: Record<Status, number>;
  outcomes: CellOutcome[];
  labels: LabelSource;
  /** The snapshot the check analysed: the audit's summary reads names, headings and inputs from it. */
  workbook: WorkbookModel;
  /** The one summary line, as every command prints it ("3 NAPPE formulas found in 9 formulas (3 recalculated): …"). */
  found: string;
}

/** Name of the sheet the audit is written to; it is replaced, never any other sheet. */
export const AUDIT_SHEET = "Nappe audit";

function mergeLabels(sources: LabelSource[]): LabelSource {
  return {
    labelsNear: (s, r, c) => sources.flatMap((x) => x.labelsNear(s, r, c)).filter((v, i, a) => a.indexOf(v) === i),
    numberFormat: (s, r, c) => sources.map((x) => x.numberFormat(s, r, c)).find(Boolean),
  };
}

/**
 * Checks every NAPPE formula. The workbook is read once (every sheet's used range and the
 * defined names, through workbookSnapshot) and analysed in memory with the same engine the
 * in-memory host uses: the round trips to Excel do not grow with the number of formulas.
 */
export async function checkWorkbook(port: HostPort, onProgress?: (done: number, total: number) => void, yieldEvery = 25): Promise<WorkbookCheck> {
  await formulaLibraryReady();
  const local = new MemoryHost(await port.workbookSnapshot(), { recalculate: false });
  const cells = await local.nappeFormulaCells();
  const rows: CheckRow[] = [];
  const outcomes: CellOutcome[] = [];
  const labels: LabelSource[] = [];
  const counts: Record<Status, number> = { ok: 0, warning: 0, error: 0 };
  const shared = { workbook: Promise.resolve(local.workbook) };
  for (let i = 0; i < cells.length; i++) {
    const c = cells[i];
    const analysis = await analyseCell(local, c.sheet, c.address, shared);
    // The outcome's status holds the unit check and a kept check's diagnosis, as every command counts it.
    const status: Status = analysis.outcome?.status ?? "error";
    const note = (analysis.outcome?.messages ?? [analysis.explanation.error ?? ""])[0] ?? "";
    rows.push({ sheet: c.sheet, address: c.address, formula: `=${displayFormula(c.formula)}`, status, note });
    counts[status]++;
    if (analysis.outcome) outcomes.push(analysis.outcome);
    labels.push(analysis.labels);
    onProgress?.(i + 1, cells.length);
    if ((i + 1) % yieldEvery === 0) await new Promise((r) => setTimeout(r, 0));
  }
  const recalculated = outcomes.filter((o) => o.recalculated).length;
  const formulas = local.workbook.sheets.reduce((n, sh) => n + [...sh.cells.values()].filter((c) => c.formula).length, 0);
  const found = summaryLine({ formulas, nappe: cells.length, recalculated, notRecalculated: cells.length - recalculated, otherAddins: [], savedWithoutAddin: 0 }, rows);
  return { rows, counts, outcomes, labels: mergeLabels(labels), workbook: local.workbook, found };
}

/** The audit report for the checked workbook (same model as `nappe audit`), named by its file name where Excel gives one. */
export function auditOf(check: WorkbookCheck, source = check.workbook.name ?? "this workbook"): AuditReport {
  return buildAudit(check.outcomes, { title: "Nappe audit", source, found: check.found, workbook: check.workbook }, check.labels);
}


/** Writes (or replaces) the audit sheet through the port. */
export async function writeAuditSheet(port: HostPort, check: WorkbookCheck, source?: string): Promise<AuditReport> {
  const report = auditOf(check, source);
  const { rows, headerRow, blockHeaders } = auditSheetRows(report);
  await port.writeSheet(AUDIT_SHEET, rows, { headerRow, widths: AUDIT_WIDTHS, subHeaders: blockHeaders });
  return report;
}

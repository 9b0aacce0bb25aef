/** Renderers of recalculation results and of the audit model: text table, plain text, .xlsx (HTML: renderHtml.ts). */
import type ExcelJS from "exceljs";
import { type AuditReport, AUDIT_COLUMNS, AUDIT_WIDTHS, auditSheetRows, NOTHING_FOUND, wrappedLines } from "../workbook/audit";
import { derivationText } from "../workbook/derivation";
import { formatNumber, formatSpillText, formatUnit, formatValue, labelledSpill } from "../workbook/format";
import type { CellOutcome } from "../workbook/recalc";
import { spillsRows } from "../workbook/summary";
import { wrapText } from "./terminal";

/** Spaces to pad columns with (wider than the widest column and its gap). */
const SPACES = " ".repeat(64);

function clip(text: string, width: number): string {
  return text.length <= width ? text : `${text.slice(0, width - 1)}…`;
}

/** The narrowest a shortened formula column gets. */
const MIN_FORMULA = 16;

/**
 * The recalculation as a fixed-width table fitted to `width` (a terminal's, or 80; Infinity for
 * everything): each cell's messages under it, wrapped with a hanging indent; a formula too long
 * for its column shortened with "…" and given in full under its row; under a spilled result its
 * rows (labelled by its header, or the function's columns), `spills` rows at most, then how many
 * more. Fitted, the cached and difference columns show only when some value differs from its cache.
 */
export function renderTable(cells: readonly CellOutcome[], options: { spills?: number; width?: number } = {}): string {
  const spills = options.spills ?? 5;
  const width = options.width ?? Infinity;
  // At a fitted width, the cached and difference columns show only when some value differs from its cache (--wide: always).
  const anyDifference = !Number.isFinite(width) || cells.some((c) => (c.difference !== null && c.difference !== 0) || (c.cached !== null && c.difference === null && c.status === "error"));
  const columns = ["sheet", "cell", "formula", "value", "unit", "cached", "difference", "status"];
  const limits = [16, 8, 48, 28, 10, 14, 10, 7];
  const k = columns.length;
  // Every cell's texts in one flat list (row i, column j at i·k + j): a list per row costs a large
  // workbook tens of thousands of small arrays.
  const texts: string[] = new Array(cells.length * k);
  cells.forEach((c, i) => {
    const spill = Array.isArray(c.value);
    texts[i * k] = c.sheet;
    texts[i * k + 1] = c.address;
    texts[i * k + 2] = c.formula;
    texts[i * k + 3] = Array.isArray(c.value) ? spillsRows(c.value.length) : formatValue(c.value);
    texts[i * k + 4] = spill ? "" : formatUnit(c.unit);
    texts[i * k + 5] = c.cached === null || spill ? "" : typeof c.cached === "number" ? formatNumber(c.cached) : String(c.cached);
    texts[i * k + 6] = c.difference === null ? "" : c.difference === 0 ? "0" : c.difference.toExponential(1);
    texts[i * k + 7] = c.status;
  });
  const shownColumns = columns.map((_, j) => (j !== 5 && j !== 6) || anyDifference);
  // A loop, not Math.max(...texts): spreading a few hundred thousand values overflows the call stack.
  const widths = columns.map((h, j) => {
    if (!shownColumns[j]) return 0;
    let w = h.length;
    for (let i = j; i < texts.length; i += k) if (texts[i].length > w) w = texts[i].length;
    return Math.min(Number.isFinite(width) ? limits[j] : j === 2 ? Infinity : limits[j], w);
  });
  // The formula column takes what the others leave of the width, down to MIN_FORMULA.
  const gaps = 2 * (shownColumns.filter(Boolean).length - 1);
  const others = widths.reduce((n, w, j) => n + (j === 2 ? 0 : w), 0);
  if (Number.isFinite(width)) widths[2] = Math.max(Math.min(columns[2].length, widths[2]), Math.min(widths[2], Math.max(MIN_FORMULA, width - others - gaps)));
  // Each column padded to its width, two spaces between columns, no trailing spaces.
  const line = (row: readonly string[], from: number) => {
    let text = "";
    let first = true;
    for (let j = 0; j < k; j++) {
      if (!shownColumns[j]) continue;
      const v = clip(row[from + j], widths[j]);
      text += (first ? "" : "  ") + v + (j < k - 1 ? SPACES.slice(0, Math.max(0, widths[j] - v.length)) : "");
      first = false;
    }
    return text.trimEnd();
  };
  const out = [line(columns, 0), columns.flatMap((_, j) => (shownColumns[j] ? ["-".repeat(widths[j])] : [])).join("  ")];
  cells.forEach((c, i) => {
    out.push(line(texts, i * k));
    if (c.formula.length > widths[2]) out.push(...wrapText(c.formula, width, "    formula: ", "      "));
    if (Array.isArray(c.value) && spills > 0) {
      const t = labelledSpill(c.value, c.calls[c.calls.length - 1]?.evaluation?.header);
      const shown = formatSpillText({ header: t.header, rows: t.rows.slice(0, spills) }, "      ").split("\n");
      for (const l of shown) out.push(Number.isFinite(width) ? clip(l, width) : l);
      if (t.rows.length > spills) out.push(`      … ${t.rows.length - spills} more row${t.rows.length - spills === 1 ? "" : "s"} (--spills all)`);
    }
    for (const m of c.messages) out.push(...wrapText(m, width, `    ${c.status === "error" ? "!" : "-"} `, "      "));
  });
  return out.join("\n");
}

/** The audit as plain text: what was found, the cautions, then every cell with its derivations. */
export function renderText(report: AuditReport, width = 80): string {
  const out = [report.title, `Workbook: ${report.source} · ${report.generated}`, report.found ?? `${report.entries.length} NAPPE formulas`, ""];
  if (!report.entries.length) out.push(NOTHING_FOUND, "");
  const s = report.summary;
  if (s?.results.length) out.push("Key results", `(${s.basis})`, formatSpillText({ header: ["Cell", "Label", "Value"], rows: s.results.map((r) => [r.cell, r.label, r.value]) }, "  "), "");
  if (s?.inputs.length) out.push("Inputs", formatSpillText({ header: ["Cell", "Label", "Value", "Read as"], rows: s.inputs.map((r) => [r.cell, r.label, r.value, r.readAs]) }, "  "), "");
  out.push(...report.cautions, "");
  for (const e of report.entries) {
    out.push(`${"-".repeat(72)}`, `${e.sheet}!${e.address}  [${e.status}]  ${e.formula} → ${e.result}`);
    for (const m of e.messages.filter((m) => !e.calls.some((c) => m.includes(c.id)))) out.push(`Note: ${m}`);
    for (const c of e.calls) out.push("", derivationText(e, c));
  }
  // Fitted to `width` (80 unless --wide): long lines wrapped under their own indent.
  const fitted = out.flatMap((text) => text.split("\n")).flatMap((l) => {
    if (l.length <= width) return [l];
    const lead = /^\s*/.exec(l)![0];
    return wrapText(l.slice(lead.length), width, lead, `${lead}    `);
  });
  return `${fitted.join("\n")}\n`;
}

/** Adds the audit as a print-ready sheet to an exceljs workbook (replacing a sheet of that name). */
export function addAuditSheet(book: ExcelJS.Workbook, report: AuditReport, name = "Nappe audit"): ExcelJS.Worksheet {
  const old = book.getWorksheet(name);
  if (old) book.removeWorksheet(old.id);
  const ws = book.addWorksheet(name, {
    pageSetup: { orientation: "landscape", fitToPage: true, fitToWidth: 1, fitToHeight: 0, firstPageNumber: 1, paperSize: 9, margins: { left: 0.4, right: 0.4, top: 0.5, bottom: 0.5, header: 0.3, footer: 0.3 } },
    headerFooter: { oddFooter: "&L&A&RPage &P" },
  });
  const total = AUDIT_WIDTHS.reduce((a, b) => a + b, 0);
  const { rows, headerRow, preamble, blockHeaders } = auditSheetRows(report);
  const fonts: Partial<ExcelJS.Font>[] = [{ bold: true, size: 14 }, {}, { italic: true, color: { argb: "FF7A4B00" } }, { bold: true, color: { argb: "FF8A1C1C" } }];
  const headerStyle = (row: ExcelJS.Row) => {
    row.font = { bold: true, color: { argb: "FFFFFFFF" } };
    row.alignment = { wrapText: true, vertical: "top" };
    row.eachCell((c) => (c.fill = { type: "pattern", pattern: "solid", fgColor: { argb: "FF0E5463" } }));
  };
  rows.slice(0, preamble).forEach(([text], i) => {
    const row = ws.addRow([text]);
    row.font = fonts[i] ?? {};
    ws.mergeCells(row.number, 1, row.number, AUDIT_COLUMNS.length);
    row.getCell(1).alignment = { wrapText: true, vertical: "top" };
    row.height = 15 * wrappedLines(text, total);
  });
  // The summary: key results and inputs, each a heading, a header row and rows.
  // Widths of the summary's columns: the value spans C to E, a heading's description B to the end.
  const valueWidth = AUDIT_WIDTHS[2] + AUDIT_WIDTHS[3] + AUDIT_WIDTHS[4];
  const restWidth = total - AUDIT_WIDTHS[0];
  rows.slice(preamble, headerRow).forEach((cells, k) => {
    const i = preamble + k;
    const row = ws.addRow(cells);
    row.alignment = { wrapText: true, vertical: "top" };
    const heading = blockHeaders.includes(i + 1) || i === headerRow - 1;
    if (heading && cells.length > 1) ws.mergeCells(row.number, 2, row.number, AUDIT_COLUMNS.length);
    else if (cells.length > 3) ws.mergeCells(row.number, 3, row.number, 5);
    if (blockHeaders.includes(i)) headerStyle(row);
    else if (heading) {
      row.font = { bold: true, size: 12 };
      row.height = 18 * Math.max(1, wrappedLines(cells[1] ?? "", restWidth));
    } else row.height = Math.min(409, 15 * Math.max(1, ...cells.map((text, j) => wrappedLines(text, j === 2 ? valueWidth : AUDIT_WIDTHS[j]))));
  });
  headerStyle(ws.addRow(rows[headerRow]));
  for (const row of rows.slice(headerRow + 1)) {
    const r = ws.addRow(row);
    r.alignment = { vertical: "top", wrapText: true };
    // Explicit heights: a spreadsheet program need not grow a row to fit wrapped text on its own.
    r.height = Math.min(409, 15 * Math.max(...row.map((text, j) => wrappedLines(text, AUDIT_WIDTHS[j]))));
    const status = row[2];
    if (status) {
      const colour = status === "error" ? "FFFBDCDC" : status === "warning" ? "FFFFF0C7" : "FFDFF3E4";
      r.getCell(3).fill = { type: "pattern", pattern: "solid", fgColor: { argb: colour } };
    }
  }
  AUDIT_WIDTHS.forEach((w, i) => (ws.getColumn(i + 1).width = w));
  // The table's header row repeats on every printed page; it is frozen on screen only when the summary above it is short.
  ws.pageSetup.printTitlesRow = `${headerRow + 1}:${headerRow + 1}`;
  if (headerRow < 10) ws.views = [{ state: "frozen", ySplit: headerRow + 1 }];
  ws.pageSetup.printArea = `A1:${String.fromCharCode(64 + AUDIT_COLUMNS.length)}${ws.rowCount}`;
  return ws;
}

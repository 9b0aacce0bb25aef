/** Renderers of recalculation results and of the audit model: text table, HTML, .xlsx. */
import type ExcelJS from "exceljs";
import katex from "katex";
import { type AuditReport, AUDIT_COLUMNS, AUDIT_WIDTHS, auditSheetRows, NOTHING_FOUND, wrappedLines } from "../workbook/audit";
import { derivationText } from "../workbook/derivation";
import { formatNumber, formatSpillText, formatUnit, formatValue } from "../workbook/format";
import type { CellOutcome } from "../workbook/recalc";
import { spillsRows } from "../workbook/summary";

function clip(text: string, width: number): string {
  return text.length <= width ? text : `${text.slice(0, width - 1)}…`;
}

/** The recalculation as a fixed-width table, with each cell's messages under it. */
export function renderTable(cells: readonly CellOutcome[]): string {
  const head = ["sheet", "cell", "formula", "value", "unit", "cached", "difference", "status"];
  const rows = cells.map((c) => [
    c.sheet,
    c.address,
    c.formula,
    Array.isArray(c.value) ? spillsRows(c.value.length) : formatValue(c.value),
    Array.isArray(c.value) ? "" : formatUnit(c.unit),
    c.cached === null || Array.isArray(c.value) ? "" : typeof c.cached === "number" ? formatNumber(c.cached) : String(c.cached),
    c.difference === null ? "" : c.difference === 0 ? "0" : c.difference.toExponential(1),
    c.status,
  ]);
  const limits = [16, 8, 48, 28, 10, 14, 10, 7];
  const widths = head.map((h, j) => Math.min(limits[j], Math.max(h.length, ...rows.map((r) => r[j].length))));
  const line = (r: string[]) => r.map((v, j) => clip(v, widths[j]).padEnd(widths[j])).join("  ").trimEnd();
  const out = [line(head), widths.map((w) => "-".repeat(w)).join("  ")];
  cells.forEach((c, i) => {
    out.push(line(rows[i]));
    for (const m of c.messages) out.push(`    ${c.status === "error" ? "!" : "-"} ${m}`);
  });
  return out.join("\n");
}

const ESCAPES: Record<string, string> = { "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" };
/** Escapes workbook text for HTML: nothing from a workbook is ever markup. */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ESCAPES[c]);
}

function equation(tex: string): string {
  return katex.renderToString(tex, { output: "mathml", throwOnError: false, displayMode: true });
}

const STYLE = `
body{font:15px/1.5 system-ui,"Segoe UI",sans-serif;color:#17323a;max-width:960px;margin:24px auto;padding:0 16px}
h1{font-size:22px;margin-bottom:4px} h2{font-size:17px;margin:28px 0 6px;border-top:1px solid #cfe0e4;padding-top:14px}
h3{font-size:14px;margin:14px 0 4px}
.meta{color:#4a6670;font-size:13px}
.empty{background:#fbdcdc;color:#8a1c1c;border:2px solid #8a1c1c;padding:10px 14px;font-weight:700;font-size:17px}
.caution{background:#fff4de;border:1px solid #e6c98f;color:#5c3a00;padding:8px 12px;border-radius:4px}
.counts span{display:inline-block;margin-right:14px}
.status{font-weight:600;padding:1px 8px;border-radius:10px;font-size:12px}
.ok{background:#dff3e4;color:#1d5b2c}.warning{background:#fff0c7;color:#6b4a00}.error{background:#fbdcdc;color:#8a1c1c}
table{border-collapse:collapse;width:100%;font-size:13px;margin:4px 0}
th,td{text-align:left;vertical-align:top;border-bottom:1px solid #e3eef0;padding:3px 6px}
code{background:#eef5f6;padding:1px 4px;border-radius:3px;word-break:break-word}
.call{margin-left:12px;border-left:3px solid #cfe0e4;padding-left:12px}
ul{margin:2px 0 6px;padding-left:20px}
math{font-size:1.1em}
.equation{overflow-x:auto}
.summary th{background:#0e5463;color:#fff}
h3.cell{font-size:16px;margin:24px 0 6px;border-top:1px solid #cfe0e4;padding-top:12px}
.exact{color:#4a6670;font-size:12px}
table.spill{width:auto;max-width:100%}
table.spill td,table.spill th{text-align:right;overflow-wrap:anywhere}
table.spill td:first-child,table.spill th:first-child{text-align:left}
@page{margin:14mm 12mm}
@media print{body{max-width:none;margin:0;font-size:12px}table{font-size:11px}h2{break-after:avoid}.call,tr{break-inside:avoid}.caution{break-inside:avoid}a{color:inherit}}
`;

/** A spilled result as a small table with its header row and units. */
function spillHtml(t: { header: string[]; rows: string[][] }): string {
  return `<table class="spill"><tr>${t.header.map((h) => `<th>${escapeHtml(h)}</th>`).join("")}</tr>${t.rows.map((r) => `<tr>${r.map((c) => `<td>${escapeHtml(c)}</td>`).join("")}</tr>`).join("")}</table>`;
}

/** The key results and inputs that open the report. */
function summaryHtml(report: AuditReport): string {
  const s = report.summary;
  if (!s) return "";
  const results = s.results.length
    ? `<h2>Key results</h2><p class="meta">${escapeHtml(s.basis)}</p><table class="summary"><tr><th>Cell</th><th>Label</th><th>Value</th><th>Exact</th></tr>${s.results.map((r) => `<tr><td><a href="#${escapeHtml(r.cell)}">${escapeHtml(r.cell)}</a></td><td>${escapeHtml(r.label)}</td><td><strong>${escapeHtml(r.value)}</strong></td><td class="exact">${escapeHtml(r.exact)}</td></tr>`).join("")}</table>`
    : "";
  const inputs = s.inputs.length
    ? `<h2>Inputs</h2><p class="meta">The constant cells the NAPPE formulas read, and how each was read.</p><table class="summary"><tr><th>Cell</th><th>Label</th><th>Value</th><th>Read as</th></tr>${s.inputs.map((r) => `<tr><td>${escapeHtml(r.cell)}</td><td>${escapeHtml(r.label)}</td><td>${escapeHtml(r.value)}</td><td>${escapeHtml(r.readAs)}</td></tr>`).join("")}</table>`
    : "";
  return results + inputs;
}

/** Status words carry a mark too, so colour is never the only signal. */
const STATUS_MARK = { ok: "✓", warning: "⚠", error: "✕" } as const;

function list(title: string, items: readonly string[], cls = ""): string {
  if (!items.length) return "";
  return `<h3>${escapeHtml(title)}</h3><ul${cls ? ` class="${cls}"` : ""}>${items.map((i) => `<li>${escapeHtml(i)}</li>`).join("")}</ul>`;
}

/** The audit as one self-contained HTML page (MathML equations, no scripts, nothing loaded). */
export function renderHtml(report: AuditReport): string {
  const entries = report.entries
    .map((e) => {
      const calls = e.calls
        .map(
          (c) => `<div class="call">
<h3>NAPPE.${escapeHtml(c.id)}: ${escapeHtml(c.purpose)}</h3>
<div class="equation">${equation(c.equation)}</div>
${c.substituted ? `<p class="substituted"><code>${escapeHtml(c.substituted)}</code></p>` : ""}
<table><tr><th>argument</th><th>as written</th><th>as read</th><th>how</th><th>in base units</th></tr>
${c.args.map((a) => `<tr><td>${escapeHtml(a.name)}</td><td><code>${escapeHtml(a.written || "(left out)")}</code></td><td>${escapeHtml(a.value)}${a.unit && !a.value.endsWith(a.unit) ? ` ${escapeHtml(a.unit)}` : ""}</td><td>${escapeHtml(a.why)}</td><td>${escapeHtml(a.base)}</td></tr>`).join("\n")}
</table>
${c.steps.length ? `<table class="steps"><tr><th colspan="3">intermediate values</th></tr>${c.steps.map((s) => `<tr><td><strong>${escapeHtml(s.symbol)}</strong> = ${escapeHtml(s.value)}</td><td>${escapeHtml(s.name)}</td><td>${escapeHtml(s.how)}</td></tr>`).join("")}</table>` : ""}
<p><strong>Result:</strong> ${escapeHtml(c.result ?? "(error)")}${c.resultBase && c.resultBase !== c.result ? ` (${escapeHtml(c.resultBase)} in base units)` : ""}</p>
${c.table ? spillHtml(c.table) : ""}
${c.error ? `<p class="status error">${escapeHtml(c.error)}</p>` : ""}
${list("Warnings", [...c.warnings, ...c.unitFindings.map((f) => `Unit check: ${f.message}`)])}${list("Assumptions", c.assumptions)}${list("Cautions", c.cautions)}${list("Sources", c.sources)}
</div>`,
        )
        .join("\n");
      const loose = e.messages.filter((m) => !e.calls.some((c) => m.includes(c.id)));
      return `<section id="${escapeHtml(`${e.sheet}!${e.address}`)}">
<h3 class="cell">${escapeHtml(e.sheet)}!${escapeHtml(e.address)} <span class="status ${e.status}">${STATUS_MARK[e.status]} ${e.status}</span></h3>
<p><code>${escapeHtml(e.formula)}</code> → <strong>${escapeHtml(e.result)}</strong>${e.exact && e.exact !== e.result ? ` <span class="exact">(exact ${escapeHtml(e.exact)})</span>` : ""}</p>
${list("Notes", loose)}
${calls}
</section>`;
    })
    .join("\n");
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(report.title)}</title><style>${STYLE}</style></head>
<body>
<h1>${escapeHtml(report.title)}</h1>
<p class="meta">Workbook: <strong>${escapeHtml(report.source)}</strong> · ${escapeHtml(report.generated)} · by Nappe</p>
${report.entries.length ? "" : `<p class="empty">${escapeHtml(NOTHING_FOUND)}</p>`}
${report.found ? `<p class="meta">${escapeHtml(report.found)}</p>` : ""}
<p class="counts"><span>${report.entries.length} NAPPE formulas</span><span class="status ok">✓ ${report.counts.ok} ok</span><span class="status warning">⚠ ${report.counts.warning} warning</span><span class="status error">✕ ${report.counts.error} error</span></p>
${summaryHtml(report)}
<div class="caution">${report.cautions.map((c) => `<p>${escapeHtml(c)}</p>`).join("")}</div>
<h2>Every NAPPE formula, with its derivation</h2>
${entries}
</body></html>
`;
}

/** The audit as plain text: what was found, the cautions, then every cell with its derivations. */
export function renderText(report: AuditReport): string {
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
  return `${out.join("\n")}\n`;
}

/** Adds the audit as a print-ready sheet to an exceljs workbook (replacing a sheet of that name). */
export function addAuditSheet(book: ExcelJS.Workbook, report: AuditReport, name = "Nappe audit"): ExcelJS.Worksheet {
  const old = book.getWorksheet(name);
  if (old) book.removeWorksheet(old.id);
  const ws = book.addWorksheet(name, {
    pageSetup: { orientation: "landscape", fitToPage: true, fitToWidth: 1, fitToHeight: 0, paperSize: 9, margins: { left: 0.4, right: 0.4, top: 0.5, bottom: 0.5, header: 0.3, footer: 0.3 } },
    headerFooter: { oddFooter: "&L&A&RPage &P of &N" },
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
  rows.slice(preamble, headerRow).forEach((cells, k) => {
    const i = preamble + k;
    const row = ws.addRow(cells);
    row.alignment = { wrapText: true, vertical: "top" };
    if (blockHeaders.includes(i)) headerStyle(row);
    else if (blockHeaders.includes(i + 1) || i === headerRow - 1) row.font = { bold: true, size: 12 };
    else row.height = Math.min(409, 15 * Math.max(1, ...cells.map((text, j) => wrappedLines(text, AUDIT_WIDTHS[j]))));
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

/**
 * The audit as one self-contained HTML page, equations typeset as MathML by KaTeX. A module of
 * its own so that commands which write no HTML (recalc) never load KaTeX.
 */
import katex from "katex";
import { type AuditReport, NOTHING_FOUND } from "../workbook/audit";

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
${list("Cross-check", c.diagnosis, "diagnosis")}${list("Warnings", [...c.warnings, ...c.unitFindings.map((f) => `Unit check: ${f.message}`)])}${list("Assumptions", c.assumptions)}${list("Cautions", c.cautions)}${list("Sources", c.sources)}
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


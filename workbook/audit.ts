/**
 * The audit model: every NAPPE formula of a workbook with what a reviewer needs to follow it
 * without code (purpose, equation, inputs with units, result, assumptions, warnings, sources,
 * cautions). One model, several renderers: text, HTML and an .xlsx sheet here; the side pane's
 * audit sheet reuses it.
 */
import { CATALOG_BY_ID } from "../functions/catalog";
import type { ArgReading } from "../functions/bind/evaluate";
import type { Table } from "../functions/tables/table";
import { DIMENSIONS } from "../functions/units/dimensions";
import type { CellOutcome, Status } from "./recalc";
import { checkCallUnits, type LabelSource } from "./unitCheck";
import type { CellValue } from "./model";

/** Shown at the top of every audit. */
export const GENERAL_CAUTIONS = [
  "Nappe is a design aid for preliminary sizing. Confirm every selection with the pump maker's certified curves and data, local codes, and a licensed engineer.",
  "Pressurised systems, surge, cavitation, motors and public water features can hurt people.",
];

interface AuditInput {
  name: string;
  /** What the formula passed: a reference ("B4"), or the literal value. */
  written: string;
  /** The value as read, with the unit it was read in. */
  read: string;
  /** Why that unit: base unit, text quantity, percent, default, table header… */
  how: string;
}

interface AuditCall {
  id: string;
  purpose: string;
  equation: string;
  inputs: AuditInput[];
  result: string;
  assumptions: readonly string[];
  warnings: string[];
  sources: readonly string[];
  cautions: readonly string[];
  error?: string;
}

interface AuditEntry {
  sheet: string;
  address: string;
  formula: string;
  status: Status;
  result: string;
  messages: string[];
  calls: AuditCall[];
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

/** A number as people read it: six significant figures, the shortest form JavaScript prints. */
export function formatNumber(x: number): string {
  if (!Number.isFinite(x)) return String(x);
  return String(Number(x.toPrecision(6)));
}

export function formatValue(v: CellValue | CellValue[][]): string {
  if (Array.isArray(v)) return v.map((row) => row.map((c) => (typeof c === "number" ? formatNumber(c) : String(c ?? ""))).join(" | ")).join("; ");
  if (typeof v === "number") return formatNumber(v);
  return v === null ? "" : String(v);
}

function describeTable(t: Table): string {
  const cols = t.columns.map((c) => (c.header ? `"${c.header}"` : `${c.role} (${c.unit || DIMENSIONS[c.dim].baseLabel})`));
  return `${t.rows} rows; columns ${cols.join(", ")}${t.hasHeader ? " (units from the header row)" : " (no header: positional, base units)"}`;
}

function describeReading(r: ArgReading): { read: string; how: string } {
  if (r.how === "table") return { read: describeTable(r.value as Table), how: "table" };
  if (typeof r.value !== "number") return { read: String(r.value), how: r.how };
  const unit = r.unit && r.unit !== "%" ? ` ${r.unit}` : "";
  if (r.how === "text quantity") return { read: `${String(r.raw)} = ${formatNumber(r.value)} (base unit)`, how: `text quantity in ${r.unit}` };
  if (r.how === "percent") return { read: `${String(r.raw)} = ${formatNumber(r.value)}`, how: "percent" };
  return { read: `${formatNumber(r.value)}${unit}`, how: r.how === "default" ? "default" : "bare number: base unit" };
}

function written(raw: unknown, ref: string | undefined): string {
  if (ref) return ref;
  if (raw === null || raw === undefined) return "(left out)";
  if (typeof raw === "string") return `"${raw}"`;
  if (Array.isArray(raw)) return "(array)";
  return String(raw);
}

/** Builds the audit from recalculated cells. `labels` enables the unit check of referenced cells. */
export function buildAudit(cells: readonly CellOutcome[], meta: { title: string; source: string; generated?: string; found?: string }, labels?: LabelSource): AuditReport {
  const counts: Record<Status, number> = { ok: 0, warning: 0, error: 0 };
  const entries = cells.map((cell): AuditEntry => {
    const messages = [...cell.messages];
    let status = cell.status;
    const calls = cell.calls.map((call): AuditCall => {
      const spec = CATALOG_BY_ID.get(call.id)!;
      const ev = call.evaluation;
      const inputs: AuditInput[] = ev
        ? spec.params.flatMap((p, i) => {
            const r = ev.readings.find((x) => x.name === p.name);
            if (!r) return [];
            const d = describeReading(r);
            return [{ name: p.name, written: written(r.raw, call.refs[i]), ...d }];
          })
        : spec.params.map((p, i) => ({ name: p.name, written: call.refs[i] ?? "", read: "", how: "" }));
      const warnings = [...(ev?.warnings ?? [])];
      if (ev && labels) {
        for (const f of checkCallUnits(spec, ev, call.refs, cell.sheet, labels)) {
          warnings.push(`Unit check: ${f.message}`);
          messages.push(`NAPPE.${call.id}: unit check: ${f.message}`);
          if (status === "ok") status = "warning";
        }
      }
      return {
        id: call.id,
        purpose: spec.purpose,
        equation: spec.equation,
        inputs,
        result: ev ? `${formatValue(ev.value)}${ev.unit ? ` ${ev.unit}` : ""}` : "",
        assumptions: spec.assumptions,
        warnings,
        sources: spec.sources,
        cautions: spec.cautions,
        error: call.error?.message,
      };
    });
    counts[status]++;
    return { sheet: cell.sheet, address: cell.address, formula: cell.formula, status, result: `${formatValue(cell.value)}${cell.unit ? ` ${cell.unit}` : ""}`, messages, calls };
  });
  return { title: meta.title, source: meta.source, generated: meta.generated ?? new Date().toISOString(), found: meta.found, counts, cautions: GENERAL_CAUTIONS, entries };
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

export function auditRows(report: AuditReport): string[][] {
  const rows: string[][] = [AUDIT_COLUMNS];
  for (const e of report.entries) {
    const calls = e.calls.length ? e.calls : [undefined];
    calls.forEach((c, i) => {
      const notes = [
        ...(c?.error ? [`Error: ${c.error}`] : []),
        ...(c?.warnings ?? []).map((w) => `Warning: ${w}`),
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
        c ? `NAPPE.${c.id}: ${c.purpose}` : "",
        c ? c.inputs.map((x) => `${x.name}: ${x.written} → ${x.read}${x.how ? ` [${x.how}]` : ""}`).join("\n") : "",
        notes.join("\n"),
      ]);
    });
  }
  return rows;
}

/** Lines a text takes in a wrapped cell of the given width (characters), for row heights. */
export function wrappedLines(text: string, width: number): number {
  return text.split("\n").reduce((n, line) => n + Math.max(1, Math.ceil((line.length * 1.1) / Math.max(1, width - 1))), 0);
}

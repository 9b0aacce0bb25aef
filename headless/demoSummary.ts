/**
 * The demo's printed summary, the answer first: the selection an engineer would sign over the
 * whole operating envelope (the workbook's Summary sheet, which reads the Envelope sheet), a
 * compact table of the envelope's cases and why the other impellers lost, then the design duty as
 * a single point. Every figure is a cell of the workbook. A figure that depends on an input the
 * unit check flags is marked ‡, and a note gives what it becomes once that input is read in the
 * unit its label declares. Lines fit 80 columns.
 */
import { recalculate, type RecalcResult } from "../workbook/recalc";
import { type CellValue, getCell, parseAddress, type WorkbookModel } from "../workbook/model";
import type { AuditReport } from "../workbook/audit";
import { readAsLabelled } from "../workbook/slips";
import { wrapText } from "./terminal";
import { inSiBaseUnits } from "../functions/units/quantity";
import { formatNumber, formatPercent, formatUnit, formatValue } from "../workbook/format";

const WIDTH = 80;

/** An input the unit check flags, read as its label says in `fixed`. */
interface Slip {
  /** "Inputs!B14" */
  cell: string;
  label: string;
  value: CellValue;
  /** The unit the label declares and the one the formulas read the bare number in. */
  labelled: string;
  readAs: string;
  /** The recalculation with the input read as labelled. */
  fixed: RecalcResult;
}

/**
 * Inputs the unit check flags as a bare number read in another unit than its label declares, each
 * with the workbook recalculated as the label says (a linear unit only).
 */
export function slipsOf(wb: WorkbookModel, report: AuditReport): Slip[] {
  const seen = new Map<string, { sheet: string; address: string; text: string; unit: string }>();
  for (const e of report.entries)
    for (const call of e.calls)
      for (const f of call.unitFindings) if (f.unit && f.label) seen.set(`${f.label.sheet}!${f.label.address}`, { ...f.label, unit: f.unit });
  const slips: Slip[] = [];
  for (const [cell, s] of seen) {
    let base: { value: number; unit: string };
    try {
      if (inSiBaseUnits(0, s.unit).value !== 0) continue; // a scale with an offset (°F) is not a factor
      base = inSiBaseUnits(1, s.unit);
    } catch {
      continue;
    }
    const { row, col } = parseAddress(s.address);
    const value = getCell(wb, s.sheet, row, col)?.value ?? null;
    slips.push({ cell, label: s.text, value, labelled: s.unit, readAs: base.unit, fixed: recalculate(readAsLabelled(wb, s, base.value), { all: true }) });
  }
  return slips;
}

function shown(value: CellValue | CellValue[][], unit: string): [string, string] {
  const v = Array.isArray(value) ? (value[0]?.[0] ?? null) : value;
  if (unit === "fraction" && typeof v === "number") return [formatPercent(v).replace(/ %$/, ""), "%"];
  if (unit === "%" && typeof v === "number") return [formatNumber(v), "%"];
  return [formatValue(v), formatUnit(unit)];
}

function differs(a: CellValue | CellValue[][], b: CellValue | CellValue[][]): boolean {
  const x = Array.isArray(a) ? a[0]?.[0] : a;
  const y = Array.isArray(b) ? b[0]?.[0] : b;
  if (typeof x === "number" && typeof y === "number") return Math.abs(x - y) > 1e-9 * Math.max(1, Math.abs(x));
  return x !== y;
}

/** The envelope's cases on the recommended impeller: Envelope!A19's spill, its columns by header. */
function casesTable(result: RecalcResult): string[] {
  const spill = result.valueOf("Envelope", "A19");
  if (!Array.isArray(spill) || spill.length < 2) return [];
  const header = spill[0].map(String);
  const col = (name: RegExp) => header.findIndex((h) => name.test(h));
  const cols = [col(/^Flow \(/), col(/^% of BEP/), col(/^Eff/), col(/^NPSH margin/), col(/^Shaft power/)];
  if (cols.some((c) => c < 0)) return [];
  const lines = [`  ${"Case".padEnd(28)}${"Flow".padStart(8)}${"% BEP".padStart(7)}${"Eff".padStart(6)}${"NPSH".padStart(7)}${"Power".padStart(8)}`, `  ${"".padEnd(28)}${"m³/h".padStart(8)}${"%".padStart(7)}${"%".padStart(6)}${"margin".padStart(7)}${"kW".padStart(8)}`];
  for (const row of spill.slice(1)) {
    const n = (i: number, w: number) => (typeof row[i] === "number" ? formatNumber(row[i] as number) : String(row[i] ?? "")).padStart(w);
    const verdict = String(row[header.length - 1] ?? "");
    lines.push(`  ${String(row[0]).slice(0, 27).padEnd(28)}${n(cols[0], 8)}${n(cols[1], 7)}${n(cols[2], 6)}${n(cols[3], 7)}${n(cols[4], 8)}${verdict === "ok" ? "" : " ⚠"}`);
  }
  return lines;
}

/** Why each impeller not recommended lost: the shortlist's verdicts (Envelope!A30's spill). */
function others(result: RecalcResult): string[] {
  const spill = result.valueOf("Envelope", "A30");
  if (!Array.isArray(spill)) return [];
  return spill
    .slice(1)
    .filter((r) => !/^recommended/.test(String(r[r.length - 1])))
    .flatMap((r) => wrapText(String(r[r.length - 1]), WIDTH, `  ${formatValue(r[0])} mm `, "      "));
}

/** The printed summary's lines. */
export function demoSummaryLines(wb: WorkbookModel, result: RecalcResult, slips: readonly Slip[]): string[] {
  const summary = wb.sheets.find((s) => s.name === "Summary");
  if (!summary) return [];
  const out: string[] = [];
  const changed: string[] = [];
  const labels = [...summary.cells.values()].filter((c) => c.col === 1 && c.row > 2).sort((a, b) => a.row - b.row);
  let section = 0;
  for (const label of labels) {
    const hasValue = summary.cells.has(`${label.row}:2`);
    if (!hasValue && /^\s*results?\s*$/i.test(String(label.value))) continue; // the heading the audit's key results follow
    if (!hasValue) {
      if (section === 1) {
        out.push("", ...casesTable(result));
        const lost = others(result);
        if (lost.length) out.push("", "  The other impellers:", ...lost);
      }
      section++;
      out.push("", String(label.value));
      continue;
    }
    const value = result.valueOf("Summary", `B${label.row}`);
    const unit = String(summary.cells.get(`${label.row}:3`)?.value ?? "");
    const text = String(label.value);
    if (typeof value === "string" && value.length > 24) {
      out.push(...wrapText(value, WIDTH, `  ${text}: `, "    "));
      continue;
    }
    const [v, u] = shown(value, unit);
    const mark = slips.some((s) => differs(value, s.fixed.valueOf("Summary", `B${label.row}`))) ? "‡" : " ";
    if (mark === "‡") for (const s of slips) {
      const [fv, fu] = shown(s.fixed.valueOf("Summary", `B${label.row}`), unit);
      changed.push(`    ${text}: ${v}${u ? ` ${u}` : ""} → ${fv}${fu ? ` ${fu}` : ""}`);
    }
    out.push(`  ${text.padEnd(50)} ${v.padStart(10)} ${u}${mark === "‡" ? " ‡" : ""}`.trimEnd());
  }
  for (const s of slips) {
    out.push("", ...wrapText(`‡ Computed with ${s.cell} "${s.label}" = ${formatValue(s.value)} read as ${formatValue(s.value)} ${formatUnit(s.readAs)}, the input the unit check flags. Read as ${formatValue(s.value)} ${formatUnit(s.labelled)}, as its label says (the Envelope sheet reads it so), these become:`, WIDTH, "", "  "));
    out.push(...changed.flatMap((c) => wrapText(c.trim(), WIDTH, "    ", "      ")));
  }
  return out;
}

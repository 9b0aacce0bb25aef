/**
 * A workbook as stable text, a line per cell (nappe show): sheet and address, the label beside
 * or above, the formula as people read it, the value with its unit; in the workbook's sheet
 * order, then by row and column. Two revisions shown so differ only where the workbook does,
 * which makes it a textconv filter for `git diff`. Pure: the model and its recalculation in.
 */
import { addressOf } from "../workbook/address";
import { formatNumber, formatUnit } from "../workbook/format";
import { labelSource, type CellValue, type WorkbookModel } from "../workbook/model";
import type { RecalcResult, Status } from "../workbook/recalc";
import { displayFormula } from "../workbook/storedForm";

export interface ShownCell {
  sheet: string;
  cell: string;
  label: string;
  /** As displayed, with "=", or "" for a constant. */
  formula: string;
  value: CellValue;
  /** The value as shown ("1.2345 m", "spills 11 rows"). */
  shown: string;
  unit: string;
  /** NAPPE formulas only. */
  status?: Status;
}

/** Significant figures `nappe show` writes: enough that a moved result shows, few enough that noise does not. */
const SHOW_FIGURES = 6;

function valueText(v: CellValue | CellValue[][], digits: number): string {
  if (Array.isArray(v)) return `spills ${v.length} ${v.length === 1 ? "row" : "rows"}: ${v.map((r) => r.map((x) => valueText(x, digits)).join(", ")).join("; ")}`;
  if (typeof v === "number") return formatNumber(v, digits);
  if (typeof v === "boolean") return v ? "TRUE" : "FALSE";
  return v === null ? "" : JSON.stringify(v);
}

/** Every non-empty cell, in sheet order, then row, then column. */
export function showCells(wb: WorkbookModel, result: RecalcResult, digits = SHOW_FIGURES): ShownCell[] {
  const labels = labelSource(wb);
  const outcomes = new Map(result.cells.map((c) => [`${c.sheet}!${c.address}`, c]));
  const out: ShownCell[] = [];
  for (const sheet of wb.sheets) {
    const cells = [...sheet.cells.values()].filter((c) => c.formula || (c.value !== null && c.value !== "")).sort((a, b) => a.row - b.row || a.col - b.col);
    for (const c of cells) {
      const address = addressOf(c.row, c.col);
      const outcome = outcomes.get(`${sheet.name}!${address}`);
      const value = c.formula ? result.valueOf(sheet.name, address) : c.value;
      const unit = outcome?.unit ?? "";
      // A text cell is its own label; a number or formula is labelled by the text beside or above it.
      const label = typeof c.value === "string" && !c.formula ? "" : (labels.labelsNear(sheet.name, c.row, c.col)[0] ?? "");
      out.push({
        sheet: sheet.name,
        cell: address,
        label,
        formula: c.formula ? `=${displayFormula(c.formula)}` : "",
        value: Array.isArray(value) ? (value[0]?.[0] ?? null) : value,
        shown: `${valueText(value, digits)}${unit ? ` ${formatUnit(unit)}` : ""}`,
        unit,
        ...(outcome ? { status: outcome.status } : {}),
      });
    }
  }
  return out;
}

/** The text form: one line per cell, fields separated by " | " (a field's own "|" doubled is never needed: labels rarely hold one). */
export function showText(cells: readonly ShownCell[]): string {
  const lines = cells.map((c) => [`${c.sheet}!${c.cell}`, c.label, c.formula, c.shown, c.status && c.status !== "ok" ? `[${c.status}]` : ""].join(" | ").replace(/( \| )+$/, "").replace(/\s+$/, ""));
  return `${lines.join("\n")}\n`;
}

/**
 * The one formatting module: how every view and report writes numbers, values and quantities
 * (the pane, the text table, the HTML report, both audit sheets, the demo summary).
 */
import type { CellValue } from "./model";

/** A number as people read it: six significant figures, the shortest form JavaScript prints. */
export function formatNumber(x: number): string {
  if (!Number.isFinite(x)) return String(x);
  return String(Number(x.toPrecision(6)));
}

/** A cell's value, or a spilled result's rows ("265 | 104.094; …"). */
export function formatValue(v: CellValue | CellValue[][]): string {
  if (Array.isArray(v)) return v.map((row) => row.map((c) => (typeof c === "number" ? formatNumber(c) : String(c ?? ""))).join(" | ")).join("; ");
  if (typeof v === "number") return formatNumber(v);
  return v === null ? "" : String(v);
}

/** A number with its unit ("20.431 m"); just the number when there is no unit. */
export function formatQuantity(x: number, unit: string): string {
  return unit ? `${formatNumber(x)} ${unit}` : formatNumber(x);
}

/** "81.56041424282913 m^3/h" → "81.5604 m^3/h": the number as people read it, the unit as written. */
export function shortenQuantityText(text: string): string {
  const m = /^\s*([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)(\s*.*)$/.exec(text);
  return m ? `${formatNumber(Number(m[1]))}${m[2]}` : text;
}

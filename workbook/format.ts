/**
 * The one formatting module: how every view and report writes numbers, values and quantities
 * (the pane, the text table, the HTML report, both audit sheets, the demo summary).
 *
 * The rule (DESIGN.md, "Numbers as engineers write them"): 4 significant figures unless the
 * user asks for more; no exponent from 0.001 up to 1e6; efficiencies as percent; units typeset
 * (m³/h, °C, m²/s, µm). What the user types stays as accepted; exact values stay available
 * (`exactNumber`, the audit sheet's "exact" column, copy).
 */
import type { CellValue } from "./model";

const DEFAULT_FIGURES = 4;
let figures = DEFAULT_FIGURES;

/** Significant figures every view writes (2 to 15); the pane's setting and `nappe --digits` change it. */
export function setSignificantFigures(n: number = DEFAULT_FIGURES): void {
  if (!(Number.isInteger(n) && n >= 2 && n <= 15)) throw new Error(`significant figures: expected a whole number from 2 to 15, got ${n}`);
  figures = n;
}

export function significantFigures(): number {
  return figures;
}

const SUPERSCRIPT: Record<string, string> = { "-": "⁻", "0": "⁰", "1": "¹", "2": "²", "3": "³", "4": "⁴", "5": "⁵", "6": "⁶", "7": "⁷", "8": "⁸", "9": "⁹" };
const superscript = (digits: string) => [...digits].map((c) => SUPERSCRIPT[c] ?? c).join("");

/**
 * A number as engineers write it: `figures` significant figures, plain from 0.001 up to 1e6
 * ("0.7045", "81.56", "123500"), else "8.396×10⁻⁷".
 */
export function formatNumber(x: number, digits = figures): string {
  if (!Number.isFinite(x)) return String(x);
  if (x === 0) return "0";
  const rounded = Number(x.toPrecision(digits));
  const size = Math.abs(rounded);
  if (size >= 0.001 && size < 1e6) return String(rounded);
  const [mantissa, exponent] = rounded.toExponential(digits - 1).split("e");
  const m = mantissa.includes(".") ? mantissa.replace(/0+$/, "").replace(/\.$/, "") : mantissa;
  return `${m}×10${superscript(String(Number(exponent)))}`;
}

/**
 * The formatting rule as an Excel number format code for one value, for a cell that had none of
 * the user's: `figures` significant figures with the decimals that give them ("0.00" for 81.56),
 * a scientific code outside 0.001 to 1e6. Whole numbers show no decimals.
 */
export function numberFormatFor(x: number, digits = figures): string {
  // A whole number, or one within rounding noise of it (a motor rating of 15.00000000088 kW), shows no decimals.
  if (!Number.isFinite(x) || x === 0 || Number.isInteger(x) || (Math.abs(x) >= 1 && Math.abs(x - Math.round(x)) <= 1e-9 * Math.abs(x))) return "0";
  const size = Math.abs(Number(x.toPrecision(digits)));
  if (size < 0.001 || size >= 1e6) return `0.${"0".repeat(digits - 1)}E+00`;
  const decimals = Math.max(0, digits - 1 - Math.floor(Math.log10(size)));
  return decimals ? `0.${"0".repeat(decimals)}` : "0";
}

/** Every digit of a number, for the audit sheet's "exact" column and copying. */
export function exactNumber(x: number): string {
  return String(x);
}

/** A fraction (an efficiency) as percent: 0.704475 → "70.45 %". */
export function formatPercent(fraction: number): string {
  return `${formatNumber(fraction * 100)} %`;
}

/**
 * A unit as typeset: "m^3/h" → "m³/h", "degC" → "°C", "m^2/s" → "m²/s", "um" → "µm",
 * "ftH2O" → "ftH₂O", "kg*m" → "kg·m". Text that is not a unit name comes back unchanged.
 */
export function formatUnit(unit: string): string {
  if (!unit) return unit;
  return unit
    .replace(/\^\(?(-?\d+)\)?/g, (_, p: string) => superscript(p))
    .replace(/\bdeg\s?([CFR])\b/g, "°$1")
    .replace(/\bdeg\b/g, "°")
    .replace(/\bum\b/g, "µm")
    .replace(/H2O\b/g, "H₂O")
    .replace(/\s*\*\s*/g, "·");
}

/** A number with its unit ("20.43 m", "81.56 m³/h"); just the number when there is no unit. */
export function formatQuantity(x: number, unit: string, digits = figures): string {
  return unit ? `${formatNumber(x, digits)} ${formatUnit(unit)}` : formatNumber(x, digits);
}

/** One cell of a table as people read it: numbers by the rule, text as it is, blank for nothing. */
export function formatCell(v: CellValue): string {
  if (typeof v === "number") return formatNumber(v);
  return v === null ? "" : String(v);
}

/** A cell's value; a spilled result's rows as "265 | 104.1; …" (the labelled forms are `labelledSpill` and `formatSpillText`). */
export function formatValue(v: CellValue | CellValue[][]): string {
  if (Array.isArray(v)) return v.map((row) => row.map(formatCell).join(" | ")).join("; ");
  return formatCell(v);
}

/** "81.56041424282913 m^3/h" → "81.56 m³/h": the number as people read it, the unit typeset. */
export function shortenQuantityText(text: string): string {
  const m = /^\s*([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)(\s*)(.*)$/.exec(text);
  if (!m) return text;
  if (m[3].trim() === "%") return `${formatNumber(Number(m[1]))} %`;
  return `${formatNumber(Number(m[1]))}${m[2]}${formatUnit(m[3])}`;
}

/** A spilled result as a small table: a header row (with units) and its rows, formatted. */
export interface SpillTable {
  header: string[];
  rows: string[][];
}

/** True when a row is all text: a spilled result's own header row. */
function isHeaderRow(row: readonly CellValue[]): boolean {
  return row.length > 0 && row.every((c) => typeof c === "string" && c !== "") && row.some((c) => /[A-Za-z]/.test(String(c)));
}

/**
 * A spilled result labelled: its own first row when that is a header, else the header the spec
 * gives (`header`), else column numbers. Units in header cells ("Flow (m^3/h)") are typeset.
 */
export function labelledSpill(value: readonly (readonly CellValue[])[], header?: readonly string[]): SpillTable {
  const own = value.length > 1 && isHeaderRow(value[0]);
  const head = own ? value[0].map((c) => String(c)) : header ? [...header] : value[0]?.map((_, i) => `Column ${i + 1}`) ?? [];
  const body = own ? value.slice(1) : value;
  return { header: head.map(formatUnit), rows: body.map((row) => row.map(formatCell)) };
}

/** A labelled spill as aligned plain text, for the text table, the derivation and the console. */
export function formatSpillText(t: SpillTable, indent = ""): string {
  const widths = t.header.map((h, i) => Math.max(h.length, ...t.rows.map((r) => (r[i] ?? "").length)));
  const line = (cells: readonly string[]) => indent + cells.map((c, i) => c.padEnd(widths[i])).join("  ").trimEnd();
  return [line(t.header), ...t.rows.map(line)].join("\n");
}

/** A count with its noun: "1 formula", "2 formulas", "0 formulas". */
export function plural(n: number, noun: string, many = `${noun}s`): string {
  return `${n} ${n === 1 ? noun : many}`;
}

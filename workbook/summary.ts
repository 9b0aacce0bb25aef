/**
 * What an audit opens with: the workbook's key results and the inputs its NAPPE formulas read.
 *
 * Key results are the formula cells a defined name points at, and the formula cells under a
 * heading cell reading "Results"; a workbook with neither gets the NAPPE cells no other formula
 * computes with (the ends of its chains of calculation: the duty, the motor, the margin; a
 * formula that only shows one of them elsewhere, =Calc!B32 on a summary sheet, does not count),
 * each labelled from its own row, never by a column header. Inputs are the constant cells the
 * NAPPE calls read, found through plain references (=Inputs!B4), each with its label and the
 * unit it was read in.
 */
import { addressOf, parseAddress, splitReference } from "./address";
import type { CallView } from "./callView";
import { exactNumber, formatCell, formatPercent, formatQuantity, shortenQuantityText } from "./format";
import { references } from "./formula";
import { type CellModel, type CellValue, findSheet, getCell, type WorkbookModel } from "./model";
import type { CellOutcome } from "./recalc";
import { type LabelSource, referenceChain } from "./unitCheck";

interface SummaryRow {
  /** "Calc!B21". */
  cell: string;
  /** The label beside or above it, or its defined name. */
  label: string;
  /** As people read it, with its unit. */
  value: string;
  /** Every digit, for the audit sheet's "exact" column. */
  exact: string;
}

export interface AuditSummary {
  /** How the key results were chosen, in words. */
  basis: string;
  results: SummaryRow[];
  inputs: (SummaryRow & { readAs: string })[];
}

const HEADING = /^\s*results?\s*:?\s*$/i;

function ref(sheet: string, address: string): string {
  return `${sheet}!${address}`;
}

function labelOf(labels: LabelSource | undefined, sheet: string, address: string, fallback = ""): string {
  const { row, col } = parseAddress(address);
  return labels?.labelsNear(sheet, row, col).find((t) => !HEADING.test(t)) ?? fallback;
}

/**
 * A result's label from its own row: the nearest text to its left that is not a table's column
 * header (a header has a value or formula under it); else the text above it when that is a
 * title, not a header. Falls back to labelOf.
 */
function rowLabelOf(wb: WorkbookModel, labels: LabelSource | undefined, sheet: string, address: string): string {
  const { row, col } = parseAddress(address);
  const text = (r: number, c: number) => {
    const v = getCell(wb, sheet, r, c)?.value;
    return typeof v === "string" && v.trim() && !/^#/.test(v) && !getCell(wb, sheet, r, c)?.formula ? v : undefined;
  };
  const isHeader = (r: number, c: number) => {
    const below = getCell(wb, sheet, r + 1, c);
    return !!below && (below.formula !== undefined || typeof below.value === "number");
  };
  for (let c = col - 1; c >= 1; c--) {
    const t = text(row, c);
    if (t && !HEADING.test(t) && !isHeader(row, c)) return t;
  }
  const above = row > 1 ? text(row - 1, col) : undefined;
  if (above && !HEADING.test(above)) return above;
  return labelOf(labels, sheet, address);
}

/** The unit written beside a value in its row (a short text such as "kW", "m³/h" or "fraction"), if any. */
function unitBeside(wb: WorkbookModel, sheet: string, address: string): string {
  const { row, col } = parseAddress(address);
  const v = getCell(wb, sheet, row, col + 1)?.value;
  return typeof v === "string" && v.length <= 12 && /^[A-Za-z°µ%³²/·^ ]+$/.test(v) ? v : "";
}

/** A single cell a defined name refers to, or undefined for ranges and constants. */
function namedCell(refersTo: string, scope?: string): { sheet: string; address: string } | undefined {
  const m = /^=?((?:'(?:[^']|'')+'|[^!]+)!)?\$?([A-Za-z]{1,3})\$?(\d+)$/.exec(refersTo.trim());
  if (!m) return undefined;
  const { sheet } = splitReference(`${m[1] ?? ""}A1`, scope ?? "");
  return sheet ? { sheet, address: `${m[2].toUpperCase()}${m[3]}` } : undefined;
}

/** Formula cells under each "Results" heading, down to the first empty row. */
function underResultsHeadings(wb: WorkbookModel): CellModel[] {
  const found: CellModel[] = [];
  for (const sheet of wb.sheets) {
    for (const heading of sheet.cells.values()) {
      if (typeof heading.value !== "string" || heading.formula || !HEADING.test(heading.value)) continue;
      for (let row = heading.row + 1; ; row++) {
        const cells = [0, 1, 2, 3].map((d) => getCell(wb, sheet.name, row, heading.col + d)).filter((c): c is CellModel => c !== undefined && (c.value !== null || !!c.formula));
        if (!cells.length) break;
        found.push(...cells.filter((c) => c.formula));
      }
    }
  }
  return found;
}

/** The references a formula's text names; none when the text cannot be read as a formula. */
function referencesIn(text: string): ReturnType<typeof references> {
  try {
    return references(text);
  } catch {
    return [];
  }
}

/** A formula that only shows one cell's value elsewhere (=Calc!B31), computing nothing more. */
const SHOWS_A_CELL = /^\s*(?:'(?:[^']|'')+'!|[A-Za-z0-9_.]+!)?\$?[A-Za-z]{1,3}\$?\d+\s*$/;

/**
 * Cells some formula of the workbook computes further with, as "Sheet!A1" (ranges expanded only
 * for the NAPPE cells asked about); a formula that only shows a cell elsewhere does not count.
 */
function readByOthers(wb: WorkbookModel, candidates: readonly CellOutcome[]): Set<string> {
  const read = new Set<string>();
  for (const sheet of wb.sheets) {
    for (const cell of sheet.cells.values()) {
      if (!cell.formula || SHOWS_A_CELL.test(cell.formula)) continue;
      for (const r of referencesIn(cell.formula)) {
        const target = r.sheet ?? sheet.name;
        for (const c of candidates) {
          if (c.sheet.toLowerCase() !== target.toLowerCase() || (c.sheet === sheet.name && c.address === cell.address)) continue;
          const { row, col } = parseAddress(c.address);
          const rowIn = r.from.row === 0 || (row >= Math.min(r.from.row, r.to.row) && row <= Math.max(r.from.row, r.to.row));
          const colIn = r.from.col === 0 || (col >= Math.min(r.from.col, r.to.col) && col <= Math.max(r.from.col, r.to.col));
          if (rowIn && colIn) read.add(ref(c.sheet, c.address));
        }
      }
    }
  }
  return read;
}

/** "spills 12 rows": a spilled result stands in a summary line by its size; its table is in its derivation. */
export function spillsRows(n: number): string {
  return `spills ${n} ${n === 1 ? "row" : "rows"}`;
}

function valueText(value: CellValue | CellValue[][], unit: string): { value: string; exact: string } {
  if (Array.isArray(value)) return { value: spillsRows(value.length), exact: "" };
  if (typeof value === "number") return { value: unit ? formatQuantity(value, unit) : formatCell(value), exact: exactNumber(value) };
  return { value: formatCell(value), exact: value === null ? "" : String(value) };
}

/** The key results and inputs of a checked workbook. */
export function auditSummary(wb: WorkbookModel, outcomes: readonly CellOutcome[], views: readonly (readonly CallView[])[], labels?: LabelSource): AuditSummary {
  const byRef = new Map(outcomes.map((o) => [ref(o.sheet, o.address), o]));
  const row = (sheet: string, address: string, label: string): SummaryRow => {
    const o = byRef.get(ref(sheet, address));
    const { row: r, col } = parseAddress(address);
    const cell = getCell(wb, sheet, r, col);
    const value = o ? o.value : (cell?.value ?? null);
    const beside = o?.unit ? "" : unitBeside(wb, sheet, address);
    // An efficiency held as a fraction, labelled so, reads as percent (the formatting rule).
    const v = beside === "fraction" && typeof value === "number" ? { value: formatPercent(value), exact: exactNumber(value) } : valueText(value, o?.unit || (beside === "fraction" ? "" : beside));
    return { cell: ref(sheet, address), label, ...v };
  };
  const results: SummaryRow[] = [];
  const seen = new Set<string>();
  const add = (sheet: string, address: string, label: string) => {
    const key = ref(sheet, address);
    if (seen.has(key)) return;
    seen.add(key);
    results.push(row(sheet, address, label));
  };
  const named = (wb.names ?? []).flatMap((n) => {
    const at = namedCell(n.refersTo, n.sheet);
    const sheet = at && findSheet(wb, at.sheet);
    const { row: r, col } = at ? parseAddress(at.address) : { row: 0, col: 0 };
    return sheet && getCell(wb, sheet.name, r, col)?.formula ? [{ sheet: sheet.name, address: at!.address, name: n.name }] : [];
  });
  for (const n of named) add(n.sheet, n.address, `${n.name}${labelOf(labels, n.sheet, n.address) ? ` (${labelOf(labels, n.sheet, n.address)})` : ""}`);
  for (const c of underResultsHeadings(wb)) add(c.sheet, c.address, rowLabelOf(wb, labels, c.sheet, c.address));
  let basis = "Cells with a defined name and cells under a \u201cResults\u201d heading.";
  if (!results.length) {
    const read = readByOthers(wb, outcomes);
    for (const o of outcomes) if (!read.has(ref(o.sheet, o.address))) add(o.sheet, o.address, rowLabelOf(wb, labels, o.sheet, o.address));
    basis = "No defined names or \u201cResults\u201d heading: the ends of the NAPPE calculation (the NAPPE cells no other formula computes with).";
  }

  // Cells another formula's spilled result fills are results, not inputs.
  const spills = wb.sheets.flatMap((sh) => [...sh.cells.values()].filter((c) => c.arrayRef).map((c) => ({ sheet: sh.name, range: c.arrayRef!.split(":").map(parseAddress) })));
  const spilled = (sheet: string, r: number, c: number) => spills.some((x) => x.sheet === sheet && x.range.length === 2 && r >= x.range[0].row && r <= x.range[1].row && c >= x.range[0].col && c <= x.range[1].col);
  const inputs: AuditSummary["inputs"] = [];
  const inputSeen = new Set<string>();
  const formulas = { formula: (sheet: string, row: number, col: number) => getCell(wb, sheet, row, col)?.formula };
  outcomes.forEach((o, i) => {
    for (const view of views[i] ?? []) {
      for (const arg of view.args) {
        // Every single cell the argument names, also inside an expression (Inputs!B1&" gpm").
        for (const r of referencesIn(arg.written)) {
          if (r.from.row !== r.to.row || r.from.col !== r.to.col || !r.from.row || !r.from.col) continue;
          // Follow plain references (=Inputs!B4) to the cell that holds the number.
          const chain = referenceChain(formulas, r.sheet ?? o.sheet, r.from.row, r.from.col);
          const end = chain[chain.length - 1];
          const sheet = end.sheet;
          const address = addressOf(end.row, end.col);
          const key = ref(findSheet(wb, sheet)?.name ?? sheet, address);
          const at = parseAddress(address);
          const cell = getCell(wb, sheet, at.row, at.col);
          if (inputSeen.has(key) || !cell || cell.formula || cell.value === null || spilled(cell.sheet, at.row, at.col)) continue;
          inputSeen.add(key);
          const readAs = `NAPPE.${view.id} ${arg.name}: ${arg.value}${arg.unit && !arg.value.endsWith(arg.unit) ? ` ${arg.unit}` : ""}`;
          inputs.push({ cell: key, label: labelOf(labels, cell.sheet, address), value: typeof cell.value === "string" ? shortenQuantityText(cell.value) : formatCell(cell.value), exact: typeof cell.value === "number" ? exactNumber(cell.value) : String(cell.value), readAs });
        }
      }
    }
  });
  return { basis, results, inputs };
}

/**
 * The in-memory workbook model shared by the headless command and the side pane's preview:
 * values, formulas, cached results, number formats and array ranges, by sheet. No file I/O here
 * (see workbook.ts for reading .xlsx), so it also runs in the browser.
 */
import { cellKey } from "./address";
import type { LabelSource } from "./unitCheck";

export { addressOf, cellKey, parseAddress } from "./address";

export type CellValue = number | string | boolean | null;

export interface CellModel {
  sheet: string;
  /** A1-style address. */
  address: string;
  row: number;
  col: number;
  /** Constant value, or the result cached in the file for a formula cell. */
  value: CellValue;
  /** Formula without the leading "=". */
  formula?: string;
  /** For an array (spilled) formula: the range it fills, such as "B2:C7". */
  arrayRef?: string;
  numFmt?: string;
}

export interface SheetModel {
  name: string;
  cells: Map<string, CellModel>;
}

/** A defined name: workbook scope, or one sheet's when `sheet` is set. */
export interface DefinedName {
  name: string;
  /** What it refers to, as stored: "Inputs!$B$4", "'Pump data'!$A$3:$E$21", "0.96". */
  refersTo: string;
  sheet?: string;
}

export interface WorkbookModel {
  /** The file name, where the source knows it ("orchard-pumping-station.xlsx"). */
  name?: string;
  sheets: SheetModel[];
  /** Defined names, when the file has any. */
  names?: DefinedName[];
  /**
   * Formulas as Excel 365 gives them through Office.js: every formula evaluates as a dynamic
   * array formula (implicit intersection only where written, as @). A file says it per cell
   * instead (an array formula's `arrayRef`).
   */
  dynamicArrays?: boolean;
  /** External workbooks by their index in stored formulas ([1]Sheet1!A1). */
  externalLinks?: Map<number, string>;
}

export function getCell(wb: WorkbookModel, sheet: string, row: number, col: number): CellModel | undefined {
  return findSheet(wb, sheet)?.cells.get(cellKey(row, col));
}

export function findSheet(wb: WorkbookModel, name: string): SheetModel | undefined {
  return wb.sheets.find((s) => s.name === name) ?? wb.sheets.find((s) => s.name.toLowerCase() === name.toLowerCase());
}

/** Labels and number formats of the in-memory workbook, for the unit check. */
export function labelSource(wb: WorkbookModel): LabelSource {
  const text = (sheet: string, row: number, col: number): string | undefined => {
    const v = getCell(wb, sheet, row, col)?.value;
    return typeof v === "string" && v.trim() && !/^#/.test(v) ? v : undefined;
  };
  return {
    labelsNear(sheet, row, col) {
      const found: string[] = [];
      for (let c = col - 1; c >= Math.max(1, col - 3); c--) {
        const t = text(sheet, row, c);
        if (t) {
          found.push(t);
          break;
        }
      }
      const above = row > 1 ? text(sheet, row - 1, col) : undefined;
      if (above) found.push(above);
      return found;
    },
    numberFormat: (sheet, row, col) => getCell(wb, sheet, row, col)?.numFmt,
    formula: (sheet, row, col) => getCell(wb, sheet, row, col)?.formula,
  };
}

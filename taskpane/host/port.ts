/**
 * The one small port through which the pane reaches a workbook. Two adapters implement it:
 * Office.js in Excel (office.ts) and an in-memory workbook read from .xlsx (memory.ts) for the
 * preview page and tests. All pane logic talks to this interface only.
 */
import type { CellValue, DefinedName, WorkbookModel } from "../../workbook/model";

export interface CellSnapshot {
  /** Formula without the leading "=", when the cell has one. */
  formula?: string;
  /** The cell's value as the host last calculated it. */
  value: CellValue;
  numberFormat?: string;
}

export interface CellAddress {
  sheet: string;
  /** A1-style address of one cell. */
  address: string;
}

export interface FormulaCell extends CellAddress {
  formula: string;
  value: CellValue;
}

export interface HostPort {
  /** Its formulas are Excel 365's: each evaluates as a dynamic array formula (see WorkbookModel.dynamicArrays). */
  readonly dynamicArrays?: boolean;
  /** The selected cell (the top-left one of a selected range). */
  selection(): Promise<CellAddress>;
  /** Calls `handler` whenever the selection changes. */
  onSelectionChanged(handler: () => void): void;
  cell(sheet: string, address: string): Promise<CellSnapshot>;
  /** Values, formulas and number formats of a rectangular range ("A1:D8"). */
  range(sheet: string, range: string): Promise<CellSnapshot[][]>;
  /** Several ranges read together (one round trip where the host batches), in the order asked. */
  ranges(requests: readonly { sheet: string; range: string }[]): Promise<CellSnapshot[][][]>;
  /** Text of the nearest label cells: to the left on the same row, then above. */
  labelsNear(sheet: string, address: string): Promise<string[]>;
  /** Writes a formula (without "=") into one cell. */
  setFormula(sheet: string, address: string, formula: string): Promise<void>;
  /** Writes a constant (a label's text, a number) into one cell, replacing any formula there. */
  setValue(sheet: string, address: string, value: string | number): Promise<void>;
  /**
   * A cell and the defined names its formula can use (the workbook's and its own sheet's; every
   * sheet's when the formula qualifies a name by another sheet), in one round trip where it can.
   */
  cellAndNames(sheet: string, address: string): Promise<{ cell: CellSnapshot; names: DefinedName[] }>;
  /**
   * Every sheet's used range (values, formulas, number formats) and the defined names, read in
   * as few round trips as the host allows, as a workbook model to analyse in memory. The values
   * are the host's own (nothing is recalculated).
   */
  workbookSnapshot(): Promise<WorkbookModel>;
  /** Every formula cell in the workbook that calls a NAPPE function. */
  nappeFormulaCells(onProgress?: (done: number, total: number) => void): Promise<FormulaCell[]>;
  /** Selects a cell (and shows its sheet). */
  select(sheet: string, address: string): Promise<void>;
  /** Writes (or replaces) a whole sheet of text rows; never touches any other sheet. */
  writeSheet(name: string, rows: string[][], options?: { headerRow?: number; widths?: number[]; subHeaders?: number[] }): Promise<void>;
}

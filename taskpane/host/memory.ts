/**
 * The in-memory adapter of the HostPort: a workbook model (read from .xlsx by the preview
 * server, or built in tests) with a selection. Formula values are recalculated with the
 * headless engine after every write, as Excel would.
 */
import { addressOf, cellKey, type CellModel, type CellValue, type DefinedName, findSheet, getCell, labelSource, parseAddress, type WorkbookModel } from "../../workbook/model";
import { recalculate } from "../../workbook/recalc";
import type { CellAddress, CellSnapshot, FormulaCell, HostPort } from "./port";
import { hasNappeCall } from "../../workbook/storedForm";

export class MemoryHost implements HostPort {
  private current: CellAddress;
  private readonly selectionHandlers: (() => void)[] = [];
  private readonly changeHandlers: (() => void)[] = [];

  /** `recalculate: false` keeps the values as given: for a snapshot read from Excel, analysed in memory. */
  constructor(readonly workbook: WorkbookModel, options: { recalculate?: boolean } = {}) {
    this.current = { sheet: workbook.sheets[0]?.name ?? "Sheet1", address: "A1" };
    if (options.recalculate !== false) this.recalculate();
  }

  /** Recomputes every formula's value in place. */
  recalculate(): void {
    const result = recalculate(this.workbook, { all: true });
    for (const c of result.cells) {
      const model = getCell(this.workbook, c.sheet, parseAddress(c.address).row, parseAddress(c.address).col)!;
      if (Array.isArray(c.value)) {
        const { row, col } = model;
        model.value = c.value[0]?.[0] ?? null;
        c.value.forEach((r, i) =>
          r.forEach((v, j) => {
            if (!i && !j) return;
            const sheet = findSheet(this.workbook, c.sheet)!;
            const key = cellKey(row + i, col + j);
            const spilled = sheet.cells.get(key);
            if (spilled && !spilled.formula) spilled.value = v;
            else if (!spilled) sheet.cells.set(key, { sheet: sheet.name, address: addressOf(row + i, col + j), row: row + i, col: col + j, value: v });
          }),
        );
      } else model.value = c.value;
    }
  }

  /** Called after any write, so a view can redraw. */
  onChanged(handler: () => void): void {
    this.changeHandlers.push(handler);
  }

  /** Moves the selection (the preview grid calls this on a click). */
  setSelection(sheet: string, address: string): void {
    this.current = { sheet, address };
    this.selectionHandlers.forEach((h) => h());
  }

  async selection(): Promise<CellAddress> {
    return this.current;
  }

  onSelectionChanged(handler: () => void): void {
    this.selectionHandlers.push(handler);
  }

  private snapshotOf(c: CellModel | undefined): CellSnapshot {
    return c ? { formula: c.formula, value: c.value, numberFormat: c.numFmt } : { value: null };
  }

  async cell(sheet: string, address: string): Promise<CellSnapshot> {
    const { row, col } = parseAddress(address);
    return this.snapshotOf(getCell(this.workbook, sheet, row, col));
  }

  async range(sheet: string, range: string): Promise<CellSnapshot[][]> {
    const [a, b] = range.split(":");
    const from = parseAddress(a);
    const to = parseAddress(b ?? a);
    const rows: CellSnapshot[][] = [];
    for (let r = from.row; r <= to.row; r++) {
      const row: CellSnapshot[] = [];
      for (let c = from.col; c <= to.col; c++) row.push(this.snapshotOf(getCell(this.workbook, sheet, r, c)));
      rows.push(row);
    }
    return rows;
  }

  async ranges(requests: readonly { sheet: string; range: string }[]): Promise<CellSnapshot[][][]> {
    return Promise.all(requests.map((r) => this.range(r.sheet, r.range)));
  }

  async labelsNear(sheet: string, address: string): Promise<string[]> {
    const { row, col } = parseAddress(address);
    return labelSource(this.workbook).labelsNear(sheet, row, col);
  }

  async setFormula(sheet: string, address: string, formula: string): Promise<void> {
    this.write(sheet, address, (cell) => {
      cell.formula = formula.replace(/^=/, "");
    });
  }

  async setValue(sheet: string, address: string, value: string | number): Promise<void> {
    this.write(sheet, address, (cell) => {
      delete cell.formula;
      cell.value = value === "" ? null : value; // as in Excel: writing "" empties the cell
    });
  }

  /** Changes one cell (made if missing), then recalculates and tells the views. */
  private write(sheet: string, address: string, change: (cell: CellModel) => void): void {
    const s = findSheet(this.workbook, sheet);
    if (!s) throw new Error(`no sheet named ${sheet}`);
    const { row, col } = parseAddress(address);
    const cell: CellModel = s.cells.get(cellKey(row, col)) ?? { sheet: s.name, address: addressOf(row, col), row, col, value: null };
    change(cell);
    s.cells.set(cellKey(row, col), cell);
    this.recalculate();
    this.changeHandlers.forEach((h) => h());
  }

  async nappeFormulaCells(onProgress?: (done: number, total: number) => void): Promise<FormulaCell[]> {
    const all = this.workbook.sheets.flatMap((s) => [...s.cells.values()]);
    const out: FormulaCell[] = [];
    all.forEach((c, i) => {
      if (c.formula && hasNappeCall(c.formula)) out.push({ sheet: c.sheet, address: c.address, formula: c.formula, value: c.value });
      if (onProgress && (i % 500 === 0 || i === all.length - 1)) onProgress(i + 1, all.length);
    });
    return out;
  }

  async workbookSnapshot(): Promise<WorkbookModel> {
    return this.workbook;
  }

  async cellAndNames(sheet: string, address: string): Promise<{ cell: CellSnapshot; names: DefinedName[] }> {
    return { cell: await this.cell(sheet, address), names: this.workbook.names ?? [] };
  }

  async select(sheet: string, address: string): Promise<void> {
    this.setSelection(sheet, address);
  }

  async writeSheet(name: string, rows: string[][]): Promise<void> {
    const existing = this.workbook.sheets.findIndex((s) => s.name === name);
    const cells = new Map<string, CellModel>();
    rows.forEach((row, i) => row.forEach((v, j) => v !== "" && cells.set(cellKey(i + 1, j + 1), { sheet: name, address: addressOf(i + 1, j + 1), row: i + 1, col: j + 1, value: v as CellValue })));
    const sheet = { name, cells };
    if (existing >= 0) this.workbook.sheets[existing] = sheet;
    else this.workbook.sheets.push(sheet);
    this.changeHandlers.forEach((h) => h());
  }
}

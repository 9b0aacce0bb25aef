/**
 * The Office.js adapter of the HostPort: reads and writes the workbook through Excel's
 * JavaScript API. Kept thin; everything it returns is plain data for the pure pane logic.
 */
import { addressOf, parseAddress } from "../../workbook/address";
import { cellKey, type CellModel, type CellValue, type DefinedName, type WorkbookModel } from "../../workbook/model";
import type { CellAddress, CellSnapshot, FormulaCell, HostPort } from "./port";
import { hasNappeCall } from "../../workbook/storedForm";

function plain(v: unknown): CellValue {
  if (v === null || v === undefined || v === "") return v === "" ? "" : null;
  if (typeof v === "number" || typeof v === "string" || typeof v === "boolean") return v;
  return String(v);
}

function snapshot(formula: unknown, value: unknown, format: unknown): CellSnapshot {
  const f = typeof formula === "string" && formula.startsWith("=") ? formula.slice(1) : undefined;
  const nf = typeof format === "string" && format !== "General" ? format : undefined;
  return { formula: f, value: plain(value), numberFormat: nf };
}

/** Strips "Sheet1!" from an address Excel returns. */
function localAddress(address: string): string {
  return address.includes("!") ? address.slice(address.lastIndexOf("!") + 1) : address;
}

/**
 * The defined names in two round trips: this queues the workbook's names and the sheet list;
 * after a sync, `sheetNames()` queues each sheet's own names and returns the reader to call
 * after the next sync. Callers may queue more in either round trip.
 */
/** True when a formula names something on another sheet that is not a cell or range ('Pump data'!Curve): a sheet-scoped name. */
export function namesAnotherSheet(formula: string): boolean {
  for (const m of formula.matchAll(/!(\$?[A-Za-z_\\][A-Za-z0-9_.]*\$?\d*)/g)) {
    if (!/^\$?[A-Za-z]{1,3}\$?\d+$/.test(m[1]) && !/^\$?[A-Za-z]{1,3}$/.test(m[1])) return true;
  }
  return false;
}

/** What a defined name refers to, without the "=" Excel gives it. */
function refersTo(formula: unknown): string {
  return String(formula).replace(/^=/, "");
}

function queueNames(context: Excel.RequestContext): { sheets: Excel.WorksheetCollection; bookNames(): DefinedName[]; sheetNames(): () => DefinedName[] } {
  const book = context.workbook.names;
  book.load("items/name,items/formula");
  const sheets = context.workbook.worksheets;
  sheets.load("items/name");
  const bookNames = () => book.items.map((n) => ({ name: n.name, refersTo: refersTo(n.formula) }));
  return {
    sheets,
    bookNames,
    sheetNames() {
      const scoped = sheets.items.map((ws) => {
        const names = ws.names;
        names.load("items/name,items/formula");
        return { sheet: ws.name, names };
      });
      return () => [
        ...bookNames(),
        ...scoped.flatMap(({ sheet, names }) => names.items.map((n) => ({ name: n.name, refersTo: refersTo(n.formula), sheet }))),
      ];
    },
  };
}

/**
 * Cells read per round trip by workbookSnapshot. A cell's value, formula and number format come
 * to some tens of bytes in the response, so 40 000 cells stay well under Excel on the web's
 * documented 5 MB payload limit.
 */
const READ_CELLS = 40000;

export class OfficeHost implements HostPort {
  /** Office.js gives formulas as Excel 365 shows them: dynamic arrays, @ where intersection applies. */
  readonly dynamicArrays = true;
  async selection(): Promise<CellAddress> {
    return Excel.run(async (context) => {
      const cell = context.workbook.getActiveCell();
      cell.load("address");
      const sheet = cell.worksheet;
      sheet.load("name");
      await context.sync();
      return { sheet: sheet.name, address: localAddress(cell.address).split(":")[0] };
    });
  }

  onSelectionChanged(handler: () => void): void {
    void Excel.run(async (context) => {
      context.workbook.onSelectionChanged.add(async () => handler());
      await context.sync();
    });
  }

  async cell(sheet: string, address: string): Promise<CellSnapshot> {
    return (await this.range(sheet, address))[0][0];
  }

  async range(sheet: string, range: string): Promise<CellSnapshot[][]> {
    return Excel.run(async (context) => {
      const r = context.workbook.worksheets.getItem(sheet).getRange(range);
      r.load("formulas, values, numberFormat");
      await context.sync();
      return r.values.map((row, i) => row.map((v, j) => snapshot(r.formulas[i][j], v, r.numberFormat[i][j])));
    });
  }

  async ranges(requests: readonly { sheet: string; range: string }[]): Promise<CellSnapshot[][][]> {
    if (!requests.length) return [];
    return Excel.run(async (context) => {
      const loaded = requests.map((q) => {
        const r = context.workbook.worksheets.getItem(q.sheet).getRange(q.range);
        r.load("formulas, values, numberFormat");
        return r;
      });
      await context.sync();
      return loaded.map((r) => {
        const { formulas, values, numberFormat } = r;
        return values.map((row, i) => row.map((v, j) => snapshot(formulas[i][j], v, numberFormat[i][j])));
      });
    });
  }

  async labelsNear(sheet: string, address: string): Promise<string[]> {
    const { row, col } = parseAddress(address);
    const found: string[] = [];
    if (col > 1) {
      const left = await this.range(sheet, `${addressOf(row, Math.max(1, col - 3))}:${addressOf(row, col - 1)}`);
      const text = left[0].map((c) => c.value).reverse().find((v) => typeof v === "string" && v.trim());
      if (typeof text === "string") found.push(text);
    }
    if (row > 1) {
      const above = (await this.cell(sheet, addressOf(row - 1, col))).value;
      if (typeof above === "string" && above.trim()) found.push(above);
    }
    return found;
  }

  async setFormula(sheet: string, address: string, formula: string): Promise<void> {
    await Excel.run(async (context) => {
      context.workbook.worksheets.getItem(sheet).getRange(address).formulas = [[`=${formula.replace(/^=/, "")}`]];
      await context.sync();
    });
  }

  async setValue(sheet: string, address: string, value: string | number): Promise<void> {
    await Excel.run(async (context) => {
      context.workbook.worksheets.getItem(sheet).getRange(address).values = [[value]];
      await context.sync();
    });
  }

  async nappeFormulaCells(onProgress?: (done: number, total: number) => void): Promise<FormulaCell[]> {
    return Excel.run(async (context) => {
      const sheets = context.workbook.worksheets;
      sheets.load("items/name");
      await context.sync();
      const out: FormulaCell[] = [];
      for (let s = 0; s < sheets.items.length; s++) {
        const used = sheets.items[s].getUsedRangeOrNullObject(true);
        used.load("formulas, values, rowIndex, columnIndex");
        await context.sync();
        if (!used.isNullObject) {
          used.formulas.forEach((row, i) =>
            row.forEach((f, j) => {
              if (typeof f === "string" && hasNappeCall(f)) {
                out.push({ sheet: sheets.items[s].name, address: addressOf(used.rowIndex + i + 1, used.columnIndex + j + 1), formula: f.replace(/^=/, ""), value: plain(used.values[i][j]) });
              }
            }),
          );
        }
        onProgress?.(s + 1, sheets.items.length);
      }
      return out;
    });
  }

  /**
   * Two round trips to learn the sheets, names and used ranges, then the cells in chunks of
   * rows queued together, one more round trip per READ_CELLS cells: a response stays well under
   * Excel on the web's payload limit (5 MB per request, documented), whatever the workbook holds.
   */
  async workbookSnapshot(): Promise<WorkbookModel> {
    return Excel.run(async (context) => {
      const names = queueNames(context);
      context.workbook.load("name");
      await context.sync();
      const readNames = names.sheetNames();
      const used = names.sheets.items.map((ws) => {
        const range = ws.getUsedRangeOrNullObject(true);
        range.load("rowIndex,columnIndex,rowCount,columnCount");
        return { ws, range };
      });
      await context.sync();
      const model: WorkbookModel = { name: context.workbook.name, sheets: [], names: readNames(), dynamicArrays: true };
      const pending: { sheet: string; cells: Map<string, CellModel>; row0: number; col0: number; range: Excel.Range }[] = [];
      let queued = 0;
      const flush = async () => {
        if (!pending.length) return;
        await context.sync();
        for (const p of pending.splice(0)) {
          const { formulas, values, numberFormat } = p.range;
          formulas.forEach((row, i) =>
            row.forEach((f, j) => {
              const value = plain(values[i][j]);
              const formula = typeof f === "string" && f.startsWith("=") ? f.slice(1) : undefined;
              const format = numberFormat[i][j];
              if (formula === undefined && (value === null || value === "")) return;
              const r = p.row0 + i + 1;
              const c = p.col0 + j + 1;
              p.cells.set(cellKey(r, c), { sheet: p.sheet, address: addressOf(r, c), row: r, col: c, value, formula, numFmt: typeof format === "string" && format !== "General" ? format : undefined });
            }),
          );
        }
        queued = 0;
      };
      for (const { ws, range } of used) {
        const cells = new Map<string, CellModel>();
        model.sheets.push({ name: ws.name, cells });
        if (range.isNullObject) continue;
        const rowsPerChunk = Math.max(1, Math.floor(READ_CELLS / Math.max(1, range.columnCount)));
        for (let r0 = 0; r0 < range.rowCount; r0 += rowsPerChunk) {
          const rows = Math.min(rowsPerChunk, range.rowCount - r0);
          if (queued + rows * range.columnCount > READ_CELLS) await flush();
          const chunk = ws.getRangeByIndexes(range.rowIndex + r0, range.columnIndex, rows, range.columnCount);
          chunk.load("values,formulas,numberFormat");
          pending.push({ sheet: ws.name, cells, row0: range.rowIndex + r0, col0: range.columnIndex, range: chunk });
          queued += rows * range.columnCount;
        }
      }
      await flush();
      return model;
    });
  }

  async cellAndNames(sheet: string, address: string): Promise<{ cell: CellSnapshot; names: DefinedName[] }> {
    return Excel.run(async (context) => {
      const r = context.workbook.worksheets.getItem(sheet).getRange(address);
      r.load("formulas, values, numberFormat");
      const names = queueNames(context);
      const own = context.workbook.worksheets.getItem(sheet).names;
      own.load("items/name,items/formula");
      // One round trip: the cell, the workbook's names and the names its own sheet scopes.
      await context.sync();
      const cell = snapshot(r.formulas[0][0], r.values[0][0], r.numberFormat[0][0]);
      const book = names.bookNames();
      if (!namesAnotherSheet(cell.formula ?? "")) {
        return { cell, names: [...book, ...own.items.map((n) => ({ name: n.name, refersTo: refersTo(n.formula), sheet }))] };
      }
      // A name qualified by another sheet ('Pump data'!Curve): every sheet's names, one more round trip.
      const read = names.sheetNames();
      await context.sync();
      return { cell, names: read() };
    });
  }

  async select(sheet: string, address: string): Promise<void> {
    await Excel.run(async (context) => {
      const ws = context.workbook.worksheets.getItem(sheet);
      ws.activate();
      ws.getRange(address).select();
      await context.sync();
    });
  }

  async writeSheet(name: string, rows: string[][], options: { headerRow?: number; widths?: number[]; subHeaders?: number[] } = {}): Promise<void> {
    await Excel.run(async (context) => {
      const existing = context.workbook.worksheets.getItemOrNullObject(name);
      await context.sync();
      if (!existing.isNullObject) existing.delete();
      const ws = context.workbook.worksheets.add(name);
      const width = rows.reduce((w, r) => Math.max(w, r.length), 0);
      const values = rows.map((r) => [...r, ...Array(width - r.length).fill("")]);
      const range = ws.getRangeByIndexes(0, 0, values.length, width);
      range.numberFormat = values.map((r) => r.map(() => "@"));
      range.values = values;
      range.format.wrapText = true;
      range.format.verticalAlignment = "Top";
      for (const at of [...(options.subHeaders ?? []), ...(options.headerRow === undefined ? [] : [options.headerRow])]) {
        const header = ws.getRangeByIndexes(at, 0, 1, width);
        header.format.font.bold = true;
        header.format.fill.color = "#0E5463";
        header.format.font.color = "#FFFFFF";
      }
      // Frozen only when the summary above the table is short enough to leave room on screen.
      if (options.headerRow !== undefined && options.headerRow < 10) ws.freezePanes.freezeRows(options.headerRow + 1);
      options.widths?.forEach((w, i) => (ws.getRangeByIndexes(0, i, 1, 1).format.columnWidth = w * 6));
      ws.pageLayout.orientation = Excel.PageOrientation.landscape;
      ws.pageLayout.zoom = { horizontalFitToPages: 1, verticalFitToPages: 0 };
      ws.activate();
      await context.sync();
    });
  }
}

/**
 * The workbook model from an exceljs workbook (read from a file, or built in memory as the demo
 * and the tests do): values, formulas, cached results, number formats and array ranges.
 */
import type ExcelJS from "exceljs";
import { addressOf, cellKey } from "./address";
import type { CellModel, CellValue, SheetModel, WorkbookModel } from "./model";

function plainValue(v: unknown): CellValue {
  if (v === null || v === undefined) return null;
  if (typeof v === "number" || typeof v === "string" || typeof v === "boolean") return v;
  if (v instanceof Date) return v.toISOString();
  if (typeof v === "object") {
    const o = v as Record<string, unknown>;
    if ("error" in o) return String(o.error);
    if ("richText" in o && Array.isArray(o.richText)) return (o.richText as { text: string }[]).map((r) => r.text).join("");
    if ("text" in o) return String(o.text);
    if ("result" in o) return plainValue(o.result);
  }
  return null;
}

/** Builds the model from an exceljs workbook (also used for workbooks made in memory). */
export function fromExcelJS(book: ExcelJS.Workbook): WorkbookModel {
  const sheets: SheetModel[] = [];
  book.eachSheet((ws) => {
    const cells = new Map<string, CellModel>();
    ws.eachRow({ includeEmpty: false }, (row, r) => {
      row.eachCell({ includeEmpty: false }, (cell, c) => {
        const raw = cell.value as unknown;
        const model: CellModel = { sheet: ws.name, address: addressOf(r, c), row: r, col: c, value: plainValue(raw) };
        if (raw && typeof raw === "object" && ("formula" in raw || "sharedFormula" in raw)) {
          const formula = cell.formula;
          if (formula) model.formula = formula.replace(/^=/, "");
          const o = raw as { shareType?: string; ref?: string };
          if (o.shareType === "array" && o.ref) model.arrayRef = o.ref;
        }
        if (cell.numFmt && cell.numFmt !== "General") model.numFmt = cell.numFmt;
        cells.set(cellKey(r, c), model);
      });
    });
    sheets.push({ name: ws.name, cells });
  });
  return { sheets };
}

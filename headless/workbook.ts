/**
 * An in-memory workbook read from .xlsx with exceljs: values, formulas, cached results, number
 * formats and array-formula ranges, by sheet. Read-only: the file is never written.
 */
import { readFile } from "node:fs/promises";
import ExcelJS from "exceljs";
import { addressOf, cellKey } from "./address";
import type { CellModel, CellValue, SheetModel, WorkbookModel } from "./model";
import { DEFAULT_LIMITS, type Limits, openPackage, WorkbookError } from "./package";

export * from "./model";
export { BudgetError, WorkbookError } from "./package";

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

const ENCRYPTED_MAGIC = Buffer.from([0xd0, 0xcf, 0x11, 0xe0]);
const ZIP_MAGIC = Buffer.from([0x50, 0x4b]);

/**
 * Reads an .xlsx file. Throws WorkbookError with a plain message for anything unreadable, and
 * BudgetError when the file would need more memory than the limits allow.
 */
export async function readWorkbook(path: string, limits: Limits = DEFAULT_LIMITS): Promise<WorkbookModel> {
  let bytes: Buffer;
  try {
    bytes = await readFile(path);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new WorkbookError(code === "ENOENT" ? `${path}: no such file` : code === "EISDIR" ? `${path} is a folder, not a workbook` : `${path}: cannot be read (${code ?? String(e)})`);
  }
  if (bytes.subarray(0, 4).equals(ENCRYPTED_MAGIC)) {
    throw new WorkbookError(`${path} is password-protected (encrypted) or an old .xls file: save an unprotected .xlsx copy to check it`);
  }
  if (!bytes.subarray(0, 2).equals(ZIP_MAGIC)) throw new WorkbookError(`${path} is not an .xlsx workbook`);
  const pkg = await openPackage(bytes, path, limits);
  const book = new ExcelJS.Workbook();
  try {
    await book.xlsx.load(pkg.bytes as unknown as ArrayBuffer);
  } catch (e) {
    throw new WorkbookError(`${path} could not be read as an .xlsx workbook; it may be corrupt (${e instanceof Error ? e.message.split("\n")[0] : String(e)})`);
  }
  return { ...fromExcelJS(book), names: pkg.definedNames, externalLinks: pkg.externalLinks };
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

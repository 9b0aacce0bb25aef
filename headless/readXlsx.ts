/**
 * An in-memory workbook read from .xlsx: values, formulas, cached results, number formats and
 * array-formula ranges, by sheet, read from the package's XML by headless/sheetXml.ts.
 * Read-only: the file is never written.
 */
import { readFile } from "node:fs/promises";
import { modelFromParts } from "./sheetXml";
import type { WorkbookModel } from "../workbook/model";
import { DEFAULT_LIMITS, type Limits, openPackage, WorkbookError } from "./package";

export * from "../workbook/model";
export { fromExcelJS } from "../workbook/fromExcelJS";
export { BudgetError, WorkbookError } from "./package";

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
  const text = (part: string | undefined) => (part === undefined ? undefined : pkg.zip.text(part));
  try {
    const sheets = pkg.sheets.map((s) => ({ name: s.name, xml: text(s.path) ?? "" }));
    const model = modelFromParts({ workbookXml: pkg.workbookXml, sheets, sharedStringsXml: text(pkg.sharedStringsPath), stylesXml: text(pkg.stylesPath) });
    return { ...model, names: pkg.definedNames, externalLinks: pkg.externalLinks };
  } catch (e) {
    throw new WorkbookError(`${path} could not be read as an .xlsx workbook; it may be corrupt (${e instanceof Error ? e.message.split("\n")[0] : String(e)})`);
  }
}

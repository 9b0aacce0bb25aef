/**
 * The hand-off copy: a workbook for colleagues who do not have the add-in. Every NAPPE formula
 * (and every call of another add-in's function) is replaced by its value, keeping the cell's
 * number format, with a note holding the formula as people read it and the result with its
 * unit; the audit sheet is appended and a first sheet says what was frozen and when. The copy
 * holds no NAPPE or `_xldudf_` formula, so any spreadsheet program opens it with the same
 * numbers. The original file is only read.
 */
import { readFile } from "node:fs/promises";
import { basename } from "node:path";
import ExcelJS from "exceljs";
import { type AuditReport, GENERAL_CAUTIONS } from "../workbook/audit";
import { formatQuantity, formatValue, numberFormatFor } from "../workbook/format";
import { writeAtomically } from "./atomic";
import { addressOf, type CellValue, parseAddress } from "../workbook/model";
import { type Limits, openPackage, trimPackage } from "./package";
import type { CellOutcome, RecalcResult } from "../workbook/recalc";
import { addAuditSheet } from "./render";
import { hasNappeCall, otherAddinFunctions } from "../workbook/storedForm";

export const ABOUT_SHEET = "About this copy";

const ERROR_CODES = new Set(["#NULL!", "#DIV/0!", "#VALUE!", "#REF!", "#NAME?", "#NUM!", "#N/A", "#ERROR!"]);

function frozenValue(v: CellValue): ExcelJS.CellValue {
  if (typeof v === "string" && ERROR_CODES.has(v)) return { error: (v === "#ERROR!" ? "#VALUE!" : v) as ExcelJS.CellErrorValue["error"] };
  return v;
}

function note(outcome: CellOutcome, when: string): string {
  const result = typeof outcome.value === "number" ? formatQuantity(outcome.value, outcome.unit) : formatValue(outcome.value);
  const lines = [`Formula (frozen by Nappe ${when}):`, outcome.formula, `Result: ${result}`];
  if (outcome.status !== "ok") lines.push(`Status: ${outcome.status}`, ...outcome.messages);
  return lines.join("\n");
}

/** Writes the hand-off copy of `source` to `target`. Returns how many formulas were frozen. */
export async function writeHandoff(source: string, target: string, result: RecalcResult, report: AuditReport, limits: Limits): Promise<{ nappe: number; other: number }> {
  const bytes = await readFile(source);
  // The same trimmed package the recalculation read: whole-sheet rules would expand cell by cell.
  const pkg = await trimPackage(await openPackage(bytes, source, limits));
  const book = new ExcelJS.Workbook();
  await book.xlsx.load((pkg.trimmed.length ? pkg.bytes : bytes) as unknown as ArrayBuffer);
  const when = new Date().toISOString().replace(/\.\d+Z$/, "Z");
  let nappe = 0;
  let other = 0;
  const byCell = new Map(result.cells.map((c) => [`${c.sheet}!${c.address}`, c]));
  book.eachSheet((ws) => {
    ws.eachRow({ includeEmpty: false }, (row) => {
      row.eachCell({ includeEmpty: false }, (cell) => {
        const formula = cell.formula;
        if (!formula) return;
        const outcome = byCell.get(`${ws.name}!${cell.address}`);
        if (hasNappeCall(formula) && outcome) {
          nappe++;
          const rows = Array.isArray(outcome.value) ? outcome.value : [[outcome.value]];
          const { row: r0, col: c0 } = parseAddress(cell.address);
          rows.forEach((values, i) =>
            values.forEach((v, j) => {
              const target = ws.getCell(addressOf(r0 + i, c0 + j));
              target.value = frozenValue(v);
              // A value in a cell with no number format of the user's gets the figures rule (4 significant figures).
              if (typeof v === "number" && (!target.numFmt || target.numFmt === "General")) target.numFmt = numberFormatFor(v);
            }),
          );
          cell.note = note(outcome, when);
        } else if (otherAddinFunctions(formula).length) {
          other++;
          const cached = (cell.value as { result?: ExcelJS.CellValue } | null)?.result ?? null;
          cell.value = cached;
          cell.note = `Formula (frozen by Nappe ${when} at the value cached in the file: another add-in's function, not recalculated):\n=${formula}`;
        }
      });
    });
  });
  const audit = addAuditSheet(book, report);
  const about = book.addWorksheet(ABOUT_SHEET);
  const lines = [
    [`Hand-off copy of ${basename(source)}`],
    [`Written by Nappe on ${when}.`],
    [`${nappe} NAPPE formulas were replaced by the values Nappe computed for them${other ? `, and ${other} formulas of another add-in by the values cached in the file` : ""}. Each frozen cell keeps its number format and carries a note with its formula and result.`],
    ["The values no longer follow the inputs: change an input in the original workbook (with the Nappe add-in), not here."],
    [`The sheet "${audit.name}" lists every formula with its equation, inputs and units, result, warnings and sources.`],
    [report.found ?? ""],
    ...(pkg.trimmed.length ? [[`Left out of this copy (too large to carry cell by cell): ${pkg.trimmed.join("; ")}.`]] : []),
    [""],
    ...GENERAL_CAUTIONS.map((c) => [c]),
  ];
  lines.forEach((l, i) => {
    const cell = about.getCell(i + 1, 1);
    cell.value = l[0];
    cell.alignment = { wrapText: true, vertical: "top" };
    about.getRow(i + 1).height = Math.max(15, 15 * Math.ceil(l[0].length / 95));
  });
  about.getCell(1, 1).font = { bold: true, size: 14 };
  about.getColumn(1).width = 80;
  about.pageSetup = { ...about.pageSetup, orientation: "portrait", paperSize: 9, fitToPage: true, fitToWidth: 1, fitToHeight: 0, firstPageNumber: 1 };
  // The about sheet first, the audit last; the rest keep their order.
  // exceljs writes sheets by their orderNo, a field its type declarations leave out.
  const ordered = (w: ExcelJS.Worksheet) => w as ExcelJS.Worksheet & { orderNo: number };
  const rest = book.worksheets.filter((w) => w !== about);
  ordered(about).orderNo = 0;
  rest.forEach((w, i) => (ordered(w).orderNo = i + 1));
  book.views = [{ x: 0, y: 0, width: 20000, height: 12000, firstSheet: 0, activeTab: 0, visibility: "visible" }];
  await writeAtomically(target, Buffer.from(await book.xlsx.writeBuffer()));
  return { nappe, other };
}

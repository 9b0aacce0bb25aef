/**
 * The .xlsx reader (headless/sheetXml.ts) against exceljs, a general-purpose reader we did not
 * write: the same model from the demo workbook, a file saved by LibreOffice, XML written by hand
 * in Excel's stored form, and a workbook exceljs writes with styles, dates, rich text, merges and
 * shared formulas. Also the parts exceljs reads differently on purpose, checked against ECMA-376.
 */
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import ExcelJS from "exceljs";
import { describe, expect, it } from "vitest";
import { fromExcelJS, readWorkbook, type WorkbookModel } from "../headless/readXlsx";
import { openPackage, trimPackage } from "../headless/package";
import { modelFromParts } from "../headless/sheetXml";
import { shiftFormula } from "../workbook/storedForm";
import { DEMO_FILE } from "../demo/build";
import { c, row, xlsxPackage } from "./fixtures/package";

const root = join(import.meta.dirname, "..");
const dir = mkdtempSync(join(tmpdir(), "nappe-sheetxml-"));

/** The model exceljs gives for a file (through the same package the hand-off copy loads). */
async function byExcelJS(path: string): Promise<WorkbookModel> {
  const pkg = await trimPackage(await openPackage(readFileSync(path), path));
  const book = new ExcelJS.Workbook();
  await book.xlsx.load(pkg.bytes as unknown as ArrayBuffer);
  return fromExcelJS(book);
}

/** Sheets and cells in a fixed order, keys sorted, for comparison. */
function canonical(wb: WorkbookModel): unknown {
  return wb.sheets.map((s) => ({
    name: s.name,
    cells: [...s.cells.entries()].sort(([a], [b]) => (a < b ? -1 : 1)).map(([k, cell]) => [k, Object.fromEntries(Object.entries(cell).sort(([a], [b]) => (a < b ? -1 : 1)))]),
  }));
}

async function sameAsExcelJS(path: string): Promise<WorkbookModel> {
  const mine = await readWorkbook(path);
  expect(canonical(mine)).toEqual(canonical(await byExcelJS(path)));
  return mine;
}

describe("the .xlsx reader gives the model exceljs gives", () => {
  it("on the demo workbook as committed", async () => {
    const wb = await sameAsExcelJS(join(root, "demo", DEMO_FILE));
    expect(wb.sheets.reduce((n, s) => n + [...s.cells.values()].filter((x) => x.formula).length, 0)).toBeGreaterThan(50);
  });

  it("on a file saved by LibreOffice Calc (test/fixtures/libreoffice-saved.xlsx)", async () => {
    await sameAsExcelJS(join(root, "test/fixtures/libreoffice-saved.xlsx"));
  });

  it("on XML written by hand in Excel's stored form: shared and array formulas, inline strings, booleans, errors, merges", async () => {
    const path = join(dir, "stored.xlsx");
    const rows = [
      row(1, c("A1", { v: "Flow (gpm)" }), c("B1", { v: 2 }), c("C1", { f: "B1*2", v: 4, shared: { si: 0, ref: "C1:C4" } }), c("D1", { v: true }), c("E1", { f: "1/0", error: "#DIV/0!" })),
      row(2, c("B2", { v: 3 }), c("C2", { f: "", v: 6, shared: { si: 0 } }), c("D2", { f: "SUM($B$1:B2)", v: 5, shared: { si: 1, ref: "D2:D4" } })),
      row(3, c("B3", { v: 4 }), c("C3", { f: "", v: 8, shared: { si: 0 } }), c("D3", { f: "", v: 9, shared: { si: 1 } })),
      row(4, c("B4", { v: 5 }), c("C4", { f: "", v: 10, shared: { si: 0 } }), c("D4", { f: "", v: 14, shared: { si: 1 } }), c("E4", { f: '_xldudf_NAPPE_CONVERT(1,"ft","m")', v: 0.3048, array: "E4", dynamic: true })),
      row(6, c("A6", { v: "Merged label" })),
      // Rich inline text, text typed as a formula result, an error and FALSE as constants, an escaped character.
      `<row r="9"><c r="A9" t="inlineStr"><is><r><t xml:space="preserve">Head </t></r><r><rPr><b/></rPr><t>(ft)</t></r></is></c><c r="B9" t="str"><v>a &amp; b</v></c><c r="C9" t="e"><v>#N/A</v></c><c r="D9" t="b"><v>0</v></c><c r="E9"><v>1.5E-3</v></c></row>`,
    ].join("");
    writeFileSync(path, await xlsxPackage([{ name: "Stored", rows, after: '<mergeCells count="1"><mergeCell ref="A6:C7"/></mergeCells>' }, { name: "Second sheet", rows: row(1, c("A1", { f: "Stored!C4+1", v: 11 })) }]));
    const wb = await sameAsExcelJS(path);
    const cells = wb.sheets[0].cells;
    expect(cells.get("4:3")?.formula).toBe("B4*2");
    expect(cells.get("4:4")?.formula).toBe("SUM($B$1:B4)");
    expect(cells.get("7:3")?.value).toBe("Merged label");
    expect([1, 2, 3, 4, 5].map((col) => cells.get(`9:${col}`)?.value)).toEqual(["Head (ft)", "a & b", "#N/A", false, 0.0015]);
  });

  it("on a workbook exceljs writes: number formats, dates, rich text, hyperlinks, merges, a hidden sheet, filled formulas", async () => {
    const book = new ExcelJS.Workbook();
    const ws = book.addWorksheet("Styled");
    ws.getCell("A1").value = "Efficiency";
    ws.getCell("B1").value = 0.78;
    ws.getCell("B1").numFmt = "0.0%";
    ws.getCell("B2").value = 125.5;
    ws.getCell("B2").numFmt = '0.0 "gpm"';
    ws.getCell("B3").value = new Date(Date.UTC(2026, 11, 2));
    ws.getCell("B3").numFmt = "yyyy-mm-dd";
    ws.getCell("B4").value = { richText: [{ text: "Head " }, { font: { bold: true }, text: "(ft)" }] };
    ws.getCell("B5").value = { text: "datasheet", hyperlink: "https://example.invalid/pump" };
    ws.getCell("B6").value = { formula: "B1*2", result: 1.56 };
    ws.getCell("B6").numFmt = "0.00";
    ws.getCell("B7").value = { formula: "B3+1", result: 46359 };
    ws.getCell("B7").numFmt = "d-mmm-yy";
    ws.mergeCells("D1:F2");
    ws.getCell("D1").value = "Duty point";
    for (let r = 10; r <= 14; r++) ws.getCell(r, 1).value = r;
    ws.fillFormula("B10:B14", "A10*3", (r) => r * 3);
    const hidden = book.addWorksheet("Lookup", { state: "hidden" });
    hidden.getCell("A1").value = 42;
    const path = join(dir, "styled.xlsx");
    await book.xlsx.writeFile(path);
    const wb = await sameAsExcelJS(path);
    const cells = wb.sheets[0].cells;
    expect(cells.get("1:2")?.numFmt).toBe("0.0%");
    expect(cells.get("3:2")?.value).toBe("2026-12-02T00:00:00.000Z");
    expect(cells.get("14:2")?.formula).toBe("A14*3");
    expect(wb.sheets.map((s) => s.name)).toEqual(["Styled", "Lookup"]);
  });
});

describe("where the reader follows ECMA-376 rather than exceljs", () => {
  it("keeps text inside a shared formula's strings as written (ECMA-376 §18.3.1.40 moves references only)", () => {
    expect(shiftFormula('IF(A2>0,"A1",Sheet1!B2)', 1, 1)).toBe('IF(B3>0,"A1",Sheet1!C3)');
    expect(shiftFormula("SUM(A:A)+B$3+$C4+'My sheet'!A1+LOG10(A1)+ROWS(1:2)", 2, 1)).toBe("SUM(B:B)+C$3+$C6+'My sheet'!B3+LOG10(B3)+ROWS(3:4)");
    expect(shiftFormula("A1*2", -1, 0)).toBe("#REF!*2");
  });

  it("reads cells without an r attribute by their order, prefixed elements, date serials of the 1904 system", () => {
    const main = 'xmlns:x="http://schemas.openxmlformats.org/spreadsheetml/2006/main"';
    const wb = modelFromParts({
      workbookXml: `<x:workbook ${main}><x:workbookPr date1904="1"/></x:workbook>`,
      stylesXml: `<x:styleSheet ${main}><x:cellXfs count="2"><x:xf numFmtId="0"/><x:xf numFmtId="14"/></x:cellXfs></x:styleSheet>`,
      sharedStringsXml: `<x:sst ${main}><x:si><x:t>Speed</x:t><x:rPh><x:t>ignored</x:t></x:rPh></x:si><x:si><x:r><x:t xml:space="preserve">rpm </x:t></x:r><x:r><x:t>&amp; more</x:t></x:r></x:si></x:sst>`,
      sheets: [{ name: "P", xml: `<x:worksheet ${main}><x:sheetData><x:row><x:c t="s"><x:v>0</x:v></x:c><x:c><x:v>1750</x:v></x:c></x:row><x:row><x:c t="s"><x:v>1</x:v></x:c><x:c s="1"><x:v>0</x:v></x:c></x:row></x:sheetData></x:worksheet>` }],
    });
    const cells = wb.sheets[0].cells;
    expect(cells.get("1:1")?.value).toBe("Speed");
    expect(cells.get("1:2")?.value).toBe(1750);
    expect(cells.get("2:1")?.value).toBe("rpm & more");
    // Day 0 of the 1904 system is 1 January 1904 (ECMA-376 §18.17.4.1).
    expect(cells.get("2:2")?.value).toBe("1904-01-01T00:00:00.000Z");
  });
});

describe("the package reader (headless/zip.ts) on zips other programs write", () => {
  it("reads stored (uncompressed) parts as well as deflated ones, and gives the same model", async () => {
    const JSZip = (await import("jszip")).default;
    const deflated = readFileSync(join(root, "test/fixtures/libreoffice-saved.xlsx"));
    const stored = await (await JSZip.loadAsync(deflated)).generateAsync({ type: "nodebuffer", compression: "STORE" });
    const path = join(dir, "stored-parts.xlsx");
    writeFileSync(path, stored);
    expect(canonical(await readWorkbook(path))).toEqual(canonical(await readWorkbook(join(root, "test/fixtures/libreoffice-saved.xlsx"))));
  });

  it("says the file is damaged when a part's data is corrupt, instead of failing inside", async () => {
    const bytes = Buffer.from(readFileSync(join(root, "test/fixtures/libreoffice-saved.xlsx")));
    // Overwrite the middle of the first sheet's compressed data (found through its local header).
    const name = Buffer.from("xl/worksheets/sheet1.xml");
    const at = bytes.indexOf(name);
    bytes.fill(0xff, at + name.length + 40, at + name.length + 400);
    const path = join(dir, "damaged.xlsx");
    writeFileSync(path, bytes);
    await expect(readWorkbook(path)).rejects.toThrow(/could not be read as an \.xlsx workbook; it may be corrupt/);
  });

  it("refuses a Zip64 package with a plain reason", async () => {
    const bytes = Buffer.from(readFileSync(join(root, "test/fixtures/libreoffice-saved.xlsx")));
    const end = bytes.lastIndexOf(Buffer.from([0x50, 0x4b, 0x05, 0x06]));
    bytes.writeUInt32LE(0xffffffff, end + 16); // the directory's offset, as Zip64 writes it
    const path = join(dir, "zip64.xlsx");
    writeFileSync(path, bytes);
    await expect(readWorkbook(path)).rejects.toThrow(/Zip64/);
  });
});

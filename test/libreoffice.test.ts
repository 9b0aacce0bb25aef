/**
 * A second, real spreadsheet engine: LibreOffice Calc, headless. It opens what Nappe writes
 * (the demo, the hand-off copy, the audit workbook), its values of the hand-off copy equal
 * Nappe's, it computes plain formulas Nappe's engine also computes (on a workbook written with
 * no cached values, so LibreOffice must compute them itself), and a workbook LibreOffice saved
 * itself (test/fixtures/libreoffice-saved.xlsx: the demo opened and saved by LibreOffice 7.4,
 * which writes `_xldudf_nappe_...` in lower case) is read like the demo.
 *
 * Needs Debian's libreoffice-calc-nogui (`soffice`). Without it these tests are skipped with a
 * notice; `.ci/run` installs it and sets NAPPE_REQUIRE_LIBREOFFICE=1, so there they fail instead.
 */
import { execFileSync } from "node:child_process";
import { readdirSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import ExcelJS from "exceljs";
import JSZip from "jszip";
import { describe, expect, it } from "vitest";
import { DEMO_FILE } from "../demo/build";
import { ABOUT_SHEET } from "../headless/handoff";
import { recalculate, savedWithoutAddinNotice } from "../workbook/recalc";
import { readWorkbook } from "../headless/readXlsx";
import { nappe, relativeError, tempDir } from "./helpers";
import { convert, noticeIfMissing, readCsv, soffice } from "./fixtures/libreoffice";

const root = join(__dirname, "..");

noticeIfMissing("the tests against a second spreadsheet engine");

function csvCell(rows: string[][], address: string): string {
  const m = /^([A-Z]+)(\d+)$/.exec(address)!;
  const col = [...m[1]].reduce((n, ch) => n * 26 + ch.charCodeAt(0) - 64, 0);
  return rows[Number(m[2]) - 1]?.[col - 1] ?? "";
}

function pdfPages(path: string): number {
  return (readFileSync(path, "latin1").match(/\/Type\s*\/Page[^s]/g) ?? []).length;
}

describe.skipIf(!soffice)("LibreOffice, a second spreadsheet engine", () => {
  it("opens the demo workbook and prints it on one page per sheet", () => {
    const dir = tempDir();
    convert([join(root, "demo", DEMO_FILE)], "pdf", dir);
    const pdf = join(dir, DEMO_FILE.replace(/\.xlsx$/, ".pdf"));
    expect(pdfPages(pdf)).toBe(5); // Summary, Inputs, Calc, Pump, Envelope: each fits one page at its print scale
  });

  it("prints the demo on one page per sheet on Letter paper too", async () => {
    const dir = tempDir();
    const book = new ExcelJS.Workbook();
    await book.xlsx.readFile(join(root, "demo", DEMO_FILE));
    book.eachSheet((ws) => (ws.pageSetup.paperSize = 1 as ExcelJS.PageSetup["paperSize"])); // 1: Letter (ECMA-376 paperSize)
    const letter = join(dir, "letter.xlsx");
    await book.xlsx.writeFile(letter);
    convert([letter], "pdf", dir);
    const pdf = readFileSync(join(dir, "letter.pdf"), "latin1");
    expect(pdfPages(join(dir, "letter.pdf"))).toBe(5);
    expect(pdf).toMatch(/\/MediaBox\s*\[\s*0 0 612 792\s*\]/); // US Letter, 8.5 × 11 in
  });

  it("opens the hand-off copy with Nappe's values, recomputing the plain formulas that read them", async () => {
    const dir = tempDir();
    const copy = join(dir, "handoff.xlsx");
    const r = await nappe("handoff", join(root, "demo", DEMO_FILE), "--out", copy);
    expect(r.code).toBe(0);
    // No NAPPE or _xldudf_ formula anywhere in the copy.
    const zip = await JSZip.loadAsync(readFileSync(copy));
    const sheets = await Promise.all(Object.keys(zip.files).filter((p) => /^xl\/worksheets\/sheet\d+\.xml$/.test(p)).map((p) => zip.file(p)!.async("string")));
    for (const xml of sheets) expect(xml).not.toMatch(/<f[^>]*>[^<]*(NAPPE|_xldudf_)/i);
    expect(Object.keys(zip.files).some((p) => p.includes("webextension"))).toBe(false);
    convert([copy], "csv", dir);
    expect(readdirSync(dir)).toContain(`handoff-${ABOUT_SHEET}.csv`);
    const calc = readCsv(join(dir, "handoff-Calc.csv"));
    const nappeValues = recalculate(await readWorkbook(join(root, "demo", DEMO_FILE)), { all: true });
    let compared = 0;
    for (const cell of nappeValues.cells.filter((x) => x.sheet === "Calc")) {
      const want = Array.isArray(cell.value) ? cell.value[0][0] : cell.value;
      if (typeof want !== "number") continue;
      const got = Number(csvCell(calc, cell.address));
      expect(relativeError(got, want), `Calc!${cell.address}: LibreOffice ${csvCell(calc, cell.address)}, Nappe ${want}`).toBeLessThan(1e-9);
      compared++;
    }
    expect(compared).toBeGreaterThan(30);
    // The note keeps the formula and the result with its unit.
    const book = new ExcelJS.Workbook();
    await book.xlsx.readFile(copy);
    expect(String(book.getWorksheet("Calc")!.getCell("B21").note)).toMatch(/=NAPPE\.HEADLOSS\(B11&" m\^3\/h", B16, Inputs!B14, B18, B6\)\nResult: [\d.]+ m/);
    expect(book.worksheets[0].name).toBe(ABOUT_SHEET);
    expect(book.worksheets.at(-1)!.name).toBe("Nappe audit");
  });

  it("opens the audit workbook, one page wide", async () => {
    const dir = tempDir();
    const r = await nappe("audit", join(root, "demo", DEMO_FILE), "--html", join(dir, "a.html"), "--xlsx", join(dir, "audit.xlsx"));
    expect(r.code).toBe(0);
    convert([join(dir, "audit.xlsx")], "pdf", dir);
    const pdf = readFileSync(join(dir, "audit.pdf"), "latin1");
    // Landscape pages only (MediaBox wider than tall), as many as the rows need.
    const boxes = [...pdf.matchAll(/\/MediaBox\s*\[\s*0 0 ([\d.]+) ([\d.]+)\s*\]/g)].map((m) => [Number(m[1]), Number(m[2])]);
    expect(boxes.length).toBeGreaterThan(0);
    for (const [w, h] of boxes) expect(w).toBeGreaterThan(h);
    // 34 formulas with their derivations, printed at 7 pt or more (the test below): about 20 pages.
    expect(pdfPages(join(dir, "audit.pdf"))).toBeLessThan(30);
  });

  it("prints the demo, the hand-off copy and the audit workbook with no text under 7 pt on any page", async () => {
    const dir = tempDir();
    const copy = join(dir, "handoff.xlsx");
    expect((await nappe("handoff", join(root, "demo", DEMO_FILE), "--out", copy)).code).toBe(0);
    expect((await nappe("audit", join(root, "demo", DEMO_FILE), "--html", join(dir, "a.html"), "--xlsx", join(dir, "audit.xlsx"))).code).toBe(0);
    const demo = join(dir, DEMO_FILE);
    writeFileSync(demo, readFileSync(join(root, "demo", DEMO_FILE)));
    convert([demo, copy, join(dir, "audit.xlsx")], "pdf", dir);
    for (const name of [DEMO_FILE.replace(/\.xlsx$/, ".pdf"), "handoff.pdf", "audit.pdf"]) {
      // Each word's box from poppler's pdftotext -bbox. A word's box is 1.3 times its font size
      // (measured here: 11 pt text printed at 100 % gives boxes 14.3 pt tall), so 7 pt is 9.1.
      execFileSync("pdftotext", ["-bbox", join(dir, name), join(dir, `${name}.html`)]);
      const pages = readFileSync(join(dir, `${name}.html`), "utf8").split("<page ").slice(1);
      pages.forEach((page, i) => {
        const heights = [...page.matchAll(/yMin="([\d.]+)" xMax="[\d.]+" yMax="([\d.]+)">([^<]*)</g)].map((m) => ({ h: Number(m[2]) - Number(m[1]), word: m[3] }));
        const smallest = heights.reduce((a, b) => (b.h < a.h ? b : a), { h: Infinity, word: "" });
        expect(smallest.h / 1.3, `${name} page ${i + 1}: "${smallest.word}" at ${(smallest.h / 1.3).toFixed(1)} pt`).toBeGreaterThanOrEqual(7);
      });
    }
    // No header cut: every word of the Envelope sheet's headings is printed whole on the hand-off copy's page of it.
    const pages = readFileSync(join(dir, "handoff.pdf.html"), "utf8").split("<page ").slice(1);
    const envelopePage = pages.find((p) => p.includes(">Envelope</word>"))!; // the footer names the sheet
    const words = new Set([...envelopePage.matchAll(/>([^<]+)<\/word>/g)].map((m) => m[1].replace(/&amp;/g, "&")));
    const values = recalculate(await readWorkbook(join(root, "demo", DEMO_FILE)), { all: true });
    const headings = ["A4", "A11", "A19", "A26", "A30"].flatMap((a) => {
      const v = values.valueOf("Envelope", a);
      return Array.isArray(v) ? v[0].map(String) : [];
    });
    // A word may wrap at its hyphen (End-of- / curve): its parts are then printed whole.
    const printed = (w: string) => words.has(w) || (w.includes("-") && w.split("-").every((part) => !part || [...words].some((x) => x.includes(part))));
    const cut = headings.flatMap((h) => h.split(/\s+/).filter((w) => w && !printed(w)).map((w) => `${w} (of "${h}")`));
    expect(cut).toEqual([]);
  });

  it("shows no number with more than 6 significant figures in the hand-off copy or the demo, but in their Exact columns", async () => {
    const dir = tempDir();
    const copy = join(dir, "handoff.xlsx");
    expect((await nappe("handoff", join(root, "demo", DEMO_FILE), "--out", copy)).code).toBe(0);
    const demo = join(dir, "demo.xlsx");
    writeFileSync(demo, readFileSync(join(root, "demo", DEMO_FILE)));
    // Values as shown (the ninth field of the filter: true), every sheet.
    execFileSync(soffice!, [`-env:UserInstallation=file://${join(dir, ".profile")}`, "--headless", "--norestore", "--convert-to", "csv:Text - txt - csv (StarCalc):44,34,UTF8,1,,0,false,true,true,false,false,-1", "--outdir", dir, copy, demo], { stdio: "pipe", timeout: 180_000 });
    const files = readdirSync(dir).filter((f) => f.endsWith(".csv"));
    expect(files.length).toBeGreaterThan(10);
    const long: string[] = [];
    for (const f of files) {
      const rows = readCsv(join(dir, f));
      const exact = new Set(rows.flatMap((r) => r.map((c, j) => (/^exact$/i.test(c.trim()) ? j : -1)).filter((j) => j >= 0)));
      rows.forEach((r, i) =>
        r.forEach((c, j) => {
          if (exact.has(j)) return;
          for (const m of c.matchAll(/\d[\d.]*(?:[eE][+-]?\d+)?/g)) {
            const digits = m[0].split(/[eE]/)[0].replace(/\D/g, "").replace(/^0+/, "");
            if (digits.length > 6 && !/^\d{4}-\d{2}-\d{2}/.test(c)) long.push(`${f} row ${i + 1}, column ${j + 1}: ${c.slice(0, 60)}`);
          }
        }),
      );
    }
    expect(long).toEqual([]);
  });

  it("computes the plain formulas Nappe's engine supports to the same values", async () => {
    // Written with no cached values: LibreOffice must compute each one itself. (LET is checked
    // against worked values in storedForm.test.ts: LibreOffice 7.4, Debian 12's, lacks it.)
    const book = new ExcelJS.Workbook();
    const ws = book.addWorksheet("Plain");
    const data = [3, -1.5, 8, 0.25, 12, "text", null, 5];
    data.forEach((v, i) => (ws.getCell(`A${i + 1}`).value = v));
    const formulas = [
      "SUM(A1:A8)", "MIN(A1:A8)", "MAX(A1:A8)", "AVERAGE(A1:A8)", "ABS(A2)", "SQRT(A3)", "PI()", "ROUND(A4*7.3,2)", 'IF(A1>2,"big","small")',
      "MATCH(8,A1:A5,0)", "INDEX(A1:A8,3)", "COUNT(A1:A8)", "COUNTA(A1:A8)", "MEDIAN(A1:A5)", "_xlfn.STDEV.S(A1:A5)", "STDEV(A1:A5)",
      "A1&\" m\"", "A3^2/4", "(A1+A3)*A2", "A5>=12", "MIN(A1,A2,-7)", "MAX(A3:A5)*2", "MATCH(4,A1:A1,1)", "ROUNDUP(A4*7.3,1)", "INT(-2.5)", "MOD(17,5)",
      "LN(A3)", "LOG10(1000)", "EXP(1)", "POWER(2,10)", "SUMPRODUCT(A1:A3,A3:A5)", "AND(A1>0,A3>0)", "OR(A2>0,A3<0)", "_xlfn.IFS(A1>5,1,A1>2,2,TRUE,3)",
      '_xlfn.CONCAT("a",A1)', "IFERROR(1/0,-1)", "ATAN2(1,1)", "DEGREES(PI())", "TRUNC(-2.7)",
    ];
    formulas.forEach((f, i) => (ws.getCell(`C${i + 1}`).value = { formula: f }));
    const dir = tempDir();
    const path = join(dir, "plain.xlsx");
    writeFileSync(path, Buffer.from(await book.xlsx.writeBuffer()));
    const ours = recalculate(await readWorkbook(path), { all: true });
    convert([path], "csv", dir);
    const theirs = readCsv(join(dir, "plain-Plain.csv"));
    formulas.forEach((f, i) => {
      const mine = ours.valueOf("Plain", `C${i + 1}`);
      const lo = csvCell(theirs, `C${i + 1}`);
      if (typeof mine === "number") expect(relativeError(mine, Number(lo)), `${f}: Nappe ${mine}, LibreOffice ${lo}`).toBeLessThan(1e-12);
      else expect(String(mine).toUpperCase(), f).toBe(lo.toUpperCase());
    });
  });

  it("reads a workbook LibreOffice saved (lower-case _xldudf_nappe_ calls) like the demo", async () => {
    const saved = recalculate(await readWorkbook(join(root, "test/fixtures/libreoffice-saved.xlsx")));
    const demo = recalculate(await readWorkbook(join(root, "demo", DEMO_FILE)));
    expect(saved.counts.nappe).toBe(34);
    expect(saved.cells.map((x) => [x.sheet, x.address, x.formula.replace(/\s+/g, ""), x.value])).toEqual(demo.cells.map((x) => [x.sheet, x.address, x.formula.replace(/\s+/g, ""), x.value]));
    // LibreOffice had no add-in, so it cached #NAME? in every NAPPE cell: said once, and the rest audited as the demo is.
    expect(saved.counts.savedWithoutAddin).toBe(34);
    expect(savedWithoutAddinNotice(saved.counts)).toBe("Every NAPPE formula (34) was saved where the add-in was not loaded (the file caches #NAME?, as LibreOffice or Excel without Nappe leave it): recalculated here, not compared with the cache.");
    expect(saved.cells.map((x) => [x.address, x.status, x.messages])).toEqual(demo.cells.map((x) => [x.address, x.status, x.messages]));
  });
});

// The fixture needs no LibreOffice to be read: keep one check that runs everywhere.
describe("the LibreOffice-saved fixture", () => {
  it("is in LibreOffice's stored form", async () => {
    const zip = await JSZip.loadAsync(readFileSync(join(root, "test/fixtures/libreoffice-saved.xlsx")));
    const xml = await zip.file("xl/worksheets/sheet3.xml")!.async("string");
    expect(xml).toMatch(/_xldudf_nappe_headloss\(/);
  });
});

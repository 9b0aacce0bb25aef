/**
 * The cross-check on hand-calculation workbooks as engineers keep them (test/fixtures/handSheets.ts:
 * one clean book, slips planted in the others, each book's expected diagnosis written down before
 * the code). Every book is read as Excel saves it (dotted and stored form, with and without cached
 * values) and as LibreOffice saves it; the kept check is diagnosed headless, the hand formula is
 * cross-checked as the pane does, and Nappe's value is compared with the independent reference
 * (test/reference/hand_sheets_reference.py: IAPWS-IF97 by python3-iapws, Colebrook by mpmath).
 */
import { mkdirSync, readFileSync, writeFileSync } from "node:fs";
import ExcelJS from "exceljs";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { readWorkbook } from "../headless/readXlsx";
import { renderText } from "../headless/render";
import { renderHtml } from "../headless/renderHtml";
import { auditSheetRows, buildAudit } from "../workbook/audit";
import { crossCheckHand, type Diagnosis, diagnoseKeptCheck } from "../workbook/crossCheck";
import { labelSource, parseAddress, type WorkbookModel } from "../workbook/model";
import { recalculate, type RecalcResult, savedWithoutAddinNotice, summaryLine } from "../workbook/recalc";
import { HAND_BOOKS, HAND_REFERENCE, type HandBook, handBookBytes } from "./fixtures/handSheets";
import { convert, noticeIfMissing, soffice } from "./fixtures/libreoffice";
import { nappe, relativeError, tempDir } from "./helpers";

type Variant = "dotted" | "stored" | "cached" | "libreoffice";

const dir = tempDir();
const books = new Map<string, WorkbookModel>();

function key(book: HandBook, variant: Variant) {
  return `${book.id}.${variant}`;
}

beforeAll(async () => {
  noticeIfMissing("the hand-sheet checks of copies saved by LibreOffice");
  for (const book of HAND_BOOKS) {
    const dotted = join(dir, `${book.id}.xlsx`);
    writeFileSync(dotted, await handBookBytes(book));
    books.set(key(book, "dotted"), await readWorkbook(dotted));
    const stored = join(dir, `${book.id}.stored.xlsx`);
    writeFileSync(stored, await handBookBytes(book, { stored: true }));
    books.set(key(book, "stored"), await readWorkbook(stored));
    // Cached as Excel saves it: every formula cell holds its value.
    const values = recalculate(books.get(key(book, "dotted"))!, { all: true });
    const cached = join(dir, `${book.id}.cached.xlsx`);
    writeFileSync(cached, await handBookBytes(book, { stored: true, cached: (sheet, address) => values.valueOf(sheet, address) }));
    books.set(key(book, "cached"), await readWorkbook(cached));
  }
  if (soffice) {
    const out = join(dir, "saved-by-libreoffice");
    mkdirSync(out);
    convert(HAND_BOOKS.map((b) => join(dir, `${b.id}.xlsx`)), "xlsx", out);
    for (const book of HAND_BOOKS) books.set(key(book, "libreoffice"), await readWorkbook(join(out, `${book.id}.xlsx`)));
  }
}, 300_000);

function checkOf(result: RecalcResult, book: HandBook) {
  const cell = result.cells.find((c) => c.sheet === "Calc" && c.address === book.check)!;
  const diagnosis = cell.calls.find((c) => c.id === "CROSSCHECK")?.diagnosis;
  return { cell, diagnosis: diagnosis! };
}

function expectDiagnosis(d: Diagnosis, want: HandBook["expect"], label: string) {
  const text = d.lines.join("\n");
  expect(d.verdict, `${label}\n${text}`).toBe(want.verdict);
  if (want.first === "result") expect(d.departures, `${label}\n${text}`).toEqual([]);
  else if (want.first) expect(d.departures[0]?.symbol, `${label}\n${text}`).toBe(want.first);
  if (want.cause) expect(d.causes.join("\n"), `${label}\n${text}`).toMatch(want.cause);
  else expect(d.causes, `${label}: a clean book names no cause\n${text}`).toEqual([]);
  if (want.note) expect([...d.notes, ...d.incomplete].join("\n"), `${label}\n${text}`).toMatch(want.note);
  // In the user's units: the departing step and the headline in the hand sheet's system.
  if (want.unit) {
    expect(d.headline, label).toContain(` ${want.unit}`);
    if (d.departures[0] && !["Re", "ε/D", "f"].includes(d.departures[0].symbol)) expect(d.departures[0].hand.endsWith(want.unit === "ft" ? "ft" : "") || /ft/.test(d.departures[0].hand) === (want.unit === "ft"), `${label}: ${d.departures[0].hand}`).toBe(true);
  }
  // Shown figures that recompute: (hand − Nappe)/Nappe from the shown numbers gives the shown difference to its figures.
  const m = /hand (-?[\d.]+)[^,]*, Nappe (-?[\d.]+)[^,]*, difference ([+-]?[\d.]+) %/.exec(d.headline);
  if (m && Math.abs(d.relativeDifference) > 1e-9) expect(Math.abs(((Number(m[1]) - Number(m[2])) / Number(m[2])) * 100 - Number(m[3])), `${label}: ${d.headline}`).toBeLessThan(Math.abs(Number(m[3])) * 0.02 + 1e-9);
}

describe("hand-calculation workbooks with planted slips", () => {
  for (const book of HAND_BOOKS) {
    for (const variant of ["dotted", "stored", "cached", "libreoffice"] as Variant[]) {
      it.skipIf(variant === "libreoffice" && !soffice)(`${book.id} (${book.system}; ${book.slip || "clean"}), ${variant}: the kept check's diagnosis, headless`, () => {
        const wb = books.get(key(book, variant))!;
        const result = recalculate(wb, { diagnose: diagnoseKeptCheck });
        const { cell, diagnosis } = checkOf(result, book);
        expectDiagnosis(diagnosis, book.expect, `${book.id} ${variant}`);
        // Nappe's value against the independent reference (Python: IAPWS-IF97, mpmath Colebrook, NIST SP 811).
        const ref = HAND_REFERENCE[book.id];
        expect(relativeError(diagnosis.nappe, ref.result), `${book.id}: Nappe ${diagnosis.nappe} ${diagnosis.unit}, reference ${ref.result} ${ref.unit}`).toBeLessThan(5e-5);
        // One status: warning whenever the verdict is not "agrees", ok for the clean books.
        expect(cell.status, cell.messages.join("\n")).toBe(book.expect.verdict === "agrees" ? "ok" : "warning");
        if (variant === "libreoffice") {
          // LibreOffice had no add-in: every NAPPE cell cached as #NAME?, said once; never counted as errors.
          expect(result.counts.savedWithoutAddin).toBe(result.counts.nappe);
          expect(savedWithoutAddinNotice(result.counts)).toMatch(/saved where the add-in was not loaded/);
          expect(result.cells.filter((c) => c.status === "error")).toEqual([]);
          // The hand value as LibreOffice computed and cached it: a second engine for the hand side.
          const { row, col } = parseAddress(book.hand);
          const cachedByLibreOffice = wb.sheets.find((x) => x.name === "Calc")!.cells.get(`${row}:${col}`)!.value as number;
          expect(relativeError(diagnosis.hand, cachedByLibreOffice), `${book.id}: hand ${diagnosis.hand}, LibreOffice ${cachedByLibreOffice}`).toBeLessThan(1e-9);
        } else expect(savedWithoutAddinNotice(result.counts)).toBeUndefined();
      });
    }
    it(`${book.id}: the pane's cross-check of the hand formula, mapped from its precedents`, () => {
      const wb = books.get(key(book, "dotted"))!;
      const result = recalculate(wb, { all: true });
      const src = { wb, value: (s: string, r: number, c: number) => result.valueOf(s, `${String.fromCharCode(64 + c)}${r}`) };
      const tolerance = Number(/,\s*([\d.]+)\)$/.exec(book.sheets[1].rows.find((r) => String(r[1]).includes("CROSSCHECK"))![1] as string)![1]);
      const want = book.pane ?? book.expect;
      if (book.id.endsWith("-si") && book.spec === "HEADLOSS") {
        // "Straight pipe, total (m)" is outside the word list: the length must be pointed at by hand.
        expect(() => crossCheckHand(src, "Calc", book.hand, book.spec, { tolerance })).toThrow(/^length: no cell the hand formula reads is labelled as one; point it at a cell/);
        const d = crossCheckHand(src, "Calc", book.hand, book.spec, { tolerance, mapping: { length: "Inputs!B3" } });
        expectDiagnosis(d, { ...want, note: undefined }, `${book.id} pane`);
        expect(d.inputs.find((x) => x.name === "length")).toMatchObject({ from: "Inputs!B3", how: "by hand" });
        // The check it keeps carries the mapping by hand.
        expect(d.keepFormula).toContain('Inputs!B3&" m"');
        return;
      }
      const d = crossCheckHand(src, "Calc", book.hand, book.spec, { tolerance });
      expectDiagnosis(d, want, `${book.id} pane`);
    });
  }
});

describe("the walk of a hand formula", () => {
  it("finds a slip held in a labelled constant cell nine precedents deep (the old walk stopped at four)", async () => {
    const book = HAND_BOOKS.find((b) => b.id === "g981-si")!;
    // g reaches the velocity head through seven copies: Calc!B20 = Inputs!B7, B21 = B20, … B26 = B25.
    const calc = book.sheets[1].rows.map((r) => [...r] as [string, string | number]);
    for (let i = 0; i < 7; i++) calc[19 + i] = [`copy ${i + 1}`, i === 0 ? "=Inputs!B7" : `=B${19 + i}`];
    for (let i = 18; i < 19; i++) calc[i] = ["", ""];
    calc[15] = ["Velocity head (m)", "=B4^2/(2*B26)"];
    const deep: HandBook = { ...book, sheets: [book.sheets[0], { name: "Calc", rows: calc.map((r) => r ?? ["", ""]) }] };
    const path = join(dir, "deep.xlsx");
    writeFileSync(path, await handBookBytes(deep));
    const { diagnosis } = checkOf(recalculate(await readWorkbook(path), { diagnose: diagnoseKeptCheck }), deep);
    expect(diagnosis.departures[0].symbol).toBe("V²/2g");
    expect(diagnosis.causes.join("\n")).toMatch(/g = 9\.81 m\/s² in Inputs!B7/);
  });

  it("names a cycle in the hand calculation", () => {
    // Values as Excel's iterative calculation left them; the formulas read each other.
    const wb: WorkbookModel = {
      sheets: [
        {
          name: "Hand",
          cells: new Map([
            ["1:1", { sheet: "Hand", address: "A1", row: 1, col: 1, value: "Flow (m³/s)" }],
            ["1:2", { sheet: "Hand", address: "B1", row: 1, col: 2, value: 0.02 }],
            ["2:1", { sheet: "Hand", address: "A2", row: 2, col: 1, value: "Diameter (m)" }],
            ["2:2", { sheet: "Hand", address: "B2", row: 2, col: 2, value: 0.1 }],
            ["3:1", { sheet: "Hand", address: "A3", row: 3, col: 1, value: "Velocity (m/s)" }],
            ["3:2", { sheet: "Hand", address: "B3", row: 3, col: 2, value: 2.546479, formula: "B1/(PI()*B2^2/4)+0*B4" }],
            ["4:1", { sheet: "Hand", address: "A4", row: 4, col: 1, value: "guess" }],
            ["4:2", { sheet: "Hand", address: "B4", row: 4, col: 2, value: 2.546479, formula: "B3" }],
          ]),
        },
      ],
    };
    const d = crossCheckHand({ wb, value: (_sheet, r, c) => wb.sheets[0].cells.get(`${r}:${c}`)?.value ?? null }, "Hand", "B3", "VELOCITY");
    expect(d.cycles.join("\n")).toMatch(/B4 → B3 → B4|B3 → B4 → B3/);
    expect(d.lines.join("\n")).toMatch(/^Cycle: /m);
  });
});

describe("one diagnosis, every view", () => {
  it("the text, HTML and audit sheet name the first departing step and the cause in the user's units", () => {
    const book = HAND_BOOKS.find((b) => b.id === "g322-us")!;
    const wb = books.get(key(book, "dotted"))!;
    const result = recalculate(wb, { diagnose: diagnoseKeptCheck });
    const report = buildAudit(result.cells, { title: "t", source: "g322-us.xlsx", found: summaryLine(result.counts, result.cells), workbook: wb }, labelSource(wb));
    const first = /First step that departs: B16 V²\/2g \(velocity head\) 0\.88764\d* ft vs Nappe 0\.88836\d* ft, -0\.0805 %/;
    const cause = /Likely cause: g = 32\.2 ft\/s² in Inputs!B6 \("g \(ft\/s²\)"\) instead of standard gravity 32\.174 ft\/s²/;
    for (const [name, text] of [
      // The text file is fitted to 80 columns: its wrapped lines joined again.
      ["text", renderText(report).replace(/\n\s+/g, " ")],
      ["html", renderHtml(report).replace(/&quot;/g, '"').replace(/&#39;/g, "'")],
      ["sheet", auditSheetRows(report).rows.flat().join("\n")],
    ]) {
      expect(text, name).toMatch(first);
      expect(text, name).toMatch(cause);
    }
    expect(report.found).toBe("1 NAPPE formula found in 18 formulas (1 recalculated): 0 ok, 1 warning, 0 error");
  });

  it("the hand-off copy's note and the three commands say the same: one diagnosis, one count", async () => {
    const book = HAND_BOOKS.find((b) => b.id === "density-text-si")!;
    const file = join(dir, `${book.id}.xlsx`);
    const out = join(dir, "handoff.xlsx");
    const recalc = await nappe("recalc", file);
    const audit = await nappe("audit", file, "--html", join(dir, "a.html"), "--xlsx", join(dir, "a.xlsx"), "--text", join(dir, "a.txt"));
    const handoff = await nappe("handoff", file, "--out", out);
    const line = "1 NAPPE formula found in 4 formulas (1 recalculated): 0 ok, 1 warning, 0 error";
    for (const r of [recalc, audit, handoff]) expect(r.stdout).toContain(line);
    // The check as written agrees (0.18 %, water at 20 °C): the diagnosis, with the workbook's 60 °C, does not.
    expect(recalc.stdout.replace(/\n\s+/g, " ")).toMatch(/Differs: hand 12\.75\d* kW, Nappe 12\.54\d* kW, difference \+1\.71 %/);
    const copy = new ExcelJS.Workbook();
    await copy.xlsx.readFile(out);
    const note = copy.getWorksheet("Calc")!.getCell(book.check).note;
    const text = typeof note === "string" ? note : (note as { texts: { text: string }[] }).texts.map((t) => t.text).join("");
    expect(text).toMatch(/Status: warning/);
    expect(text).toMatch(/First step that departs: B2 P_h \(hydraulic power ρgQH\)/);
    expect(text).toMatch(/Nappe took the density of water at 60 °C from Inputs!B4/);
    expect(readFileSync(join(dir, "a.txt"), "utf8")).toContain(line);
  });
});

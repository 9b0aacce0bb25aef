/**
 * The formula engine against Microsoft's documented behaviour of Excel, where LibreOffice 7.4 (the
 * second engine of test/differential.test.ts) lacks a function or computes it otherwise: each
 * value worked out by hand from the page named beside it (test/fixtures/excelCases.ts). Also the
 * silent wrong values the engine once gave, values that no function can change, formulas filled
 * down a column sharing one parse, and coverage: every function README lists has a case here or
 * in the differential test.
 */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { recalculate } from "../workbook/recalc";
import { supportedFunctions } from "../workbook/formula/functions/index";
import { matchesTemplate, shapeKey, shapeText } from "../workbook/formula/shapes";
import { lex } from "../workbook/formula/lexer";
import { XArray } from "../workbook/formula/values";
import { readWorkbook } from "../headless/readXlsx";
import { shiftFormula } from "../workbook/storedForm";
import type { CellValue } from "../workbook/model";
import { DATA, DOC_CASES, DOC_EXTRA, LO_CASES, modelWith } from "./fixtures/excelCases";
import { c, row, xlsxPackage } from "./fixtures/package";
import { tempDir } from "./helpers";
import { writeFileSync } from "node:fs";
import ExcelJS from "exceljs";

const root = join(__dirname, "..");

function same(got: unknown, want: CellValue): boolean {
  if (typeof want === "number") return typeof got === "number" && Math.abs(got - want) <= Math.max(1e-12, 1e-9 * Math.abs(want));
  return got === want;
}

describe("values Microsoft's documentation gives", () => {
  // The cases from row 20 down: an implicit intersection with a column of the data (rows 2 to 9) would find a cell.
  const calc: Record<string, { f?: string; v?: CellValue; array?: string }> = { ...DOC_EXTRA };
  DOC_CASES.forEach((k, i) => {
    const [rows, cols] = k.array ?? [1, 1];
    calc[`A${20 + i * 6}`] = { f: k.f, ...(k.array ? { array: `A${20 + i * 6}:${String.fromCharCode(64 + cols)}${20 + i * 6 + rows - 1}` } : {}) };
  });
  const result = recalculate(modelWith(calc), { all: true });
  DOC_CASES.forEach((k, i) => {
    it(`=${k.f} gives ${JSON.stringify(k.want)} (${k.page})`, () => {
      const at = 20 + i * 6;
      if (Array.isArray(k.want)) {
        const got = k.want.map((r, dr) => r.map((_, dc) => result.valueOf("Calc", `${String.fromCharCode(65 + dc)}${at + dr}`)));
        const flat = (x: unknown[][]) => x.map((r) => r.map((v) => (Array.isArray(v) ? v[0]?.[0] : v)));
        const g = flat(got);
        const ok = k.want.every((r, dr) => r.every((w, dc) => same(g[dr][dc], w)));
        expect(ok ? k.want : g).toEqual(k.want);
      } else {
        const v = result.valueOf("Calc", `A${at}`);
        const got = Array.isArray(v) ? v[0]?.[0] : v;
        expect(same(got, k.want) ? k.want : got).toEqual(k.want);
      }
    });
  });
});

describe("no silent wrong values (each failed on the formula engine before our own)", () => {
  const data = { A2: { v: 10 }, A3: { v: 15 }, A4: { v: 20 }, A5: { v: 25 }, A6: { v: 30 }, B2: { v: 12.5 }, B3: { v: 21 }, B4: { v: 28.4 }, B5: { v: 17.6 }, B6: { v: 12 } };
  it("formulas over the same ranges in neighbouring cells: one cannot change what the next reads", () => {
    const r = recalculate(
      modelWith({
        ...data,
        D1: { f: "SUMPRODUCT(A2:A6,B2:B6)" },
        D2: { f: 'SUMIF(A2:A6,">15",B2:B6)' },
        D3: { f: "INDEX(B2:B6,MATCH(20,A2:A6,0))" },
        D4: { f: "FORECAST(22,B2:B6,A2:A6)" },
        D5: { f: "INTERCEPT(B2:B6,A2:A6)" },
      }),
      { all: true },
    );
    // Worked by hand: Σxy = 125+315+568+440+360; SUMIF over 20, 25, 30; least squares of y on x.
    expect(r.valueOf("Calc", "D1")).toBe(1808);
    expect(r.valueOf("Calc", "D2")).toBeCloseTo(28.4 + 17.6 + 12, 12);
    expect(r.valueOf("Calc", "D3")).toBe(28.4);
    const xs = [10, 15, 20, 25, 30];
    const ys = [12.5, 21, 28.4, 17.6, 12];
    const mx = 20;
    const my = ys.reduce((a, b) => a + b) / 5;
    const slope = xs.reduce((s, x, i) => s + (x - mx) * (ys[i] - my), 0) / xs.reduce((s, x) => s + (x - mx) ** 2, 0);
    expect(r.valueOf("Calc", "D4")).toBeCloseTo(my + slope * (22 - mx), 12);
    expect(r.valueOf("Calc", "D5")).toBeCloseTo(my - slope * mx, 12);
  });
  it("reads TRUE and FALSE typed in any case", () => {
    const r = recalculate(modelWith({ A1: { f: "IF(true,1,2)" }, A2: { f: "IF(False,1,2)" }, A3: { f: "tRUE+1" } }), { all: true });
    expect([r.valueOf("Calc", "A1"), r.valueOf("Calc", "A2"), r.valueOf("Calc", "A3")]).toEqual([1, 2, 2]);
  });
  it("evaluates a formula stored as an array formula as an array; a plain one keeps implicit intersection", () => {
    const r = recalculate(
      modelWith({
        ...data,
        D8: { f: "SUM(B2:B6*(A2:A6>15))", array: "D8" },
        D9: { f: "MAX(IF(A2:A6>15,B2:B6))", array: "D9" },
        D10: { f: "SUM(B2:B6*(A2:A6>15))" },
        D4: { f: "B2:B6*2" },
      }),
      { all: true },
    );
    expect(r.valueOf("Calc", "D8")).toBeCloseTo(58, 12);
    expect(r.valueOf("Calc", "D9")).toBe(28.4);
    // "Implicit intersection operator: @": row 10 does not cross rows 2 to 6; row 4 does.
    expect(r.valueOf("Calc", "D10")).toBe("#VALUE!");
    expect(r.valueOf("Calc", "D4")).toBe(56.8);
  });
  it("computes the functions engineers use that the old engine lacked or stubbed", () => {
    const formulas = ["_xlfn.XLOOKUP(20,A2:A6,B2:B6)", "_xlfn.XMATCH(25,A2:A6)", "CHOOSE(2,5,6)", '_xlfn.SWITCH(2,1,"a",2,"b")', 'VALUE("12.5")', '_xlfn.TEXTJOIN("/",TRUE,A2:A3)', "SLOPE(B2:B6,A2:A6)", "RSQ(B2:B6,A2:A6)", "SUM(TREND(B2:B6,A2:A6))", "INDEX(LINEST(B2:B6,A2:A6),1)", 'CONVERT(1,"ft","m")', "SUM(OFFSET(A2,0,1,2,1))", 'INDIRECT("B3")', "NPV(0.1,100,100)", "PV(0.1,2,-100)", "FV(0.1,2,-100)", "PMT(0.1,2,100)", "IRR({-100,60,60})", '_xlfn.MAXIFS(B2:B6,A2:A6,">15")', '_xlfn.MINIFS(B2:B6,A2:A6,">15")', "ROWS(_xlfn._xlws.FILTER(A2:A6,B2:B6>15))", "SUM(_xlfn.SEQUENCE(3))"];
    const calc: Record<string, { f?: string; v?: CellValue }> = { ...data };
    formulas.forEach((f, i) => (calc[`F${i + 1}`] = { f }));
    const r = recalculate(modelWith(calc), { all: true });
    const got = formulas.map((_, i) => r.valueOf("Calc", `F${i + 1}`));
    for (const [i, v] of got.entries()) expect(typeof v === "string" && /^#/.test(v) ? `${formulas[i]}: ${v}` : "ok").toBe("ok");
    expect(got[0]).toBe(28.4);
    expect(got[10]).toBeCloseTo(0.3048, 15); // NIST SP 811: 1 ft = 0.3048 m exactly
    expect(got[11]).toBeCloseTo(12.5 + 21, 12);
    expect(got[13]).toBeCloseTo(100 / 1.1 + 100 / 1.21, 12); // NPV's page: Σ value/(1+rate)^i
    expect(got[18]).toBe(28.4);
    expect(got[19]).toBe(12);
  });
  it("reads INDIRECT's text only as a reference: a function, an operator or a name in it is #REF!, never computed", () => {
    const r = recalculate(modelWith({ A1: { v: 5 }, B1: { f: 'INDIRECT("A1")' }, B2: { f: 'INDIRECT("A1:INDEX(A1:A3,2)")' }, B3: { f: 'INDIRECT("SUM(A1)")' }, B4: { f: 'INDIRECT("A1+1")' }, B5: { f: 'INDIRECT("HeadAt")' }, B6: { f: 'INDIRECT("R0C1",FALSE)' } }), { all: true });
    expect(r.valueOf("Calc", "B1")).toBe(5);
    for (const a of ["B2", "B3", "B4", "B5", "B6"]) expect({ a, v: r.valueOf("Calc", a) }).toEqual({ a, v: "#REF!" });
  });
  it("says which function it does not compute, never a value", () => {
    const r = recalculate(modelWith({ A1: { f: "CUBEVALUE(\"x\")" }, A2: { f: "A1+1" } }), { all: true });
    expect(r.cells.find((x) => x.address === "A1")!.messages.join(" ")).toMatch(/unsupported function CUBEVALUE/);
    expect(r.cells.find((x) => x.address === "A2")!.messages.join(" ")).toMatch(/reads Calc!A1, which failed: unsupported function CUBEVALUE/);
  });
  it("never throws on a number format: TEXT(x, \"£000.00\") is text", () => {
    const r = recalculate(modelWith({ A1: { f: 'TEXT(3.14159,"£000.00")' }, A2: { f: 'TEXT(2,"# ?/?")' } }), { all: true });
    expect(r.valueOf("Calc", "A1")).toBe("£003.14");
    expect(r.cells.find((x) => x.address === "A2")!.messages.join(" ")).toMatch(/fraction formats/);
  });
  it("reads an empty <v></v> after a formula (as openpyxl writes it) as no cached value, not a cached 0", async () => {
    const bytes = await xlsxPackage([{ name: "S", rows: row(1, c("A1", { v: 3 }), c("B1", { f: "A1*2" }).replace("</c>", "<v></v></c>")) }]);
    const path = join(tempDir(), "openpyxl.xlsx");
    writeFileSync(path, bytes);
    const wb = await readWorkbook(path);
    expect(wb.sheets[0].cells.get("1:2")!.value).toBeNull();
    const r = recalculate(wb, { all: true });
    expect(r.cells[0]).toMatchObject({ value: 6, status: "ok", cached: null });
  });
});

describe("one workbook as different programs store it", () => {
  it("gives the same values written by exceljs, with openpyxl's empty <v></v>, and in Excel's stored form", async () => {
    const cases = LO_CASES.filter((k) => !k.array && !/RAND|NOW|TODAY|ISFORMULA/.test(k.f));
    const dir = tempDir();
    // exceljs: formulas with no result.
    const book = new ExcelJS.Workbook();
    for (const [name, rows] of Object.entries(DATA)) {
      const ws = book.addWorksheet(name);
      rows.forEach((r, i) => r.forEach((v, j) => v !== undefined && (ws.getCell(i + 1, j + 1).value = v)));
    }
    const calcSheet = book.addWorksheet("Calc");
    cases.forEach((k, i) => (calcSheet.getCell(i + 1, 1).value = { formula: k.f }));
    const viaExceljs = join(dir, "exceljs.xlsx");
    await book.xlsx.writeFile(viaExceljs);
    // Hand-written XML: Excel's stored form (no cached value), and openpyxl's <v></v>.
    const sheets = (empty: boolean) => [
      ...Object.entries(DATA).map(([name, rows]) => ({ name, rows: rows.map((r, i) => row(i + 1, ...r.flatMap((v, j) => (v === undefined ? [] : [c(`${String.fromCharCode(65 + j)}${i + 1}`, { v: v as never })])))).join("") })),
      { name: "Calc", rows: cases.map((k, i) => row(i + 1, empty ? c(`A${i + 1}`, { f: k.f }).replace("</c>", "<v></v></c>") : c(`A${i + 1}`, { f: k.f }))).join("") },
    ];
    const stored = join(dir, "stored.xlsx");
    const openpyxl = join(dir, "openpyxl.xlsx");
    writeFileSync(stored, await xlsxPackage(sheets(false)));
    writeFileSync(openpyxl, await xlsxPackage(sheets(true)));
    const values = async (path: string) => {
      const r = recalculate(await readWorkbook(path), { all: true });
      return cases.map((k, i) => ({ f: k.f, v: r.valueOf("Calc", `A${i + 1}`) }));
    };
    const a = await values(stored);
    expect(await values(viaExceljs)).toEqual(a);
    expect(await values(openpyxl)).toEqual(a);
    // And none of them is reported as differing from a cached 0.
    const audit = recalculate(await readWorkbook(openpyxl), { all: true });
    expect(audit.cells.filter((x) => x.messages.some((m) => /differs from the value cached/.test(m)))).toEqual([]);
  });
});

describe("values that no function can change", () => {
  it("every case called twice on the same ranges gives the same result, and the ranges read the same after", () => {
    const calc: Record<string, { f?: string; array?: string }> = {};
    const cases = LO_CASES.filter((k) => !k.array && !/RAND|NOW|TODAY/.test(k.f));
    cases.forEach((k, i) => {
      calc[`A${i + 1}`] = { f: k.f };
      calc[`B${i + 1}`] = { f: k.f };
    });
    const before = JSON.stringify(DATA);
    const r = recalculate(modelWith(calc), { all: true });
    cases.forEach((k, i) => expect({ f: k.f, second: r.valueOf("Calc", `B${i + 1}`) }).toEqual({ f: k.f, second: r.valueOf("Calc", `A${i + 1}`) }));
    // The data as formulas read it afterwards.
    for (const [sheet, rows] of Object.entries(DATA)) rows.forEach((cells, ri) => cells.forEach((v, ci) => expect(r.valueOf(sheet, `${String.fromCharCode(65 + ci)}${ri + 1}`)).toEqual(v ?? null)));
    expect(JSON.stringify(DATA)).toBe(before);
  });
  it("freezes the values of a range: a write into them fails", () => {
    const r = recalculate(modelWith({ A1: { f: "SUM(Pumps!A2:B9)" } }), { all: true });
    expect(r.valueOf("Calc", "A1")).toBeCloseTo(DATA.Pumps.slice(1).reduce((s, x) => s + (x[0] as number) + (x[1] as number), 0), 9);
    // XArray's rows are frozen (Object.freeze): assignments are refused in strict mode.
    const a = XArray.of([[1, 2]]);
    expect(() => ((a.data[0] as number[])[0] = 9)).toThrow(TypeError);
    expect(() => (a.data as number[][]).push([3])).toThrow(TypeError);
  });
});

describe("formulas filled down a column share one parse", () => {
  it("a copy at another cell gives what the same text gives parsed afresh there", () => {
    const f = "Pumps!A3*2+SUM(Pumps!B$2:B3)-IF(Pumps!C3>50,1,0)";
    const calc: Record<string, { f?: string }> = {};
    for (let i = 0; i < 6; i++) calc[`A${1 + i}`] = { f: shiftFormula(f, i, 0) };
    const filled = recalculate(modelWith(calc), { all: true });
    for (let i = 0; i < 6; i++) {
      const alone = recalculate(modelWith({ [`A${1 + i}`]: { f: shiftFormula(f, i, 0) } }), { all: true });
      expect(filled.valueOf("Calc", `A${1 + i}`)).toBe(alone.valueOf("Calc", `A${1 + i}`));
    }
    expect(shapeKey(shiftFormula(f, 3, 0), 4, 1)).toBe(shapeKey(f, 1, 1));
  });
  it("matches a formula to another's template exactly when their shape keys are equal", () => {
    const t = shapeText("A5*2+B$1", 5, 3)!;
    expect(matchesTemplate(t, "A6*2+B$1", 6, 3)).toBe(true);
    expect(matchesTemplate(t, "A06*2+B$1", 6, 3)).toBe(false);
    expect(matchesTemplate(t, "a6*2+B$1", 6, 3)).toBe(false);
    expect(matchesTemplate(t, "$A6*2+B$1", 6, 3)).toBe(false);
    expect(matchesTemplate(t, "A66*2+B$1", 6, 3)).toBe(false);
    expect(matchesTemplate(t, "B6*2+C$1", 6, 4)).toBe(true);
    const formulas = LO_CASES.map((k) => k.f);
    let matched = 0;
    for (const f of formulas) {
      const template = shapeText(f, 10, 3);
      if (!template) continue;
      for (const [dr, dc] of [[1, 0], [7, 0], [3, 1]]) {
        const copy = shiftFormula(f, dr, dc);
        const equal = shapeKey(copy, 10 + dr, 3 + dc) === template.key;
        expect({ f, copy, match: matchesTemplate(template, copy, 10 + dr, 3 + dc) }).toEqual({ f, copy, match: equal });
        if (equal) matched++;
      }
    }
    expect(matched).toBeGreaterThan(100);
  });
  it("keeps apart what only looks alike: fixed parts, lower-case references, text and sheet names", () => {
    expect(shapeKey("A1*2", 1, 2)).toBe(shapeKey("A2*2", 2, 2));
    expect(shapeKey("$A1*2", 1, 2)).toBe(shapeKey("$A2*2", 2, 5));
    expect(shapeKey("A$1*2", 1, 2)).not.toBe(shapeKey("A$2*2", 2, 2));
    expect(shapeKey("$A$1", 1, 1)).not.toBe(shapeKey("$A$2", 2, 1));
    expect(shapeKey("a1*2", 1, 2)).not.toBe(shapeKey("a2*2", 2, 2));
    expect(shapeKey('"A1"&A1', 1, 2)).not.toBe(shapeKey('"A2"&A2', 2, 2));
    expect(shapeKey("A1!B1", 1, 1)).not.toBe(shapeKey("A2!B1", 2, 1));
    expect(shapeKey("LOG10(A1)", 1, 2)).toBe(shapeKey("LOG10(A2)", 2, 2));
  });
  it("reads every token of the grammar: errors, arrays, @, #, names, quoted sheets", () => {
    const kinds = lex("=@A1#+{1,2;3,4}+#N/A+'It''s'!B2:C3+_xlpm.x+SUM(A:A,1:2)%".slice(1)).map((t) => t.type);
    for (const k of ["At", "Cell", "Hash", "LBrace", "Semicolon", "Error", "Sheet", "Name", "Func", "Percent"]) expect(kinds, k).toContain(k);
  });
});

describe("the supported list", () => {
  it("has a case for every function README lists, against LibreOffice or a documented value", () => {
    const written = [...LO_CASES, ...DOC_CASES].map((k) => k.f.toUpperCase()).join(" ");
    const missing = Object.values(supportedFunctions())
      .flat()
      .filter((name) => !new RegExp(`(^|[^A-Z0-9_.])(_XLFN\\.)?(_XLWS\\.)?${name.replace(/\./g, "\\.")}\\(`).test(written));
    expect(missing).toEqual([]);
  });
  it("is the list README shows (generated from the code)", () => {
    const readme = readFileSync(join(root, "README.md"), "utf8");
    for (const names of Object.values(supportedFunctions())) for (const n of names) expect(readme).toContain(`\`${n}\``);
  });
});

/**
 * Our formula engine against a real spreadsheet engine, LibreOffice Calc 7.4 (Debian 12's),
 * headless: a workbook of invented engineering tables and more than 500 formulas, stored as
 * Excel stores them (scalar formulas plain; formulas that compute arrays as array formulas with
 * the dynamic-array cell metadata; `_xlfn.` prefixes) and written with no cached values, so
 * LibreOffice computes every one itself. Every value must equal LibreOffice's: numbers to 1e-9
 * relative (1e-12 absolute near zero), text, logicals and error codes exactly.
 *
 * The cases (test/fixtures/excelCases.ts): each supported function at least once, sequences of
 * formulas over the same ranges in neighbouring cells, formulas repeated far apart, and formulas
 * drawn at random from a small grammar (fast-check, seeded) of what LibreOffice and Excel compute
 * alike. What LibreOffice 7.4 lacks or computes otherwise is checked against Microsoft's
 * documentation in test/excelFunctions.test.ts.
 *
 * Needs Debian's libreoffice-calc-nogui (`soffice`); skipped with a notice without it, and
 * `.ci/run` sets NAPPE_REQUIRE_LIBREOFFICE=1 so that there it fails instead.
 */
import { writeFileSync } from "node:fs";
import { join } from "node:path";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { readWorkbook } from "../headless/readXlsx";
import { recalculate } from "../workbook/recalc";
import { addressOf } from "../workbook/model";
import { type Case, DATA, LO_CASES } from "./fixtures/excelCases";
import { c, row, xlsxPackage } from "./fixtures/package";
import { tempDir } from "./helpers";
import { convert, noticeIfMissing, readCsv, soffice } from "./fixtures/libreoffice";

noticeIfMissing("the differential tests of the formula engine");

/** Random formulas from a grammar LibreOffice and Excel compute alike (numbers, comparisons, common functions over the pump table). */
function randomFormulas(count: number, seed: number): string[] {
  const cell = fc.tuple(fc.constantFrom("A", "B", "C", "D", "E"), fc.integer({ min: 2, max: 9 })).map(([col, r]) => `Pumps!${col}${r}`);
  const range = fc.tuple(fc.constantFrom("A", "B", "C", "D", "E"), fc.integer({ min: 2, max: 5 }), fc.integer({ min: 1, max: 4 })).map(([col, r, n]) => `Pumps!${col}${r}:${col}${r + n}`);
  const number = fc.constantFrom("0", "1", "2", "3.5", "0.25", "10", "100", "1.5E+2", "7.25");
  const grammar = fc.letrec<{ expr: string; atom: string; call: string }>((tie) => ({
    atom: fc.oneof(number, cell, cell),
    // Comparisons only as tests (IF, AND): LibreOffice's logicals are numbers, so TRUE<40 or -(A1>0) differ from Excel there.
    expr: fc.oneof({ depthSize: "small" }, tie("atom"), tie("atom"), tie("call"), fc.tuple(tie("expr"), fc.constantFrom("+", "-", "*", "/"), tie("expr")).map(([a, op, b]) => `${a}${op}${b}`), tie("expr").map((a) => `-(${a})`)),
    call: fc.oneof(
      fc.tuple(fc.constantFrom("SUM", "AVERAGE", "MIN", "MAX", "COUNT", "PRODUCT", "MEDIAN", "SUMSQ", "_xlfn.STDEV.S", "_xlfn.VAR.P"), range).map(([f, r]) => `${f}(${r})`),
      fc.tuple(fc.constantFrom("ABS", "INT", "SIGN", "SQRT", "LN"), tie("expr")).map(([f, a]) => `${f}(${a})`),
      tie("expr").map((a) => `EXP(MIN(${a},50))`),
      // POWER's exponent from 1: 0^0 is #NUM! in Excel and 1 in LibreOffice.
      fc.tuple(fc.constantFrom("ROUND", "ROUNDUP", "ROUNDDOWN", "MOD", "POWER", "MAX", "MIN"), tie("expr"), fc.integer({ min: 1, max: 3 })).map(([f, a, n]) => `${f}(${a},${n})`),
      fc.tuple(tie("expr"), fc.constantFrom(">", "<", "=", "<>", ">=", "<="), tie("expr"), tie("expr"), tie("expr")).map(([a, op, b, d, e]) => `IF(${a}${op}${b},${d},${e})`),
      fc.tuple(tie("expr"), tie("expr")).map(([a, b]) => `IFERROR(${a},${b})`),
      fc.tuple(tie("expr"), tie("expr"), tie("expr"), tie("expr")).map(([a, b, d, e]) => `IF(AND(${a}>0,${b}<50),${d},${e})`),
      fc.tuple(fc.constantFrom("A", "B", "C", "D", "E"), fc.constantFrom("A", "B", "C", "D", "E"), fc.integer({ min: 2, max: 5 }), fc.integer({ min: 1, max: 4 })).map(([x, y, r, n]) => `SUMPRODUCT(Pumps!${x}${r}:${x}${r + n},Pumps!${y}${r}:${y}${r + n})`),
      fc.tuple(fc.constantFrom(20, 40, 60, 80, 75), fc.constantFrom(0, 1)).map(([k, t]) => `MATCH(${k},Pumps!A2:A9,${t})`),
      fc.tuple(fc.constantFrom(20, 40, 60, 80), fc.integer({ min: 2, max: 5 })).map(([k, col]) => `VLOOKUP(${k},Pumps!A2:E9,${col},FALSE)`),
    ),
  }));
  return fc.sample(grammar.expr, { seed, numRuns: count });
}

/** LibreOffice's CSV text of a value, as ours would print it. */
function loValue(text: string): { kind: "number"; n: number } | { kind: "text"; t: string } {
  if (/^-?(\d+\.?\d*|\.\d+)(E[+-]?\d+)?$/i.test(text)) return { kind: "number", n: Number(text) };
  // A percent format survives the export of raw values.
  if (/^-?(\d+\.?\d*|\.\d+)(E[+-]?\d+)?%$/i.test(text)) return { kind: "number", n: Number(text.slice(0, -1)) / 100 };
  // LibreOffice's "invalid argument", written as #NUM! when it saves .xlsx (where Excel's pages give #NUM!).
  if (text === "Err:502") return { kind: "text", t: "#NUM!" };
  // Dates and times keep their format in the export: US month/day/year, 12-hour clock.
  const date = /^(\d{2})\/(\d{2})\/(\d{4})$/.exec(text);
  if (date) return { kind: "number", n: Math.round((Date.UTC(Number(date[3]), Number(date[1]) - 1, Number(date[2])) - Date.UTC(1899, 11, 30)) / 86400000) };
  const time = /^(\d{2}):(\d{2}):(\d{2}) (AM|PM)$/.exec(text);
  if (time) return { kind: "number", n: (((Number(time[1]) % 12) + (time[4] === "PM" ? 12 : 0)) * 3600 + Number(time[2]) * 60 + Number(time[3])) / 86400 };
  return { kind: "text", t: text };
}

const SEED = Number(process.env.NAPPE_FUZZ_SEED ?? 20261203);

/** Where each case goes: column A (G for the random ones), a row each, array cases as many rows as they fill. */
function layout(cases: Case[], column: string, first = 1): { at: string; rows: number; cols: number; c: Case }[] {
  let r = first;
  return cases.map((k) => {
    const [rows, cols] = k.array ?? [1, 1];
    const out = { at: `${column}${r}`, rows, cols, c: k };
    r += rows;
    return out;
  });
}

function sheetRows(cells: Record<number, string[]>): string {
  return Object.entries(cells)
    .sort((a, b) => Number(a[0]) - Number(b[0]))
    .map(([r, cs]) => row(Number(r), ...cs))
    .join("");
}

describe.skipIf(!soffice)("our formula engine against LibreOffice Calc", () => {
  it(`computes ${LO_CASES.length} chosen and 300 random formulas (seed ${SEED}) to LibreOffice's values`, async () => {
    const random = randomFormulas(300, SEED).map((f) => ({ f }));
    // The chosen cases twice, the second copy far below: a formula repeated far apart gives the same value.
    const placed = [...layout(LO_CASES, "A"), ...layout(random, "G"), ...layout(LO_CASES, "K", 2000)];
    expect(placed.length).toBeGreaterThanOrEqual(500);
    const sheets = Object.entries(DATA).map(([name, rows]) => ({
      name,
      rows: rows
        .map((r, i) => row(i + 1, ...r.flatMap((v, j) => (v === undefined || v === null ? [] : [c(`${addressOf(i + 1, j + 1)}`, { v })]))))
        .join(""),
    }));
    const calc: Record<number, string[]> = {};
    for (const p of placed) {
      const m = /^([A-Z]+)(\d+)$/.exec(p.at)!;
      const r = Number(m[2]);
      const end = `${addressOf(r + p.rows - 1, [...m[1]].reduce((n, ch) => n * 26 + ch.charCodeAt(0) - 64, 0) + p.cols - 1)}`;
      (calc[r] ??= []).push(c(p.at, { f: p.c.f, ...(p.c.array ? { array: `${p.at}:${end}`, dynamic: true } : {}) }));
    }
    for (const r of Object.keys(calc)) calc[Number(r)].sort((a, b) => a.localeCompare(b));
    const dir = tempDir();
    const path = join(dir, "cases.xlsx");
    writeFileSync(path, await xlsxPackage([...sheets, { name: "Calc", rows: sheetRows(calc) }]));
    const ours = recalculate(await readWorkbook(path), { all: true });
    convert([path], "csv", dir);
    const theirs = readCsv(join(dir, "cases-Calc.csv"));
    const failures: string[] = [];
    for (const p of placed) {
      const m = /^([A-Z]+)(\d+)$/.exec(p.at)!;
      const col0 = [...m[1]].reduce((n, ch) => n * 26 + ch.charCodeAt(0) - 64, 0);
      const row0 = Number(m[2]);
      for (let i = 0; i < p.rows; i++) {
        for (let j = 0; j < p.cols; j++) {
          const address = addressOf(row0 + i, col0 + j);
          const mine = ours.valueOf("Calc", address);
          const lo = loValue(theirs[row0 + i - 1]?.[col0 + j - 1] ?? "");
          const v = Array.isArray(mine) ? mine[0]?.[0] : mine;
          let same: boolean;
          // LibreOffice's logicals are numbers with a format (its help, "Logical functions"): 1 and 0 where a format is lost.
          const raw = theirs[row0 + i - 1]?.[col0 + j - 1] ?? "";
          if (typeof v === "string" && v === raw) same = true;
          else if (lo.kind === "number") same = (typeof v === "number" && Math.abs(v - lo.n) <= Math.max(1e-12, 1e-9 * Math.abs(lo.n))) || (typeof v === "boolean" && Number(v) === lo.n);
          else if (typeof v === "boolean") same = String(v).toUpperCase() === lo.t;
          else if (typeof v === "number" && (lo.t === "TRUE" || lo.t === "FALSE")) same = v === (lo.t === "TRUE" ? 1 : 0);
          else if (v === null) same = lo.t === "";
          else same = String(v) === lo.t;
          if (!same) failures.push(`${address} =${p.c.f}: Nappe ${JSON.stringify(v)}, LibreOffice ${JSON.stringify(raw)}`);
        }
      }
    }
    expect(failures).toEqual([]);
  }, 300_000);
});

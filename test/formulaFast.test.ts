/**
 * The fast front end (workbook/formulaFast.ts) against the formula library it stands in for,
 * fast-formula-parser: thousands of random formulas over a grid holding numbers, numeric and
 * other text, blanks, logicals and error values must give the same result (or the same error,
 * with the same message) and read the same cells in the same order; and its tokens must be the
 * library lexer's. Seeded, so a failure repeats; NAPPE_FUZZ_SEED explores other seeds.
 */
import FormulaParser from "fast-formula-parser";
import { lex, type Token } from "fast-formula-parser/grammar/lexing";
import { describe, expect, it } from "vitest";
import { evaluatingParser, type FunctionArg, type RangeRef, references } from "../workbook/formula";
import { compile, matchesTemplate, shapeKey, shapeText, tokenize } from "../workbook/formulaFast";
import { shiftFormula } from "../workbook/storedForm";
import { EXTRA_FUNCTIONS } from "../workbook/extraFunctions";

const { FormulaError } = FormulaParser;

/** A small seeded generator (mulberry32). */
function random(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const GRID_VALUES: unknown[] = [0, 1, -2.5, 3, 1e-7, 12345.678, "abc", "3", "", " 4 ", "TRUE", true, false, null, new FormulaError("#DIV/0!"), new FormulaError("#N/A")];

function cellValue(sheet: string, row: number, col: number): unknown {
  const i = (row * 7 + col * 3 + sheet.length) % GRID_VALUES.length;
  return GRID_VALUES[i];
}

const FUNCTIONS = ["SUM", "AVERAGE", "MIN", "MAX", "COUNT", "COUNTA", "IF", "ROUND", "SQRT", "ABS", "AND", "OR", "NOT", "LEN", "CONCATENATE", "MOD", "POWER", "PI", "INT", "UPPER", "LEFT", "IFERROR", "ISNUMBER", "EXP", "LN", "LOG10", "TRUNC", "SIGN", "ROWS", "COLUMN", "INDEX", "CHOOSE", "_xlfn.STDEV.S", "MATCH"];

function formulaOf(rnd: () => number, depth = 0): string {
  const pick = <T>(xs: readonly T[]): T => xs[Math.floor(rnd() * xs.length)];
  const col = () => pick(["A", "B", "C", "$D", "E"]);
  const row = () => `${pick(["", "$"])}${1 + Math.floor(rnd() * 6)}`;
  const cell = () => `${col()}${row()}`;
  const atoms = [
    () => pick(["0", "1", "2.5", "10", "1.5E+3", "7.", "0.25", "3E-2"]),
    () => pick(['"abc"', '"3"', '""', '"a""b"', '" 4 "', '"TRUE"']),
    () => pick(["TRUE", "FALSE", "true"]),
    () => cell(),
    () => `${cell()}:${cell()}`,
    () => pick(["A:A", "B:C", "1:2", "$3:$4"]),
    () => `${pick(["Sheet2!", "'My sheet'!", "'It''s'!"])}${pick([cell(), `${cell()}:${cell()}`])}`,
  ];
  if (depth > 3 || rnd() < 0.3) return pick(atoms)();
  const r = rnd();
  const sub = () => formulaOf(rnd, depth + 1);
  const sp = () => (rnd() < 0.2 ? " " : "");
  if (r < 0.35) return `${sub()}${sp()}${pick(["+", "-", "*", "/", "^", "&", "=", "<>", "<", ">", "<=", ">="])}${sp()}${sub()}`;
  if (r < 0.45) return `${pick(["-", "+", "--", "-+"])}${sub()}`;
  if (r < 0.5) return `${sub()}%`;
  if (r < 0.6) return `(${sp()}${sub()}${sp()})`;
  const n = Math.floor(rnd() * 4);
  const args = Array.from({ length: n }, () => (rnd() < 0.1 ? "" : sub()));
  return `${pick(FUNCTIONS)}(${args.join(`,${sp()}`)})`;
}

/** A result as a plain structure: errors by code and message, numbers exactly. */
function plain(v: unknown): unknown {
  if (v instanceof FormulaError) return { error: v.error, message: v.message };
  if (Array.isArray(v)) return v.map(plain);
  if (v && typeof v === "object") return { object: JSON.stringify(v) };
  return v;
}

function run(parse: (f: string) => unknown, formula: string, log: string[]): unknown {
  log.length = 0;
  try {
    return { value: plain(parse(formula)) };
  } catch (e) {
    return { thrown: e instanceof FormulaError ? { error: e.error, message: (e.message ?? "").split("\n")[0] } : String(e) };
  }
}

function parsers() {
  const log: string[] = [];
  const onCell = (ref: { sheet: string; row: number; col: number }) => {
    log.push(`${ref.sheet}!${ref.row}:${ref.col}`);
    return cellValue(ref.sheet, ref.row, ref.col);
  };
  const onRange = (ref: RangeRef) => {
    log.push(`${ref.sheet}!${ref.from.row}:${ref.from.col}-${ref.to.row}:${ref.to.col}`);
    const rows: unknown[][] = [];
    for (let r = ref.from.row; r <= Math.min(ref.to.row, 8); r++) {
      const row: unknown[] = [];
      for (let c = ref.from.col; c <= Math.min(ref.to.col, 6); c++) row.push(cellValue(ref.sheet, r, c));
      rows.push(row);
    }
    return rows;
  };
  const functions = EXTRA_FUNCTIONS as Record<string, (...args: FunctionArg[]) => unknown>;
  const library = new FormulaParser({ functions, onCell, onRange });
  const ours = evaluatingParser({ functions, keepReferences: [], onCell, onRange });
  const here = { sheet: "Sheet1", row: 3, col: 2 };
  return {
    log,
    library: (f: string, position = here) => library.parse(f, position, true),
    ours: (f: string, position = here) => ours.parse(f, position),
  };
}

const seed = Number(process.env.NAPPE_FUZZ_SEED ?? 20261202);

describe("the fast front end gives what the formula library gives", () => {
  it(`on 4000 random formulas (seed ${seed}): same value or error, same cells read in the same order`, () => {
    const rnd = random(seed);
    const p = parsers();
    let handled = 0;
    for (let i = 0; i < 4000; i++) {
      const f = formulaOf(rnd);
      if (compile(tokenize(f))) handled++;
      const expected = run(p.library, f, p.log);
      const expectedLog = [...p.log];
      const got = run(p.ours, f, p.log);
      expect({ f, got, log: p.log }).toEqual({ f, got: expected, log: expectedLog });
    }
    // Most of them go the fast way (the rest use names, intersections and the like, or fail to parse).
    expect(handled).toBeGreaterThan(3000);
  });

  it("on formulas of the kinds workbooks hold", () => {
    const p = parsers();
    const formulas = ["A1*2+1", "B2/3-A1", "IF(C3>0,SQRT(C3),0)", "ROUND(D4+B2,2)", "-2^2", "2^3^2", "10%*3", "-A1%", '"x"&1.5&TRUE', "Sheet2!A1:B2", "'My sheet'!$B$2*2", "SUM(A:A)", "SUM(1:2)", "ROUND(1.5,)", "IF(,1,2)", "PI()", "1=1=TRUE", "A1 = B1", "SUM( A1 , B2 )", "(((1)))", "1+", "SUM(A1 B2)", "A1:B2 B1:C3", "{1,2}", "#N/A", "Name1*2", "1e5", ".5", "SUM(,1)", "_xlfn.STDEV.S(A1:B4)", "A1:B2:C3", "Sheet2!A1:Sheet2!B2"];
    for (const f of formulas) {
      const expected = run(p.library, f, p.log);
      const expectedLog = [...p.log];
      expect({ f, got: run(p.ours, f, p.log), log: p.log }).toEqual({ f, got: expected, log: expectedLog });
    }
  });

  it("shares one parse between a formula and its copies filled to other cells, each giving the library's result at its own cell", () => {
    const rnd = random(seed + 2);
    const p = parsers();
    let shared = 0;
    for (let i = 0; i < 2000; i++) {
      const f = formulaOf(rnd);
      const [dr, dc] = [Math.floor(rnd() * 40), Math.floor(rnd() * 5)];
      const at = { sheet: "Sheet1", row: 3, col: 2 };
      const to = { sheet: "Sheet1", row: 3 + dr, col: 2 + dc };
      // The copy as Excel writes a formula filled from one cell to another (ECMA-376's shared formulas).
      const copy = shiftFormula(f, dr, dc);
      const key = shapeKey(f, at.row, at.col);
      if (key !== undefined && key === shapeKey(copy, to.row, to.col) && copy !== f) shared++;
      for (const [formula, position] of [[f, at], [copy, to]] as const) {
        const expected = run((x) => p.library(x, position), formula, p.log);
        const expectedLog = [...p.log];
        const got = run((x) => p.ours(x, position), formula, p.log);
        expect({ formula, position, got, log: p.log }).toEqual({ formula, position, got: expected, log: expectedLog });
        // The references that order a recalculation, from the shared shape, are those the text names.
        let refs: unknown;
        try {
          refs = references(formula, position);
        } catch {
          continue;
        }
        expect({ formula, refs }).toEqual({ formula, refs: references(formula) });
      }
    }
    // Many copies share their original's parse (761 with this seed). The rest name no relative
    // cell, shift whole rows or columns (A:A, 1:2, written as they are in the key), or fall to the library.
    expect(shared).toBeGreaterThan(500);
  });

  it("matches a formula to another's template (text compared, not tokenized) exactly when their shape keys are equal", () => {
    const rnd = random(seed + 3);
    let matched = 0;
    for (let i = 0; i < 3000; i++) {
      const f = formulaOf(rnd);
      const at = { row: 1 + Math.floor(rnd() * 30), col: 1 + Math.floor(rnd() * 8) };
      const template = shapeText(f, at.row, at.col);
      if (!template) continue;
      // A copy of it moved down and across, or an unrelated formula, at another cell.
      const [dr, dc] = [Math.floor(rnd() * 40), Math.floor(rnd() * 3)];
      const other = rnd() < 0.7 ? shiftFormula(f, dr, dc) : formulaOf(rnd);
      const to = { row: at.row + dr, col: at.col + dc };
      const same = shapeKey(other, to.row, to.col) === template.key;
      expect({ f, other, to, match: matchesTemplate(template, other, to.row, to.col) }).toEqual({ f, other, to, match: same });
      if (same) matched++;
    }
    expect(matched).toBeGreaterThan(1000);
    // Written otherwise, not a copy: a leading zero, lower case, a $ added, a longer row number with the same digits.
    const t = shapeText("A5*2+B$1", 5, 3)!;
    expect(matchesTemplate(t, "A6*2+B$1", 6, 3)).toBe(true);
    expect(matchesTemplate(t, "A06*2+B$1", 6, 3)).toBe(false);
    expect(matchesTemplate(t, "a6*2+B$1", 6, 3)).toBe(false);
    expect(matchesTemplate(t, "$A6*2+B$1", 6, 3)).toBe(false);
    expect(matchesTemplate(t, "A66*2+B$1", 6, 3)).toBe(false);
    expect(matchesTemplate(t, "B6*2+C$1", 6, 4)).toBe(true);
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
    expect(shapeKey("A1+Name1", 1, 2)).toBeUndefined();
  });

  it("tokenizes as the library's lexer does wherever it tokenizes at all", () => {
    const rnd = random(seed + 1);
    let compared = 0;
    for (let i = 0; i < 3000; i++) {
      const f = formulaOf(rnd);
      const ours = tokenize(f);
      if (!ours) continue;
      compared++;
      const theirs = (lex(f).tokens as Token[]).map((t) => ({ type: t.tokenType.name, image: t.image }));
      const normal = ours.map((t) => ({ type: t.type === "Op" ? opName(t.image) : t.type === "Percent" ? "PercentOp" : t.type, image: t.image }));
      expect({ f, tokens: normal }).toEqual({ f, tokens: theirs });
    }
    expect(compared).toBeGreaterThan(2500);
  });
});

/** The library's token names for the operators our tokenizer calls "Op". */
function opName(op: string): string {
  return ({ "*": "MulOp", "+": "PlusOp", "/": "DivOp", "-": "MinOp", "&": "ConcatOp", "^": "ExOp", "<>": "NeqOp", ">=": "GteOp", "<=": "LteOp", ">": "GtOp", "=": "EqOp", "<": "LtOp" } as Record<string, string>)[op];
}

/**
 * The shape of the code: the layers the contributor guide draws are the layers the imports
 * make (no folder imports one above it, no cycles between folders), and the formula library's
 * internals that workbook/formula.ts relies on are still there and still behave as it expects.
 */
import { existsSync, readdirSync, readFileSync, statSync } from "node:fs";
import { dirname, join, relative, resolve } from "node:path";
import FormulaParser from "fast-formula-parser";
import { lex } from "fast-formula-parser/grammar/lexing";
import { describe, expect, it } from "vitest";
import { callSites, directPrecedents, evaluatingParser, FormulaError, isParseError, MAX_COLUMN, MAX_ROW, notImplementedFunction, references } from "../workbook/formula";
import { recalculate } from "../workbook/recalc";
import type { WorkbookModel } from "../workbook/model";
import { FUNCTION_GROUPS, type FunctionGroup } from "../workbook/formulaFunctions";

const root = join(__dirname, "..");

/** Folder → the folders it may import (besides itself), lowest layers first, as DEVELOPERS.md draws them. */
const ALLOWED: Record<string, string[]> = {
  "functions/calc": [],
  "functions/units": ["functions/calc"],
  "functions/tables": ["functions/calc", "functions/units"],
  "functions/catalog": ["functions/calc", "functions/units", "functions/tables"],
  "functions/bind": ["functions/calc", "functions/units", "functions/tables", "functions/catalog"],
  functions: ["functions/bind"],
  workbook: ["functions/calc", "functions/units", "functions/tables", "functions/catalog", "functions/bind"],
  taskpane: ["workbook", "functions/calc", "functions/units", "functions/tables", "functions/catalog", "functions/bind"],
  demo: ["workbook", "functions/calc", "functions/units", "functions/tables", "functions/catalog", "functions/bind"],
  headless: ["workbook", "demo", "functions/calc", "functions/units", "functions/tables", "functions/catalog", "functions/bind"],
};

function folderOf(file: string): string {
  const rel = relative(root, file).replace(/\\/g, "/");
  const parts = rel.split("/");
  if (parts[0] === "functions" && parts.length > 2) return `functions/${parts[1]}`;
  if (parts[0] === "taskpane") return "taskpane";
  return parts[0];
}

function sources(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const p = join(dir, name);
    if (statSync(p).isDirectory()) return sources(p);
    return p.endsWith(".ts") ? [p] : [];
  });
}

describe("layers", () => {
  const files = ["functions", "workbook", "taskpane", "headless", "demo"].flatMap((d) => sources(join(root, d)));
  const edges = files.flatMap((file) =>
    [...readFileSync(file, "utf8").matchAll(/(?:from|import)\s*\(?\s*"(\.[^"]+)"/g)].map((m) => {
      const target = resolve(dirname(file), m[1]);
      return { file, from: folderOf(file), to: folderOf(existsSync(target) && statSync(target).isDirectory() ? join(target, "index.ts") : target) };
    }),
  );
  it("every import goes to the same folder or one the layer picture puts below", () => {
    const wrong = edges.filter((e) => e.from !== e.to && !(ALLOWED[e.from] ?? []).includes(e.to)).map((e) => `${relative(root, e.file)} → ${e.to}`);
    expect(wrong).toEqual([]);
  });
  it("no two folders import each other", () => {
    const pairs = new Set(edges.filter((e) => e.from !== e.to).map((e) => `${e.from}→${e.to}`));
    const cycles = [...pairs].filter((p) => pairs.has(p.split("→").reverse().join("→")));
    expect(cycles).toEqual([]);
  });
  it("only workbook/formula.ts uses the formula library (formulaLibrary.ts, its twins, formulaSteps.ts and formulaGroups.ts only load it)", () => {
    const users = files.filter((f) => !f.endsWith(".d.ts") && /from "fast-formula-parser|import\(\/\*[^*]*\*\/ "fast-formula-parser|require\("fast-formula-parser/.test(readFileSync(f, "utf8"))).map((f) => relative(root, f)).sort();
    expect(users).toEqual(["headless/formulaLibraryCommand.ts", "taskpane/formulaLibraryLazy.ts", "workbook/formula.ts", "workbook/formulaGroups.ts", "workbook/formulaLibrary.ts", "workbook/formulaSteps.ts"]);
  });
});

describe("the formula library's internals the adapter relies on (fast-formula-parser 1.0.19)", () => {
  it("its lexer names the tokens callSites and references read", () => {
    const names = new Set(lex("'A b'!B2:C3+SUM(Sheet1!A:A)+1").tokens.map((t) => t.tokenType.name));
    for (const n of ["SheetQuoted", "Cell", "Colon", "PlusOp", "Function", "Sheet", "Column", "CloseParen", "Number"]) expect(names, n).toContain(n);
  });
  it("keeps the reference of an argument of a function on its funsPreserveRef list", () => {
    const seen: unknown[] = [];
    const parser = evaluatingParser({ functions: { KEEP: (a) => (seen.push(a.ref), 1) }, keepReferences: ["KEEP"], onCell: () => 2, onRange: () => [[2]] });
    parser.parse("KEEP(Data!B7)", { sheet: "S", row: 1, col: 1 });
    expect(seen).toMatchObject([{ sheet: "Data", row: 7, col: 2 }]);
    expect(Array.isArray(new FormulaParser({}).funsPreserveRef)).toBe(true);
  });
  /** The library's error for a formula, as the engine meets it. */
  function failureOf(formula: string): InstanceType<typeof FormulaError> {
    const parser = evaluatingParser({ functions: {}, keepReferences: [], onCell: () => 0, onRange: () => [[0]] });
    try {
      parser.parse(formula, { sheet: "S", row: 1, col: 1 });
    } catch (e) {
      expect(e).toBeInstanceOf(FormulaError);
      return e as InstanceType<typeof FormulaError>;
    }
    throw new Error(`${formula} did not fail`);
  }
  it("says a function is not implemented in the words notImplementedFunction reads", () => {
    expect(notImplementedFunction(failureOf("NOSUCHFUNCTION(1)"))).toBe("NOSUCHFUNCTION");
  });
  it("marks a parse error as isParseError reads it", () => {
    expect(isParseError(failureOf("1+("))).toBe(true);
  });
  it("the pane's lazy twin of formulaLibrary.ts has the same exports, refuses before the chunk is loaded, then gives the library", async () => {
    const lazy = await import("../taskpane/formulaLibraryLazy");
    const eager = await import("../workbook/formulaLibrary");
    expect(Object.keys(lazy).sort()).toEqual(Object.keys(eager).sort());
    expect(() => lazy.formulaLibrary()).toThrow(/still loading/);
    await lazy.formulaLibraryReady();
    expect(lazy.formulaLibrary().FormulaParser).toBe(FormulaParser);
    expect(lazy.formulaLibrary().lex).toBe(lex);
    expect(lazy.formulaLibrary().steps).toBe(eager.formulaLibrary().steps);
  });
  it("the command's twin of formulaLibrary.ts has the same exports, and loads the parser and lexer only when asked for them", async () => {
    const command = await import("../headless/formulaLibraryCommand");
    const eager = await import("../workbook/formulaLibrary");
    expect(Object.keys(command).sort()).toEqual(Object.keys(eager).sort());
    expect(Object.keys(command.formulaLibrary()).sort()).toEqual(Object.keys(eager.formulaLibrary()).sort());
    // Each function group is the library's own module, and lists the names formulaFunctions.ts gives.
    for (const g of Object.keys(FUNCTION_GROUPS) as FunctionGroup[]) {
      expect(command.formulaLibrary().steps.group(g), g).toBe(eager.formulaLibrary().steps.group(g));
      expect(Object.keys(eager.formulaLibrary().steps.group(g)), g).toEqual([...FUNCTION_GROUPS[g]]);
    }
    expect(command.formulaLibrary().FormulaParser).toBe(FormulaParser);
    expect(command.formulaLibrary().lex).toBe(lex);
    // The built command does not load them for ordinary formulas: test/headless.test.ts.
  });
  it("has the evaluation steps the fast front end calls (workbook/formulaFast.ts), as methods of the names it uses", () => {
    const parser = new FormulaParser({}) as unknown as { utils: Record<string, unknown> } & Record<string, unknown>;
    for (const m of ["applyInfix", "applyPrefix", "applyPostfix", "applyRange", "parseCol", "toNumber", "toString", "toBoolean", "isFormulaError"]) expect(typeof parser.utils[m], m).toBe("function");
    for (const m of ["callFunction", "checkFormulaResult"]) expect(typeof parser[m], m).toBe("function");
  });
  it("has the sheet bounds formula.ts writes as constants, and one error class in its small module and its main one", () => {
    expect([MAX_ROW, MAX_COLUMN]).toEqual([FormulaParser.MAX_ROW, FormulaParser.MAX_COLUMN]);
    expect(FormulaError).toBe(FormulaParser.FormulaError);
  });
  it("has the dependency parser directPrecedents uses", () => {
    expect(directPrecedents("A1+Data!B2:C3", { sheet: "S", row: 5, col: 5 })).toEqual([
      { sheet: "S", row: 1, col: 1 },
      { sheet: "Data", from: { row: 2, col: 2 }, to: { row: 3, col: 3 } },
    ]);
  });
  it("gives call sites and references from the same lexer", () => {
    expect(callSites('NAPPE.HEAD(B2, , "ft")')[0].args.map((a) => a.text)).toEqual(["B2", "", '"ft"']);
    expect(references("'A!B'!C4")).toEqual([{ sheet: "A!B", from: { row: 4, col: 3 }, to: { row: 4, col: 3 } }]);
  });
});

describe("cell keys", () => {
  it("survive sheet names that contain '!' and quotes", () => {
    const wb: WorkbookModel = {
      sheets: [
        { name: "Pump!1", cells: new Map([["1:1", { sheet: "Pump!1", address: "A1", row: 1, col: 1, value: 2 }]]) },
        {
          name: "Calc",
          cells: new Map([
            ["1:1", { sheet: "Calc", address: "A1", row: 1, col: 1, value: null, formula: "NAPPE.CONVERT('Pump!1'!A1, \"ft\", \"m\")" }],
            ["2:1", { sheet: "Calc", address: "A2", row: 2, col: 1, value: null, formula: "A1*2" }],
          ]),
        },
      ],
    };
    const result = recalculate(wb, { all: true });
    expect(result.valueOf("Calc", "A1")).toBeCloseTo(2 * 0.3048, 15); // NIST SP 811: 1 ft = 0.3048 m
    expect(result.valueOf("Calc", "A2")).toBeCloseTo(4 * 0.3048, 15);
    expect(result.cells[0].calls[0].refs[0]).toBe("'Pump!1'!A1");
  });
});

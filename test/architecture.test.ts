/**
 * The shape of the code: the layers the contributor guide draws are the layers the imports
 * make (no folder imports one above it, no cycles between folders), and the formula engine is
 * our own: no formula library is installed or imported, and the pane loads its function library
 * as a chunk of its own.
 */
import { existsSync, readdirSync, readFileSync, statSync } from "node:fs";
import { dirname, join, relative, resolve } from "node:path";
import { describe, expect, it } from "vitest";
import { callSites, directPrecedents, references } from "../workbook/formula";
import { recalculate } from "../workbook/recalc";
import type { WorkbookModel } from "../workbook/model";

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
  it("no formula library is a dependency or imported: the engine is our own (workbook/formula/)", () => {
    const pkg = JSON.parse(readFileSync(join(root, "package.json"), "utf8")) as { dependencies: Record<string, string> };
    for (const name of ["fast-formula-parser", "hot-formula-parser", "@formulajs/formulajs", "hyperformula"]) expect(Object.keys(pkg.dependencies)).not.toContain(name);
    const users = files.filter((f) => /from "(fast-formula-parser|@formulajs|hyperformula|hot-formula-parser)/.test(readFileSync(f, "utf8")));
    expect(users).toEqual([]);
  });
});

describe("the formula engine's entry points", () => {
  it("the pane's lazy twin of formulaLibrary.ts has the same exports, refuses before the chunk is loaded, then gives the same library", async () => {
    const lazy = await import("../taskpane/formulaLibraryLazy");
    const eager = await import("../workbook/formulaLibrary");
    expect(Object.keys(lazy).sort()).toEqual(Object.keys(eager).sort());
    expect(() => lazy.formulaLibrary()).toThrow(/still loading/);
    await lazy.formulaLibraryReady();
    expect(lazy.formulaLibrary()).toBe(eager.formulaLibrary());
    expect(lazy.formulaLibrary().get("SUM")).toBeDefined();
  });
  it("gives direct precedents, each once, whole columns to the last row", () => {
    expect(directPrecedents("A1+Data!B2:C3+SUM(A:A)+A1", { sheet: "S", row: 5, col: 5 })).toEqual([
      { sheet: "S", row: 1, col: 1 },
      { sheet: "Data", from: { row: 2, col: 2 }, to: { row: 3, col: 3 } },
      { sheet: "S", from: { row: 1, col: 1 }, to: { row: 1048576, col: 1 } },
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

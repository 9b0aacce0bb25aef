import { describe, expect, it } from "vitest";
import { evaluate } from "../functions/bind/evaluate";
import { CATALOG, CATALOG_BY_ID } from "../functions/catalog";
import * as bindings from "../functions/functions";
import { bindingName } from "../scripts/generate";
import ExcelJS from "exceljs";
import katex from "katex";
import { exampleFormula } from "../functions/catalog/_formula";
import { recalculate } from "../workbook/recalc";
import { fromExcelJS } from "../headless/readXlsx";
import { expectMatchesExample, relativeError } from "./helpers";
import examplesReference from "./reference/examples_reference.json";

describe("catalogue", () => {
  it("has unique ids in upper case", () => {
    const ids = CATALOG.map((s) => s.id);
    expect(new Set(ids).size).toBe(ids.length);
    for (const id of ids) expect(id).toMatch(/^[A-Z][A-Z0-9]*(\.[A-Z0-9]+)*$/);
  });
  it("gives every function a purpose, equation, source and at least one example", () => {
    for (const s of CATALOG) {
      expect(s.purpose, s.id).not.toBe("");
      expect(s.equation, s.id).not.toBe("");
      expect(s.sources.length, s.id).toBeGreaterThan(0);
      expect(s.examples.length, s.id).toBeGreaterThan(0);
      for (const ex of s.examples) expect(ex.source, s.id).not.toBe("");
    }
  });
  it("puts optional parameters after required ones and names result units `unit` or `…_unit`", () => {
    for (const s of CATALOG) {
      const firstOptional = s.params.findIndex((p) => p.optional);
      if (firstOptional >= 0) expect(s.params.slice(firstOptional).every((p) => p.optional), s.id).toBe(true);
      for (const p of s.params) if (p.kind === "unit" && p.optional) expect(p.name).toMatch(/^(unit|\w+_unit)$/);
    }
  });
  it("gives every function an equation KaTeX can typeset, with no stray control characters", () => {
    for (const s of CATALOG) {
      expect(s.equation, s.id).not.toMatch(/[\u0000-\u001f]/);
      expect(() => katex.renderToString(s.equation, { throwOnError: true, output: "mathml" }), s.id).not.toThrow();
    }
  });
  it("has a worksheet binding for every spec and a spec for every binding", () => {
    const exported = Object.keys(bindings).sort();
    expect(exported).toEqual(CATALOG.map((s) => bindingName(s.id)).sort());
  });
});

describe("worked examples in the catalogue (each names its source)", () => {
  const cases = CATALOG.flatMap((s) => s.examples.map((ex) => ({ s, ex, name: `${s.id}(${ex.args.map((a) => JSON.stringify(a)).join(", ")}) = ${ex.expect} — ${ex.source}` })));
  it.each(cases)("$name", ({ s, ex }) => {
    expectMatchesExample(evaluate(s, ex.args).value, ex);
  });
});

describe("each example as the formula the guide inserts, recalculated by the headless engine", () => {
  it.each(CATALOG.map((s) => [s.id, s]))("%s", (_id, spec) => {
    const book = new ExcelJS.Workbook();
    book.addWorksheet("S").getCell("A1").value = { formula: exampleFormula(spec)!.slice(1) };
    const result = recalculate(fromExcelJS(book));
    expect(result.cells[0].status, result.cells[0].messages.join("; ")).not.toBe("error");
    expectMatchesExample(result.valueOf("S", "A1"), spec.examples[0], spec.id);
  });
});

describe("worked examples that cite a computation", () => {
  // Each value here comes from test/reference/examples_reference.py (SciPy, Python, mpmath; versions in the JSON).
  const computed = examplesReference.examples as Record<string, number | (number | string)[][]>;
  const cites = /SciPy|Python|mpmath/;
  it("are all backed by the reference generator", () => {
    const citing = CATALOG.filter((s) => s.examples.some((ex) => cites.test(ex.source))).map((s) => s.id).sort();
    expect(citing).toEqual(Object.keys(computed).sort());
  });
  it.each(Object.entries(computed))("NAPPE.%s's example expects the generator's value", (id, want) => {
    const ex = CATALOG_BY_ID.get(id)!.examples.find((e) => cites.test(e.source))!;
    if (typeof want === "number") expect(relativeError(ex.expect as number, want)).toBeLessThan(1e-12);
    else expect(ex.expect).toEqual(want);
  });
});

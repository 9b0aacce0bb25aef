/**
 * The Office.js adapter against a small in-memory stand-in for Excel's JavaScript API (no Excel
 * runs here). It checks the adapter's own mapping: formulas without "=", values, number formats,
 * labels, writes, the formula scan and the audit sheet. It cannot check Excel itself.
 */
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { addressOf } from "../workbook/address";
import { namesAnotherSheet, OfficeHost } from "../taskpane/host/office";
import { auditOf, checkWorkbook } from "../taskpane/workbookCheck";
import { explainCell } from "../taskpane/explain";
import { run } from "./helpers";
import { fake, FakeSheet, install } from "./fixtures/fakeExcel";

describe("Office.js adapter (against a stand-in for Excel's API)", () => {
  beforeEach(install);
  afterEach(() => delete (globalThis as Record<string, unknown>).Excel);

  it("reads the selection, formulas without '=', values and number formats", async () => {
    const host = new OfficeHost();
    expect(await host.selection()).toEqual({ sheet: "Calc", address: "B2" });
    expect(await host.cell("Calc", "B2")).toEqual({ formula: 'NAPPE.VELOCITY(B1&" gpm", "4 in")', value: 3.11, numberFormat: undefined });
    expect(await host.cell("Calc", "B1")).toEqual({ formula: undefined, value: 400, numberFormat: '0 "gpm"' });
  });
  it("finds the label to the left", async () => {
    expect(await new OfficeHost().labelsNear("Calc", "B1")).toEqual(["Flow (gpm)"]);
  });
  it("writes a formula with '='", async () => {
    await new OfficeHost().setFormula("Calc", "C5", "NAPPE.HEAD(1)");
    expect(fake.sheets[0].cells.get("C5")!.formula).toBe("NAPPE.HEAD(1)");
  });
  it("lists only the NAPPE formulas", async () => {
    const cells = await new OfficeHost().nappeFormulaCells();
    expect(cells).toEqual([{ sheet: "Calc", address: "B2", formula: 'NAPPE.VELOCITY(B1&" gpm", "4 in")', value: 3.11 }]);
  });
  it("reads a cell with the defined names of the workbook and of its sheet, without '=', in one round trip", async () => {
    fake.syncs = 0;
    const { cell, names } = await new OfficeHost().cellAndNames("Calc", "B2");
    expect(cell.formula).toBe('NAPPE.VELOCITY(B1&" gpm", "4 in")');
    expect(names).toEqual([
      { name: "Flow", refersTo: "Calc!$B$1" },
      { name: "Pipe", refersTo: '"4 in"', sheet: "Calc" },
    ]);
    expect(fake.syncs).toBe(1);
  });
  it("reads every sheet's names only when the formula qualifies a name by another sheet", () => {
    expect(namesAnotherSheet("'Pump data'!Curve*2")).toBe(true);
    expect(namesAnotherSheet("Inputs!B4+'Pump data'!$A$3:$E$21+Inputs!A:A+Inputs!$C$7")).toBe(false);
    expect(namesAnotherSheet("Flow*2")).toBe(false);
  });
  it("selects a cell", async () => {
    await new OfficeHost().select("Calc", "B3");
    expect(fake.selected).toEqual({ sheet: "Calc", address: "B3" });
  });
  it("checks the whole workbook in round trips that do not grow with the number of formulas", async () => {
    // 20 sheets, each with its inputs, a pump curve with NPSHr, and `perSheet` NAPPE formulas; one NPSHA.
    const build = (perSheet: number) => {
      fake.sheets = Array.from({ length: 20 }, (_, k) => {
        const ws = new FakeSheet(`Pumps ${k + 1}`);
        [["Flow (gpm)", "Head (ft)", "NPSHr (ft)"], [0, 100, ""], [100, 98, 6], [200, 92, 8], [300, 80, 11], [400, 60, 16]].forEach((row, i) => row.forEach((v, j) => ws.cells.set(addressOf(i + 1, j + 1), { value: v })));
        ws.cells.set("E1", { value: "Flow (gpm)" });
        ws.cells.set("F1", { value: 250 });
        for (let i = 0; i < perSheet; i++) ws.cells.set(addressOf(i + 2, 6), { formula: `NAPPE.PUMP.NPSHR(F1&" gpm", A1:C6, "ft")`, value: 9.33125 }); // SciPy PCHIP at 250 gpm (test/reference/examples_reference.json)
        return ws;
      });
      fake.sheets[0].cells.set("H1", { formula: "NAPPE.NPSHA(101325, -2, 0.5, 20)", value: run("NPSHA", 101325, -2, 0.5, 20).value });
    };
    const syncsFor = async (perSheet: number) => {
      build(perSheet);
      fake.syncs = 0;
      const check = await checkWorkbook(new OfficeHost());
      expect(check.rows).toHaveLength(20 * perSheet + 1);
      expect(check.rows.filter((r) => r.status === "error").map((r) => `${r.sheet}!${r.address} ${r.note}`)).toEqual([]);
      // The file name comes in the same first round trip, for the audit's heading.
      expect(auditOf(check).source).toBe("Station sizing.xlsx");
      return fake.syncs;
    };
    const few = await syncsFor(1);
    const many = await syncsFor(20);
    // Sheets and names, then the used ranges' extents, then one read of every cell (2 + 1 chunk).
    expect(few).toBe(3);
    expect(many).toBe(3);
  });
  it("explains a cell in 2 round trips whatever its precedents: the cell with the names, then every precedent and label at once", async () => {
    const calc = fake.sheets[0];
    [["Flow (gpm)", 400], ["Bore (in)", 4], ["Length (ft)", 300], ["Roughness (in)", 0.0018]].forEach(([label, v], i) => {
      calc.cells.set(addressOf(10 + i, 1), { value: label });
      calc.cells.set(addressOf(10 + i, 2), { value: v });
    });
    calc.cells.set("C20", { formula: 'NAPPE.HEADLOSS(B10&" gpm", B11&" in", B12&" ft", B13&" in", , "ft")', value: 0 });
    const tripsFor = async (address: string) => {
      fake.syncs = 0;
      const e = await explainCell(new OfficeHost(), "Calc", address);
      expect(e.calls.length).toBe(1);
      return fake.syncs;
    };
    const one = await tripsFor("B2"); // one precedent, labelled
    const four = await tripsFor("C20"); // four precedents, each labelled
    expect(one).toBe(2); // issue target: at most 3
    expect(four).toBe(2);
    // A name qualified by another sheet takes one more, for every sheet's names: 3.
    calc.cells.set("C21", { formula: 'NAPPE.VELOCITY(Flow&" gpm", Calc!Pipe)', value: 0 });
    expect(await tripsFor("C21")).toBe(3);
    // The labels were read in that one batch: the unit check still sees "Flow (gpm)" beside B1.
    expect((await explainCell(new OfficeHost(), "Calc", "B2")).calls[0].unitWarnings).toEqual([]);
  });
  it("evaluates formulas as Excel 365 gives them: dynamic arrays, so a range times a test sums element by element", async () => {
    const calc = fake.sheets[0];
    [10, 15, 20, 25, 30].forEach((v, i) => calc.cells.set(addressOf(30 + i, 1), { value: v }));
    [12.5, 21, 28.4, 17.6, 12].forEach((v, i) => calc.cells.set(addressOf(30 + i, 2), { value: v }));
    calc.cells.set("C40", { formula: 'NAPPE.CONVERT(SUM(B30:B34*(A30:A34>15)), "ft", "m")', value: 0 });
    const e = await explainCell(new OfficeHost(), "Calc", "C40");
    // Microsoft, "Dynamic array formulas and spilled array behavior": 28.4 + 17.6 + 12 = 58 ft; NIST SP 811: × 0.3048.
    expect(e.error).toBeUndefined();
    expect(Number(e.exact)).toBeCloseTo(58 * 0.3048, 12);
  });
  it("reads a large used range in chunks, each under the per-request cell budget", async () => {
    const big = new FakeSheet("Big");
    for (let r = 1; r <= 30000; r++) big.cells.set(addressOf(r, 1), { value: r }), big.cells.set(addressOf(r, 2), { value: r * 2 });
    fake.sheets = [big];
    fake.syncs = 0;
    const model = await new OfficeHost().workbookSnapshot();
    expect(model.sheets[0].cells.size).toBe(60000);
    expect(fake.syncs).toBe(2 + 2); // 60 000 cells at 40 000 a request
  });
  it("writes the audit sheet as text with a frozen header row, replacing an older one", async () => {
    const host = new OfficeHost();
    await host.writeSheet("Nappe audit", [["title"], ["Sheet", "Cell"], ["Calc", "B2"]], { headerRow: 1, widths: [10, 5] });
    await host.writeSheet("Nappe audit", [["title"], ["Sheet", "Cell"], ["Calc", "B3"]], { headerRow: 1, widths: [10, 5] });
    const live = fake.sheets.filter((s) => s.name === "Nappe audit" && !s.deleted);
    expect(live).toHaveLength(1);
    expect(live[0].cells.get("B3")!.value).toBe("B3");
    // Text format ("@"): audit text such as "=NAPPE.HEAD(1)" stays text, never a live formula.
    expect(live[0].cells.get("A3")!.format).toBe("@");
    expect(live[0].frozenRows).toBe(2);
    expect(fake.sheets.find((s) => s.name === "Calc")!.cells.size).toBe(4);
  });
});

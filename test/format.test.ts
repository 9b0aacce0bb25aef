/**
 * The one formatting rule (DESIGN.md, "Numbers as engineers write them"), with named examples,
 * and the audit's summary: key results and inputs.
 */
import ExcelJS from "exceljs";
import { afterEach, describe, expect, it } from "vitest";
import { fromExcelJS } from "../headless/readXlsx";
import { MemoryHost } from "../taskpane/host/memory";
import { UndoStack } from "../taskpane/undo";
import { buildAudit, readableDate } from "../workbook/audit";
import { exactNumber, formatNumber, formatPercent, formatQuantity, formatSpillText, formatUnit, labelledSpill, setSignificantFigures, shortenQuantityText } from "../workbook/format";
import { labelSource, type WorkbookModel } from "../workbook/model";
import { recalculate } from "../workbook/recalc";

afterEach(() => setSignificantFigures());

describe("numbers: 4 significant figures, no exponent from 0.001 up to 1e6", () => {
  it.each([
    ["an efficiency as a fraction", 0.704475, "0.7045"],
    ["a flow in m³/h from the audit's inputs", 81.56041424282913, "81.56"],
    ["a head of about a hundred metres", 104.094, "104.1"],
    ["a whole number that needs no decimals", 2950, "2950"],
    ["a large number keeps its magnitude, rounded", 123456, "123500"],
    ["the smallest without an exponent", 0.001, "0.001"],
    ["just under a million", 999_900, "999900"],
    ["a kinematic viscosity takes an exponent", 8.39553e-7, "8.396×10⁻⁷"],
    ["a year's pumping energy in joules", 1.2345e11, "1.235×10¹¹"],
    ["a million exactly", 1e6, "1×10⁶"],
    ["negative numbers keep their sign", -3.14159, "-3.142"],
    ["zero", 0, "0"],
  ])("%s: %d → %s", (_name, x, text) => {
    expect(formatNumber(x)).toBe(text);
  });
  it("shows more figures when the user asks, and exact values stay available", () => {
    setSignificantFigures(6);
    expect(formatNumber(0.704475)).toBe("0.704475");
    expect(exactNumber(81.56041424282913)).toBe("81.56041424282913");
    expect(() => setSignificantFigures(1)).toThrow(/from 2 to 15/);
  });
  it("writes an efficiency as percent", () => {
    expect(formatPercent(0.704475)).toBe("70.45 %");
  });
});

describe("units typeset, as engineers write them", () => {
  it.each([
    ["m^3/h", "m³/h"],
    ["degC", "°C"],
    ["degF", "°F"],
    ["m^2/s", "m²/s"],
    ["ft^3/s", "ft³/s"],
    ["um", "µm"],
    ["kg/m^3", "kg/m³"],
    ["ft/s^2", "ft/s²"],
    ["ftH2O", "ftH₂O"],
    ["kg*m^-3", "kg·m⁻³"],
    ["gpm", "gpm"],
    ["Flow (m^3/h)", "Flow (m³/h)"],
  ])("%s → %s", (typed, shown) => {
    expect(formatUnit(typed)).toBe(shown);
  });
  it("joins number and unit, and shortens quantities typed as text", () => {
    expect(formatQuantity(8.39553e-7, "m^2/s")).toBe("8.396×10⁻⁷ m²/s");
    expect(shortenQuantityText("81.56041424282913 m^3/h")).toBe("81.56 m³/h");
    expect(shortenQuantityText("82 degF")).toBe("82 °F");
    expect(shortenQuantityText("93%")).toBe("93 %");
    expect(shortenQuantityText("commercial steel")).toBe("commercial steel");
  });
});

describe("spilled results labelled", () => {
  it("keeps a spill's own header row and types its units", () => {
    const t = labelledSpill([["Flow (m^3/h)", "Head (m)"], [0, 90.3312], [15, 90.7654]]);
    expect(t).toEqual({ header: ["Flow (m³/h)", "Head (m)"], rows: [["0", "90.33"], ["15", "90.77"]] });
    expect(formatSpillText(t)).toBe("Flow (m³/h)  Head (m)\n0            90.33\n15           90.77");
  });
  it("takes the spec's column labels for a spill without a header (PUMP.SELECT)", () => {
    const t = labelledSpill([[265, 104.094, 0.704475, 2.69425]], ["Impeller", "Head (m)", "Efficiency (fraction)", "NPSHr (m)"]);
    expect(t.header).toEqual(["Impeller", "Head (m)", "Efficiency (fraction)", "NPSHr (m)"]);
    expect(t.rows).toEqual([["265", "104.1", "0.7045", "2.694"]]);
  });
});

/** An invented two-sheet calculation: inputs on one sheet, results on the other. */
function station(withHeading: boolean, names: WorkbookModel["names"] = []): WorkbookModel {
  const b = new ExcelJS.Workbook();
  const inputs = b.addWorksheet("Inputs");
  inputs.getCell("A1").value = "Flow (gpm)";
  inputs.getCell("B1").value = 350;
  inputs.getCell("A2").value = "Bore (in)";
  inputs.getCell("B2").value = 6.065;
  const calc = b.addWorksheet("Calc");
  if (withHeading) calc.getCell("A1").value = "Results";
  calc.getCell("A2").value = "Velocity (ft/s)";
  calc.getCell("B2").value = { formula: 'NAPPE.VELOCITY(Inputs!B1&" gpm", Inputs!B2&" in", "ft/s")' };
  calc.getCell("A3").value = "Twice the velocity";
  calc.getCell("B3").value = { formula: "B2*2" };
  calc.getCell("A5").value = "Velocity head (ft)";
  calc.getCell("B5").value = { formula: 'NAPPE.HEAD(NAPPE.PRESSURE(NAPPE.VELOCITY(Inputs!B1&" gpm", Inputs!B2&" in")^2/(2*9.80665), 998.2), 998.2, "ft")' };
  return { ...fromExcelJS(b), names };
}

function summaryOf(wb: WorkbookModel) {
  const report = buildAudit(recalculate(wb).cells, { title: "t", source: "station.xlsx", workbook: wb }, labelSource(wb));
  return report.summary!;
}

describe("the audit opens with key results and inputs", () => {
  it("takes the formula cells under a \u201cResults\u201d heading, down to the first empty row", () => {
    const s = summaryOf(station(true));
    expect(s.results.map((r) => [r.cell, r.label])).toEqual([["Calc!B2", "Velocity (ft/s)"], ["Calc!B3", "Twice the velocity"]]);
    // 350 gpm in a 6.065 in bore: V = 0.4085·350/6.065² = 3.887 ft/s (common practice formula).
    expect(s.results[0].value).toMatch(/^3\.88\d ft\/s$/);
    expect(Number(s.results[0].exact)).toBeCloseTo((0.4085 * 350) / 6.065 ** 2, 2);
  });
  it("takes the formula cells a defined name points at", () => {
    const s = summaryOf(station(false, [{ name: "VelocityHead", refersTo: "Calc!$B$5" }]));
    expect(s.results.map((r) => [r.cell, r.label])).toEqual([["Calc!B5", "VelocityHead (Velocity head (ft))"]]);
  });
  it("without names or a heading, takes the NAPPE cells no other formula reads", () => {
    const s = summaryOf(station(false));
    // B2 is read by B3, so only B5 is an end of the calculation.
    expect(s.results.map((r) => r.cell)).toEqual(["Calc!B5"]);
    expect(s.basis).toMatch(/no other formula computes with/);
  });
  it("still takes a result that a summary sheet only shows elsewhere (=Calc!B5), labelled from its row, not by a column header", () => {
    const wb = station(false);
    const calc = wb.sheets.find((x) => x.name === "Calc")!;
    // A summary row showing B5, and a small table whose column header sits left of B5's row.
    wb.sheets.push({ name: "Summary", cells: new Map([["1:2", { sheet: "Summary", address: "B1", row: 1, col: 2, value: null, formula: "Calc!B5" }]]) });
    calc.cells.set("5:3", { sheet: "Calc", address: "C5", row: 5, col: 3, value: "K" });
    calc.cells.set("6:3", { sheet: "Calc", address: "C6", row: 6, col: 3, value: 0.5 });
    calc.cells.set("5:4", { sheet: "Calc", address: "D5", row: 5, col: 4, value: null, formula: 'NAPPE.HEAD("1 bar", 998.2, "m")' });
    const s = summaryOf(wb);
    expect(s.results.map((r) => [r.cell, r.label])).toEqual([["Calc!B5", "Velocity head (ft)"], ["Calc!D5", "Velocity head (ft)"]]);
  });
  it("lists the constant inputs the NAPPE calls read, with their labels and how they were read", () => {
    const s = summaryOf(station(true));
    expect(s.inputs.map((r) => [r.cell, r.label, r.value, r.readAs])).toEqual([
      ["Inputs!B1", "Flow (gpm)", "350", "NAPPE.VELOCITY flow: 350 gpm"],
      ["Inputs!B2", "Bore (in)", "6.065", "NAPPE.VELOCITY diameter: 6.065 in"],
    ]);
  });
  it("dates the report so every reader reads the same", () => {
    expect(readableDate(new Date(Date.UTC(2026, 11, 2, 14, 5)))).toBe("2 December 2026, 14:05 UTC");
  });
});

describe("undo of the pane's writes", () => {
  it("puts back the formula, the value and the empty cell a write replaced, last change first", async () => {
    const b = new ExcelJS.Workbook();
    const ws = b.addWorksheet("S");
    ws.getCell("A1").value = { formula: "1+1" };
    ws.getCell("A2").value = "Flow (gpm)";
    const host = new MemoryHost(fromExcelJS(b));
    const undo = new UndoStack(host);
    await undo.write("insert into S!A1", [{ sheet: "S", address: "A1" }], () => host.setFormula("S", "A1", 'NAPPE.HEAD("2 bar")'));
    await undo.write("relabel S!A2", [{ sheet: "S", address: "A2" }], () => host.setValue("S", "A2", "Flow (m^3/h)"));
    await undo.write("keep the check in S!A3", [{ sheet: "S", address: "A3" }], () => host.setFormula("S", "A3", "A1*2"));
    expect(undo.last).toBe("keep the check in S!A3");
    expect(await undo.undo()).toBe("keep the check in S!A3");
    expect((await host.cell("S", "A3")).value).toBeNull();
    expect(await undo.undo()).toBe("relabel S!A2");
    expect((await host.cell("S", "A2")).value).toBe("Flow (gpm)");
    expect(await undo.undo()).toBe("insert into S!A1");
    expect((await host.cell("S", "A1")).formula).toBe("1+1");
    expect(await undo.undo()).toBeUndefined();
  });
  it("keeps nothing when the write fails", async () => {
    const host = new MemoryHost(fromExcelJS(new ExcelJS.Workbook()));
    const undo = new UndoStack(host);
    await expect(undo.write("write to a missing sheet", [], () => host.setFormula("Nope", "A1", "1"))).rejects.toThrow(/no sheet/);
    expect(undo.last).toBeUndefined();
  });
});

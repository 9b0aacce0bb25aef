/** The pane's pure logic against the in-memory adapter: explanations, unit check, chart data, workbook check, audit sheet. */
import { join } from "node:path";
import ExcelJS from "exceljs";
import { describe, expect, it } from "vitest";
import { fromExcelJS, readWorkbook } from "../headless/readXlsx";
import { chartFor } from "../taskpane/chartData";
import { analyseCell, explainCell } from "../taskpane/explain";
import { MemoryHost } from "../taskpane/host/memory";
import { AUDIT_SHEET, auditOf, checkWorkbook, writeAuditSheet } from "../taskpane/workbookCheck";
import { auditSheetRows } from "../workbook/audit";
import { writeAction } from "../taskpane/actions";
import { labelCell, sameInputFixes } from "../taskpane/sameInput";
import { relabelled } from "../workbook/unitCheck";
import { displayFormula } from "../workbook/storedForm";

const root = join(__dirname, "..");
const demo = () => readWorkbook(join(root, "demo/orchard-pumping-station.xlsx"));

function book(build: (ws: ExcelJS.Worksheet) => void): MemoryHost {
  const b = new ExcelJS.Workbook();
  build(b.addWorksheet("S"));
  return new MemoryHost(fromExcelJS(b));
}

describe("cell explanation", () => {
  it("explains nested calls outermost first, with arguments as written", async () => {
    const host = book((ws) => {
      ws.getCell("A1").value = "Pressure";
      ws.getCell("B1").value = "2 bar";
      ws.getCell("B2").value = { formula: 'NAPPE.HEAD(NAPPE.PRESSURE(NAPPE.HEAD(B1, 1000), 1000), , "ft")' };
    });
    const e = await explainCell(host, "S", "B2");
    expect(e.calls.map((c) => c.id)).toEqual(["HEAD", "PRESSURE", "HEAD"]);
    expect(e.calls[0].args.map((a) => a.written)).toEqual(["NAPPE.PRESSURE(NAPPE.HEAD(B1, 1000), 1000)", "", '"ft"']);
    expect(e.calls[2].args[0]).toMatchObject({ written: "B1", value: "2 bar", unit: "bar", base: "200000 Pa" });
    // 2 bar = 20.3943 m of water at 1000 kg/m³; the outer HEAD takes water at 20 °C (998.206 kg/m³): 20.431 m.
    expect(e.calls[0].result).toBe("67.03 ft"); // 4 significant figures (DESIGN.md)
    expect(e.calls[0].resultBase).toBe("20.43 m");
    expect(e.calls[0].args.find((a) => a.name === "density")).toMatchObject({ written: "", why: "left out, so the default" });
  });
  it("shows a range with header units as a table with its columns' units", async () => {
    const host = new MemoryHost(await demo());
    const e = await explainCell(host, "Calc", "B28");
    const curve = e.calls[0].args.find((a) => a.name === "curve")!;
    expect(curve.written).toBe("Pump!H3:K9");
    expect(curve.base).toMatch(/Flow \(m\^3\/h\) → flow in m³\/h/); // the header as written, the unit typeset
  });
  it("says what is wrong when a NAPPE call fails", async () => {
    const host = book((ws) => (ws.getCell("A1").value = { formula: 'NAPPE.VELOCITY("1 gpm", "2 psi")' }));
    const e = await explainCell(host, "S", "A1");
    expect(e.calls[0].error).toMatch(/^diameter: "psi" is a pressure unit/);
    expect(e.error).toBeDefined();
  });
  it("has a short message for empty cells, constants and formulas without NAPPE", async () => {
    const host = book((ws) => {
      ws.getCell("A1").value = 5;
      ws.getCell("A2").value = { formula: "A1*2" };
    });
    expect((await explainCell(host, "S", "C9")).message).toMatch(/^Empty cell/);
    expect((await explainCell(host, "S", "A1")).message).toMatch(/^A constant/);
    expect((await explainCell(host, "S", "A2")).message).toMatch(/calls no NAPPE function/);
  });
});

describe("unit check", () => {
  it("warns on a bare number labelled in another unit and offers the fix that joins the unit", async () => {
    const host = new MemoryHost(await demo());
    const [call] = (await explainCell(host, "Calc", "B21")).calls;
    expect(call.unitWarnings).toHaveLength(1);
    expect(call.unitWarnings[0].fixedFormula).toBe('NAPPE.HEADLOSS(B11&" m^3/h", B16, Inputs!B14&" ft", B18, B6)');
    await host.setFormula("Calc", "B21", call.unitWarnings[0].fixedFormula!);
    expect((await explainCell(host, "Calc", "B21")).calls[0].unitWarnings).toEqual([]);
  });
  it("offers the other fix: the label corrected to the unit the number is read in, found again and rewritten", async () => {
    const host = new MemoryHost(await demo());
    const [call] = (await explainCell(host, "Calc", "B21")).calls;
    const label = call.unitWarnings[0].label!;
    expect(label).toEqual({ sheet: "Inputs", address: "B14", text: "Suction pipe length (ft)", corrected: "Suction pipe length (m)" });
    const at = (await labelCell(host, label, label.text))!;
    expect(at).toEqual({ sheet: "Inputs", address: "A14" });
    await host.setValue(at.sheet, at.address, label.corrected);
    // The formula is untouched; with the label saying m, nothing is left to warn about.
    expect((await explainCell(host, "Calc", "B21")).calls[0].unitWarnings).toEqual([]);
    expect(displayFormula((await host.cell("Calc", "B21")).formula!)).toBe('NAPPE.HEADLOSS(B11&" m^3/h", B16, Inputs!B14, B18, B6)');
  });
  it("corrects only the unit of a label, wherever it is written", () => {
    expect(relabelled("Suction pipe length (ft)", "ft", "m")).toBe("Suction pipe length (m)");
    expect(relabelled("Flow [gpm] at duty", "gpm", "m^3/s")).toBe("Flow [m^3/s] at duty");
    expect(relabelled("ft", "ft", "m")).toBe("m");
    expect(relabelled('Head, "ft"', "ft", "m")).toBe('Head, "m"');
  });
  it("does not offer to rewrite a unit that comes from a number format", async () => {
    const host = book((ws) => {
      ws.getCell("B1").value = 400;
      ws.getCell("B1").numFmt = '0.0 "gpm"';
      ws.getCell("B2").value = { formula: 'NAPPE.VELOCITY(B1, "4 in")' };
    });
    const [call] = (await explainCell(host, "S", "B2")).calls;
    expect(call.unitWarnings.find((w) => w.fixedFormula)!.label).toBeUndefined();
  });
  it("reads a unit from the number format", async () => {
    const host = book((ws) => {
      ws.getCell("B1").value = 400;
      ws.getCell("B1").numFmt = '0.0 "gpm"';
      ws.getCell("B2").value = { formula: 'NAPPE.VELOCITY(B1, "4 in")' };
    });
    const [call] = (await explainCell(host, "S", "B2")).calls;
    const labelled = call.unitWarnings.find((w) => w.fixedFormula)!;
    expect(labelled.message).toMatch(/labelled "0.0 "gpm"" but its bare number 400 is read as 400 m³\/s/);
    expect(labelled.fixedFormula).toBe('NAPPE.VELOCITY(B1&" gpm", "4 in")');
  });
  it("reports a label of another dimension without a fix", async () => {
    const host = book((ws) => {
      ws.getCell("A1").value = "Pressure (psi)";
      ws.getCell("B1").value = 0.1;
      ws.getCell("B2").value = { formula: "NAPPE.VELOCITY(0.01, B1)" };
    });
    const [call] = (await explainCell(host, "S", "B2")).calls;
    expect(call.unitWarnings[0].message).toMatch(/pressure\) but diameter expects a length/);
    expect(call.unitWarnings[0].fixedFormula).toBeUndefined();
  });
  it("is quiet when the label names the base unit or the value is a text quantity", async () => {
    const host = book((ws) => {
      ws.getCell("A1").value = "Diameter (m)";
      ws.getCell("B1").value = 0.1;
      ws.getCell("A2").value = "Flow (gpm)";
      ws.getCell("B2").value = "400 gpm";
      ws.getCell("B3").value = { formula: "NAPPE.VELOCITY(B2, B1)" };
    });
    expect((await explainCell(host, "S", "B3")).calls[0].unitWarnings).toEqual([]);
  });
});

describe("chart data", () => {
  it("draws the pump curve, system curve and operating point of PUMP.DUTY in the table's units", async () => {
    const host = new MemoryHost(await demo());
    const { outcome } = await analyseCell(host, "Calc", "B28");
    const chart = chartFor(outcome!.calls)!;
    expect([chart.flowUnit, chart.headUnit, chart.efficiencyUnit]).toEqual(["m^3/h", "m", "%"]);
    expect(chart.series.map((s) => s.name)).toEqual(["Pump curve (points)", "Pump curve", "Efficiency", "BEP", "Preferred region (70–120 % of BEP)", "NPSHr", "System curve", "Operating point"]);
    // NPSH has a panel of its own, so a margin of a few metres reads beside a hundred metres of head.
    expect(chart.series.filter((s) => s.axis === "npsh").map((s) => s.name)).toEqual(["NPSHr"]);
    // The BEP is PUMP.BEP's (Envelope!A16: 109.449 m³/h); the region's sides are 70 % and 120 % of it (common practice).
    expect(chart.series.find((s) => s.name === "BEP")!.points[0].x).toBeCloseTo(109.449, 3);
    expect(chart.series.find((s) => s.name.startsWith("Preferred"))!.points.map((p) => p.x)).toEqual([0.7, 0.7, 1.2, 1.2].map((f) => expect.closeTo(f * 109.449, 2)));
    // With the workbook's NPSHa (Calc!B36) drawn against NPSHr in the cell view.
    const drawn = (await explainCell(host, "Calc", "B28")).chart!;
    const npsha = drawn.series.find((s) => s.name === "NPSHa (Calc!B36)")!;
    expect(npsha.points[0].y).toBeCloseTo(3.94789, 4);
    expect(chart.operatingPoint!.x).toBeCloseTo(87.4559, 3);
    expect(chart.operatingPoint!.y).toBeCloseTo(102.3, 3);
    // The operating point lies on both drawn curves (interpolating the sampled lines).
    const onLine = (name: string) => {
      const pts = chart.series.find((s) => s.name === name)!.points;
      const i = pts.findIndex((p) => p.x >= chart.operatingPoint!.x);
      const [a, b] = [pts[i - 1], pts[i]];
      return a.y + ((b.y - a.y) * (chart.operatingPoint!.x - a.x)) / (b.x - a.x);
    };
    expect(Math.abs(onLine("System curve") - chart.operatingPoint!.y)).toBeLessThan(0.05);
    expect(Math.abs(onLine("Pump curve") - chart.operatingPoint!.y)).toBeLessThan(0.05);
    // Table points are in the header's units (Pump!H4:I4: 0 m³/h, 114.7 m for the 265 mm impeller).
    expect(chart.series[0].points[0]).toEqual({ x: 0, y: 114.7 });
  });
  it("draws an envelope: each case's system curve and operating point, the parallel curve, and each case's NPSHa falling with flow", async () => {
    const host = new MemoryHost(await demo());
    const chart = chartFor((await analyseCell(host, "Envelope", "A19")).outcome!.calls)!;
    const names = chart.series.map((s) => s.name);
    expect(names).toContain("2 pumps in parallel");
    for (const c of ["design: summer, new pipe", "reservoir low, aged pipe", "reservoir high, cold spring", "second pump on"]) {
      expect(names).toContain(`System: ${c}`);
      expect(names).toContain(`Point: ${c}`);
      const npsha = chart.series.find((s) => s.name === `NPSHa: ${c}`)!;
      expect(npsha.axis).toBe("npsh");
      expect(npsha.points[npsha.points.length - 1].y).toBeLessThan(npsha.points[0].y); // suction losses grow with flow
    }
    // The second pump's point sits at the total flow the envelope table gives (Envelope!B23: 116.624 m³/h).
    expect(chart.series.find((s) => s.name === "Point: second pump on")!.points[0].x).toBeCloseTo(116.624, 2);
    expect(chart.npshFlowLabel).toBe("Flow per pump");
  });
  it("draws the trimmed curve through the duty point for TRIM", async () => {
    const host = new MemoryHost(await demo());
    const chart = chartFor((await analyseCell(host, "Calc", "B29")).outcome!.calls)!;
    const trimmed = chart.series.find((s) => s.name === "Trimmed curve")!.points;
    const op = chart.operatingPoint!;
    const i = trimmed.findIndex((p) => p.x >= op.x);
    const y = trimmed[i - 1].y + ((trimmed[i].y - trimmed[i - 1].y) * (op.x - trimmed[i - 1].x)) / (trimmed[i].x - trimmed[i - 1].x);
    expect(Math.abs(y - op.y)).toBeLessThan(0.2);
  });
  it("has no chart for functions that are not about pumps or systems", async () => {
    const host = new MemoryHost(await demo());
    expect((await explainCell(host, "Calc", "B9")).chart).toBeUndefined();
  });
});

describe("workbook check and audit sheet", () => {
  it("lists every NAPPE formula with status and counts, including the unit check", async () => {
    const host = new MemoryHost(await demo());
    const progress: number[] = [];
    const check = await checkWorkbook(host, (d) => progress.push(d));
    expect(check.rows.length).toBe(34);
    expect(check.counts.ok + check.counts.warning + check.counts.error).toBe(34);
    expect(check.counts.error).toBe(0);
    expect(check.rows.find((r) => r.address === "B21")).toMatchObject({ status: "warning", formula: '=NAPPE.HEADLOSS(B11&" m^3/h", B16, Inputs!B14, B18, B6)' });
    expect(progress[progress.length - 1]).toBe(34);
  });
  it("writes the audit sheet from the same audit model, replacing only that sheet", async () => {
    const host = new MemoryHost(await demo());
    const before = host.workbook.sheets.map((s) => [s.name, s.cells.size]);
    const check = await checkWorkbook(host);
    await writeAuditSheet(host, check, "demo");
    await writeAuditSheet(host, check, "demo");
    const names = host.workbook.sheets.map((s) => s.name);
    expect(names.filter((n) => n === AUDIT_SHEET)).toHaveLength(1);
    expect(host.workbook.sheets.filter((s) => s.name !== AUDIT_SHEET).map((s) => [s.name, s.cells.size])).toEqual(before);
    const { rows, headerRow } = auditSheetRows(auditOf(check, "demo"));
    expect(rows[headerRow]).toEqual(["Cell", "Formula", "Status", "Result", "Exact", "Function and purpose", "Inputs (as written → as read)", "Warnings, assumptions, sources, cautions"]);
    const audit = host.workbook.sheets.find((s) => s.name === AUDIT_SHEET)!;
    const text = [...audit.cells.values()].map((c) => String(c.value)).join("\n");
    expect(text).toMatch(/Unit check: Inputs!B14 is labelled/);
    expect(text).toMatch(/design aid for preliminary sizing/);
    expect(text).toMatch(/NAPPE\.NPSHA/);
  });
});

describe("actions that write to the workbook", () => {
  it("say why they failed instead of swallowing the failure", async () => {
    const said: string[] = [];
    await writeAction({ say: (t) => said.push(t) }, "join the unit in Calc!B21", async () => {
      throw new Error("The cell is locked: the sheet is protected.");
    });
    expect(said).toEqual(["Could not join the unit in Calc!B21: The cell is locked: the sheet is protected."]);
  });
});

describe("implausible magnitudes", () => {
  it("warns on a bare flow of 4000 (4000 m³/s) and a bare diameter of 150 (150 m)", async () => {
    const host = book((ws) => {
      ws.getCell("B1").value = 4000;
      ws.getCell("B2").value = { formula: "NAPPE.VELOCITY(B1, 150)" };
    });
    const [call] = (await explainCell(host, "S", "B2")).calls;
    const messages = call.unitWarnings.map((w) => w.message).join("\n");
    expect(messages).toMatch(/flow is a bare 4000 read as 4000 m³\/s, an implausible volume flow/);
    expect(messages).toMatch(/diameter is a bare 150 read as 150 m/);
  });
  it("is quiet for ordinary sizes", async () => {
    const host = book((ws) => (ws.getCell("B2").value = { formula: "NAPPE.VELOCITY(0.02, 0.15)" }));
    expect((await explainCell(host, "S", "B2")).calls[0].unitWarnings).toEqual([]);
  });
});

describe("units traced through references and tables", () => {
  function traced(): MemoryHost {
    const wb = new ExcelJS.Workbook();
    const inputs = wb.addWorksheet("Inputs");
    inputs.getCell("A1").value = "Pipe length (ft)";
    inputs.getCell("B1").value = 100;
    inputs.getCell("A2").value = "Flow (gpm)";
    inputs.getCell("B2").value = 400;
    const calc = wb.addWorksheet("Calc");
    // A copy of the input under a "Length (m)" header: the table reads 100 ft as 100 m.
    [["Length (m)", "ID (in)", "Roughness (mm)", "K"], [{ formula: "Inputs!B1" }, 6.065, 0.045, 2]].forEach((row, i) => row.forEach((v, j) => (calc.getCell(1 + i, 1 + j).value = v as ExcelJS.CellValue)));
    calc.getCell("F1").value = "Flow copy";
    calc.getCell("F2").value = { formula: "Inputs!B2" }; // a plain reference to a labelled input
    calc.getCell("G1").value = { formula: 'NAPPE.SYSTEM.HEAD(Inputs!B2&" gpm", 10, A1:D2)' };
    calc.getCell("G2").value = { formula: 'NAPPE.VELOCITY(F2, "6 in")' };
    return new MemoryHost(fromExcelJS(wb));
  }
  it("flags a table cell that copies an input labelled in another unit than its column header", async () => {
    const e = await explainCell(traced(), "Calc", "G1");
    expect(e.calls[0].unitWarnings.map((w) => w.message)).toEqual([
      'A2, under "Length (m)", copies Inputs!B1, labelled "Pipe length (ft)": the table reads its number in m, not ft. Convert it in the table (or change the header), or correct the label.',
    ]);
  });
  it("follows a plain reference to the labelled input it copies", async () => {
    const e = await explainCell(traced(), "Calc", "G2");
    expect(e.calls[0].unitWarnings.map((w) => w.message)).toContainEqual(expect.stringMatching(/^F2 copies Inputs!B2, labelled "Flow \(gpm\)", but its bare number 400 is read as 400 m³\/s/));
    expect(e.calls[0].unitWarnings.map((w) => w.fixLabel)).toContain('F2&" gpm"');
  });
  it("the whole-workbook check finds both, as the headless audit does", async () => {
    const check = await checkWorkbook(traced());
    expect(check.rows.filter((r) => r.status === "warning").map((r) => r.address).sort()).toEqual(["G1", "G2"]);
  });
});

describe("the same input read elsewhere", () => {
  it("lists, after the fix of Calc!B21, the table cell that copies Inputs!B14 too, with its fix", async () => {
    const host = new MemoryHost(await demo());
    const fixes = await sameInputFixes(host, { sheet: "Inputs", address: "B14" }, "ft", { sheet: "Calc", address: "B21" });
    expect(fixes).toEqual([{ sheet: "Calc", address: "E4", formula: "Inputs!B14", fixed: 'Inputs!B14&" ft"' }]);
    // Applied, the table reads 30 ft: no unit finding is left on the calls that read the table.
    for (const f of fixes) await host.setFormula(f.sheet, f.address, f.fixed);
    const e = await explainCell(host, "Calc", "B25");
    expect(e.calls[0].unitWarnings).toEqual([]);
    expect(e.calls[0].args.find((a) => a.name === "segments")!.base).toMatch(/Length \(m\) → length in m/);
  });
});

/**
 * One model of an explained call: the pane's cell view, the audit model, the HTML report, the
 * text table and both audit sheets (written headless and by the pane) show the same fields of
 * the same call, because they are all built from workbook/callView.ts.
 */
import { join } from "node:path";
import ExcelJS from "exceljs";
import { describe, expect, it } from "vitest";
import { DEMO_FILE } from "../demo/build";
import { labelSource, readWorkbook } from "../headless/readXlsx";
import { addAuditSheet, renderTable } from "../headless/render";
import { escapeHtml, renderHtml } from "../headless/renderHtml";
import { explainCell } from "../taskpane/explain";
import { MemoryHost } from "../taskpane/host/memory";
import { auditOf, checkWorkbook } from "../taskpane/workbookCheck";
import { auditSheetRows, buildAudit } from "../workbook/audit";
import { recalculate } from "../workbook/recalc";

const demo = () => readWorkbook(join(__dirname, "..", "demo", DEMO_FILE));

describe("one call, every view", () => {
  it("the pane and the audit hold the same view of Calc!B21 (HEADLOSS), and every renderer shows its fields", async () => {
    const wb = await demo();
    const pane = (await explainCell(new MemoryHost(await demo()), "Calc", "B21")).calls[0];
    const report = buildAudit(recalculate(wb).cells, { title: "t", source: "s" }, labelSource(wb));
    const audited = report.entries.find((e) => e.sheet === "Calc" && e.address === "B21")!.calls[0];
    const { text: _text, unitWarnings, ...paneView } = pane;
    expect(paneView).toEqual(audited);
    expect(unitWarnings.map((w) => w.message)).toEqual(audited.unitFindings.map((f) => f.message));
    // The fields a reviewer compares against a hand calculation.
    expect(audited.args.find((a) => a.name === "length")).toMatchObject({ written: "Inputs!B14", value: "30", unit: "m", base: "30 m" });
    expect(audited.args.find((a) => a.name === "flow")).toMatchObject({ written: 'B11&" m^3/h"', unit: "m³/h" }); // typed as m^3/h, typeset
    expect(audited.resultBase).toBe(audited.result); // HEADLOSS here asks for no unit: base unit, m

    const html = renderHtml(report);
    for (const a of audited.args) for (const field of [a.written, a.value, a.why, a.base]) expect(html).toContain(escapeHtml(field));
    expect(html).toContain(escapeHtml(audited.result!));

    const table = renderTable(recalculate(wb).cells);
    expect(table).toMatch(/Calc\s+B21\s+=NAPPE\.HEADLOSS/);

    const book = new ExcelJS.Workbook();
    const sheetText: string[] = [];
    addAuditSheet(book, report).eachRow((row) => row.eachCell((c) => sheetText.push(String(c.value))));
    const paneRows = auditSheetRows(auditOf(await checkWorkbook(new MemoryHost(await demo())), "s")).rows.flat();
    for (const a of audited.args) {
      const line = `${a.name}: ${a.written} → `;
      expect(sheetText.some((t) => t.includes(line)), `headless sheet: ${line}`).toBe(true);
      expect(paneRows.some((t) => t.includes(line)), `pane sheet: ${line}`).toBe(true);
    }
  });
});

describe("views of very large workbooks", () => {
  it("the recalc table takes 300 000 formulas (no argument list as long as the rows, which overflows the stack)", () => {
    const row = { sheet: "Plain", address: "A1", formula: "=B1*2", value: 2, unit: "", cached: 2, difference: 0, status: "ok" as const, messages: [], calls: [], recalculated: true };
    const table = renderTable(Array.from({ length: 300_000 }, () => row));
    expect(table.split("\n")).toHaveLength(300_002);
  });
});

/**
 * The Office.js adapter against a small in-memory stand-in for Excel's JavaScript API (no Excel
 * runs here). It checks the adapter's own mapping: formulas without "=", values, number formats,
 * labels, writes, the formula scan and the audit sheet. It cannot check Excel itself.
 */
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { addressOf, parseAddress } from "../workbook/address";
import { namesAnotherSheet, OfficeHost } from "../taskpane/host/office";
import { auditOf, checkWorkbook } from "../taskpane/workbookCheck";
import { explainCell } from "../taskpane/explain";
import { run } from "./helpers";

type Cell = { formula?: string; value: unknown; format?: string };
class FakeSheet {
  cells = new Map<string, Cell>();
  deleted = false;
  frozenRows = 0;
  pageLayout: Record<string, unknown> = {};
  names = { items: [] as { name: string; formula: string }[], load() {} };
  constructor(public name: string) {}
  get freezePanes() {
    return { freezeRows: (n: number) => (this.frozenRows = n) };
  }
  getRange(address: string) {
    const [a, b] = address.split(":");
    const from = parseAddress(a);
    const to = parseAddress(b ?? a);
    return new FakeRange(this, from.row, from.col, to.row - from.row + 1, to.col - from.col + 1);
  }
  getRangeByIndexes(r: number, c: number, rows: number, cols: number) {
    return new FakeRange(this, r + 1, c + 1, rows, cols);
  }
  getUsedRangeOrNullObject() {
    const keys = [...this.cells.keys()].map((k) => parseAddress(k));
    if (!keys.length) return { isNullObject: true, load() {} };
    const maxR = Math.max(...keys.map((k) => k.row));
    const maxC = Math.max(...keys.map((k) => k.col));
    const r = new FakeRange(this, 1, 1, maxR, maxC);
    return Object.assign(r, { isNullObject: false, rowIndex: 0, columnIndex: 0, rowCount: maxR, columnCount: maxC });
  }
  activate() {}
  delete() {
    this.deleted = true;
  }
  load() {}
}
class FakeRange {
  format = { wrapText: false, verticalAlignment: "", font: { bold: false, color: "" }, fill: { color: "" }, columnWidth: 0 };
  constructor(public sheet: FakeSheet, public row: number, public col: number, public rows: number, public cols: number) {}
  load() {}
  select() {
    fake.selected = { sheet: this.sheet.name, address: addressOf(this.row, this.col) };
  }
  get address() {
    return `${this.sheet.name}!${addressOf(this.row, this.col)}`;
  }
  get worksheet() {
    return this.sheet;
  }
  private grid<T>(f: (c: Cell | undefined) => T): T[][] {
    return Array.from({ length: this.rows }, (_, i) => Array.from({ length: this.cols }, (_, j) => f(this.sheet.cells.get(addressOf(this.row + i, this.col + j)))));
  }
  get values() {
    return this.grid((c) => (c ? c.value : ""));
  }
  set values(v: unknown[][]) {
    v.forEach((row, i) => row.forEach((x, j) => {
      const address = addressOf(this.row + i, this.col + j);
      this.sheet.cells.set(address, { value: x, format: this.sheet.cells.get(address)?.format });
    }));
  }
  get formulas() {
    return this.grid((c) => (c?.formula ? `=${c.formula}` : c ? c.value : ""));
  }
  set formulas(v: unknown[][]) {
    v.forEach((row, i) => row.forEach((x, j) => this.sheet.cells.set(addressOf(this.row + i, this.col + j), { formula: String(x).replace(/^=/, ""), value: 0 })));
  }
  get numberFormat() {
    return this.grid((c) => c?.format ?? "General");
  }
  set numberFormat(v: unknown[][]) {
    v.forEach((row, i) => row.forEach((f, j) => {
      const address = addressOf(this.row + i, this.col + j);
      this.sheet.cells.set(address, { ...(this.sheet.cells.get(address) ?? { value: "" }), format: String(f) });
    }));
  }
}
const fake = { sheets: [] as FakeSheet[], active: { sheet: "Calc", address: "B2" }, selected: undefined as undefined | { sheet: string; address: string }, handlers: [] as (() => void)[], syncs: 0 };

function install() {
  const sheetByName = (n: string) => fake.sheets.find((s) => s.name === n && !s.deleted)!;
  const context = {
    workbook: {
      // Workbook.name (ExcelApi 1.7): the file name the audit shows.
      name: "Station sizing.xlsx",
      load() {},
      getActiveCell: () => sheetByName(fake.active.sheet).getRange(fake.active.address),
      onSelectionChanged: { add: (h: () => void) => fake.handlers.push(h) },
      names: { items: [{ name: "Flow", formula: "=Calc!$B$1" }], load() {} },
      worksheets: {
        getItem: sheetByName,
        getItemOrNullObject: (n: string) => sheetByName(n) ?? { isNullObject: true },
        add: (n: string) => {
          const s = new FakeSheet(n);
          fake.sheets.push(s);
          return s;
        },
        load() {},
        get items() {
          return fake.sheets.filter((s) => !s.deleted);
        },
      },
    },
    // Every sync is one round trip to Excel.
    sync: async () => void fake.syncs++,
  };
  (globalThis as Record<string, unknown>).Excel = { run: async (f: (c: typeof context) => unknown) => f(context), PageOrientation: { landscape: "Landscape" } };
  const calc = new FakeSheet("Calc");
  calc.cells.set("A1", { value: "Flow (gpm)" });
  calc.cells.set("B1", { value: 400, format: '0 "gpm"' });
  calc.cells.set("B2", { formula: 'NAPPE.VELOCITY(B1&" gpm", "4 in")', value: 3.11 });
  calc.cells.set("B3", { formula: "B2*2", value: 6.22 });
  calc.names.items.push({ name: "Pipe", formula: '="4 in"' });
  fake.sheets = [calc];
}

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

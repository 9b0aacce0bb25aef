/**
 * End-to-end tests of the nappe command and the recalculation engine: the demo workbook, a
 * hand-built workbook whose expected values come from the reference tests, the reports, and
 * bad input.
 */
import { execFile } from "node:child_process";
import { createHash } from "node:crypto";
import { copyFileSync, existsSync, readFileSync, readdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import ExcelJS from "exceljs";
import { describe, expect, it } from "vitest";
import { DEMO_FILE, demoWorkbookBytes } from "../demo/build";
import { recalculate } from "../workbook/recalc";
import { fromExcelJS, readWorkbook } from "../headless/readXlsx";
import { nappe, relativeError, tempDir } from "./helpers";

const root = join(__dirname, "..");

async function save(book: ExcelJS.Workbook, path: string): Promise<string> {
  writeFileSync(path, Buffer.from(await book.xlsx.writeBuffer()));
  return path;
}

/** A hand-built workbook whose NAPPE cells have known values (sources as in the reference tests). */
function handBuilt(): { book: ExcelJS.Workbook; expected: Record<string, number> } {
  const book = new ExcelJS.Workbook();
  const ws = book.addWorksheet("Checks");
  const put = (addr: string, v: ExcelJS.CellValue) => (ws.getCell(addr).value = v);
  put("A1", "Temperature");
  put("B1", "300 K");
  put("A2", "Pressure");
  put("B2", "3 MPa");
  put("C1", { formula: "NAPPE.WATER.DENSITY(B1, B2)" }); // IAPWS-IF97 table 5: 1/0.100215168e-2
  put("C2", { formula: 'NAPPE.WATER.VAPORPRESSURE("500 K", "MPa")' }); // IAPWS-IF97 table 35: 2.63889776
  put("C3", { formula: 'NAPPE.ATMPRESSURE(1000)' }); // US Standard Atmosphere 1976: 89876 Pa
  put("C4", { formula: 'NAPPE.CONVERT(1, "psi", "Pa")' }); // NIST SP 811: 6894.757
  put("B5", 126400);
  put("C5", { formula: "NAPPE.FRICTION(B5, 0.000042)" }); // Çengel & Cimbala worked example: 0.0174 (from memory)
  put("C6", { formula: 'ROUND(NAPPE.PIPE.ID(6, 40, "in"), 3)' }); // ASME B36.10M: 6.065 in (from memory)
  put("C7", { formula: 'SUM(C1:C2)*2 - C1*2 + IF(C3>80000, 1, 0)' }); // arithmetic, SUM, IF
  put("C8", { formula: 'NAPPE.HEAD(NAPPE.PRESSURE(10, 1000), 1000, "ft")' }); // 10 m = 32.8084 ft (definition)
  return {
    book,
    expected: { C1: 1 / 0.100215168e-2, C2: 2.63889776, C3: 89876, C4: 6894.757, C5: 0.0174, C6: 6.065, C7: 2 * 2.63889776 + 1, C8: 10 / 0.3048 },
  };
}

describe("recalculation of a hand-built workbook", () => {
  it("matches the reference values (IAPWS-IF97, US 1976, NIST SP 811, handbook)", () => {
    const { book, expected } = handBuilt();
    const result = recalculate(fromExcelJS(book), { all: true });
    for (const [addr, want] of Object.entries(expected)) {
      const v = result.valueOf("Checks", addr) as number;
      expect(relativeError(v, want), `${addr} = ${v}`).toBeLessThan(addr === "C5" ? 5e-3 : 2e-4);
    }
  });
  it("reports an uncached cell as ok and a stale cached value as an error", async () => {
    const { book } = handBuilt();
    book.getWorksheet("Checks")!.getCell("C3").value = { formula: "NAPPE.ATMPRESSURE(1000)", result: 90000 };
    const cells = recalculate(fromExcelJS(book)).cells;
    expect(cells.find((c) => c.address === "C3")).toMatchObject({ status: "error", cached: 90000 });
    expect(cells.find((c) => c.address === "C1")).toMatchObject({ status: "ok", cached: null });
  });
  it("reports a circular reference on every cell of the loop", () => {
    const book = new ExcelJS.Workbook();
    const ws = book.addWorksheet("Loop");
    ws.getCell("A1").value = { formula: "NAPPE.HEAD(A2)" };
    ws.getCell("A2").value = { formula: "A1+1" };
    const result = recalculate(fromExcelJS(book), { all: true });
    for (const c of result.cells) {
      expect(c.status).toBe("error");
      expect(c.messages.join(" ")).toMatch(/circular reference: Loop!A\d → Loop!A\d → Loop!A\d/);
    }
  });
  it("reports a formula that cannot be parsed, and an unknown function", () => {
    const book = new ExcelJS.Workbook();
    const ws = book.addWorksheet("Bad");
    ws.getCell("A1").value = { formula: "NAPPE.HEAD(1," };
    ws.getCell("A2").value = { formula: "NAPPE.NOSUCH(1)" };
    const cells = recalculate(fromExcelJS(book)).cells;
    expect(cells[0]).toMatchObject({ status: "error" });
    expect(cells[0].messages[0]).toMatch(/could not be parsed/);
    expect(cells[1]).toMatchObject({ status: "error" });
  });
  it("passes the argument error message through, naming the argument", () => {
    const book = new ExcelJS.Workbook();
    book.addWorksheet("E").getCell("A1").value = { formula: 'NAPPE.VELOCITY("100 gpm", "35 psi")' };
    const [cell] = recalculate(fromExcelJS(book)).cells;
    expect(cell.value).toBe("#VALUE!");
    expect(cell.messages.join(" ")).toMatch(/diameter: "psi" is a pressure unit/);
  });
});

describe("the demo workbook", () => {
  it("committed copy matches a fresh build: same formulas and cached values (npm run demo:build)", async () => {
    const committed = await readWorkbook(join(root, "demo", DEMO_FILE));
    const dir = tempDir();
    writeFileSync(join(dir, "fresh.xlsx"), await demoWorkbookBytes());
    const fresh = await readWorkbook(join(dir, "fresh.xlsx"));
    const flat = (wb: typeof fresh) =>
      wb.sheets.flatMap((s) => [...s.cells.values()].map((c) => `${s.name}!${c.address} ${c.formula ?? ""} ${typeof c.value === "number" ? c.value.toPrecision(12) : String(c.value)}`)).sort();
    expect(flat(committed)).toEqual(flat(fresh));
  });
  it("recalculates with no errors and matches its cached values", async () => {
    const result = recalculate(await readWorkbook(join(root, "demo", DEMO_FILE)));
    expect(result.cells.length).toBeGreaterThan(25);
    expect(result.cells.filter((c) => c.status === "error")).toEqual([]);
  });
  it("labels itself as invented demo data", async () => {
    const wb = await readWorkbook(join(root, "demo", DEMO_FILE));
    for (const s of wb.sheets) expect(String(s.cells.get("2:1")?.value)).toMatch(/INVENTED DEMO DATA/);
  });
});

describe("the nappe command", () => {
  it("computes plain formulas with its own engine and loads no writer (exceljs, KaTeX) for a recalculation", async () => {
    const dir = tempDir();
    const book = new ExcelJS.Workbook();
    const ws = book.addWorksheet("Plain");
    for (let r = 1; r <= 3; r++) {
      ws.getCell(r, 1).value = r;
      ws.getCell(r, 2).value = { formula: `IF(A${r}>1,SQRT(A${r}),A${r}*2)+Plain!A1` };
    }
    ws.getCell(4, 2).value = { formula: "SUM({1,2,3})" };
    const plain = await save(book, join(dir, "plain.xlsx"));
    const a = await new Promise<{ stdout: string; stderr: string }>((done) =>
      execFile(process.execPath, ["--require", join(root, "test/fixtures/loadedModules.cjs"), join(root, "bin/nappe.mjs"), "recalc", "--all", "--allow-empty", plain], (_, stdout, stderr) => done({ stdout, stderr })),
    );
    // 1 + √3 (Microsoft's SQRT page); an array constant's sum (SUM page).
    expect(a.stdout).toMatch(/Plain\s+B3\s+=IF\(A3>1,SQRT\(A3\),A3\*2\)\+Plain!A1\s+2\.732\s/);
    expect(a.stdout).toMatch(/Plain\s+B4\s+=SUM\(\{1,2,3\}\)\s+6\s/);
    expect(a.stderr).toContain("loaded: []");
  });
  it("runs from the sources under Node's own module loader too (npm run nappe:dev, the scripts)", async () => {
    // Node's ESM loader sees fewer names in CommonJS packages than the bundler and the test runner do.
    const r = await new Promise<{ code: number | null; stdout: string }>((done) =>
      execFile(process.execPath, [join(root, "node_modules/tsx/dist/cli.mjs"), join(root, "headless/cli.ts"), "recalc", join(root, "demo", DEMO_FILE)], { cwd: root, maxBuffer: 1 << 24 }, (e, stdout) => done({ code: e ? (e.code as number) : 0, stdout })),
    );
    expect(r.stdout).toMatch(/34 NAPPE formulas found in \d+ formulas \(34 recalculated\)/);
    expect(r.code).toBe(0);
  });
  it("recalc prints the table and exits 0 on the demo workbook", async () => {
    const r = await nappe("recalc", join(root, "demo", DEMO_FILE));
    expect(r.code).toBe(0);
    // At 80 columns the cached and difference columns show only when a value differs from its cache.
    expect(r.stdout).toMatch(/^sheet\s+cell\s+formula\s+value\s+unit\s+status$/m);
    expect(r.stdout).toMatch(/34 NAPPE formulas found in \d+ formulas \(34 recalculated\):\n {2}\d+ ok, \d+ warning, 0 error/);
    const wide = await nappe("recalc", join(root, "demo", DEMO_FILE), "--wide");
    expect(wide.stdout).toMatch(/^sheet\s+cell\s+formula\s+value\s+unit\s+cached\s+difference\s+status/m);
    expect(wide.stdout).toMatch(/34 NAPPE formulas found in \d+ formulas \(34 recalculated\): \d+ ok, \d+ warning, 0 error/);
  });
  it("recalc shows a spilled result's rows under it: up to 5, then how many more; --spills all for every row", async () => {
    const demoPath = join(root, "demo", DEMO_FILE);
    const r = await nappe("recalc", demoPath, "--wide");
    // The operating point (one row, flow and head) under its formula, labelled by the function's columns.
    expect(r.stdout).toMatch(/Calc\s+B28\s+=NAPPE\.PUMP\.DUTY.*\n\s+Flow \(m³\/h\)\s+Head \(m\)\n\s+87\.46\s+102\.3\n/);
    // The system curve (11 points): 5 shown, then the rest counted.
    expect(r.stdout).toMatch(/Calc\s+J3\s+=NAPPE\.SYSTEM\.CURVE.*\n\s+Flow \(m³\/h\)\s+Head \(m\)\n(\s+[\d.]+\s+[\d.]+\n){5}\s+… 6 more rows \(--spills all\)\n/);
    const all = await nappe("recalc", demoPath, "--spills", "all", "--wide");
    expect(all.stdout).toMatch(/Calc\s+J3\s+=NAPPE\.SYSTEM\.CURVE.*\n\s+Flow \(m³\/h\)\s+Head \(m\)\n(\s+[\d.]+\s+[\d.]+\n){11}(\s+- .*\n)*Calc/);
    const bad = await nappe("recalc", demoPath, "--spills", "some");
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/--spills takes a number of rows or "all"; got some/);
  });
  it("shows 4 significant figures, or as many as --digits asks; a bad --digits is a usage error", async () => {
    const demoPath = join(root, "demo", DEMO_FILE);
    const four = await nappe("recalc", demoPath);
    expect(four.stdout).toMatch(/Calc\s+B9\s+=NAPPE\.HEAD\(Inputs!B10, B5, "m"\)\s+49\.13\s+m\s/); // 480 kPa over ρg at 28 °C (82 °F)
    const six = await nappe("recalc", demoPath, "--digits", "6");
    expect(six.stdout).toMatch(/Calc\s+B9\s+=NAPPE\.HEAD\(Inputs!B10, B5, "m"\)\s+49\.128\d\s+m\s/);
    const bad = await nappe("recalc", demoPath, "--digits", "1");
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/--digits must be a whole number from 2 to 15; got 1/);
  });
  it("recalc exits 1 when a cell differs from its cached value, and never modifies the file", async () => {
    const dir = tempDir();
    const { book } = handBuilt();
    book.getWorksheet("Checks")!.getCell("C3").value = { formula: "NAPPE.ATMPRESSURE(1000)", result: 90000 };
    const path = await save(book, join(dir, "stale.xlsx"));
    const before = createHash("sha256").update(readFileSync(path)).digest("hex");
    const r = await nappe("recalc", path);
    expect(r.code).toBe(1);
    expect(r.stdout).toMatch(/differs from the value cached in the file \(90000\)/);
    expect(createHash("sha256").update(readFileSync(path)).digest("hex")).toBe(before);
  });
  it("audit writes an HTML report and an audit sheet a reviewer can read", async () => {
    const dir = tempDir();
    const path = join(dir, "demo.xlsx");
    copyFileSync(join(root, "demo", DEMO_FILE), path);
    const r = await nappe("audit", path, "--html", join(dir, "out", "report.html"), "--xlsx", join(dir, "out", "audit.xlsx"));
    expect(r.code).toBe(0);
    const html = readFileSync(join(dir, "out", "report.html"), "utf8");
    expect(html).toMatch(/<math/); // rendered equations (KaTeX MathML)
    expect(html).toMatch(/design aid for preliminary sizing/);
    expect(html).toMatch(/Unit check: Inputs!B14 is labelled &quot;Suction pipe length \(ft\)&quot;/);
    expect(html).toMatch(/IAPWS-IF97/);
    expect(html).not.toMatch(/<script/);
    const audit = new ExcelJS.Workbook();
    await audit.xlsx.readFile(join(dir, "out", "audit.xlsx"));
    const ws = audit.getWorksheet("Nappe audit")!;
    // Summary first: the key results and the inputs come before the table of every formula.
    const firstCells = (ws.getColumn(1).values as unknown[]).map((v) => (v === undefined || v === null ? "" : String(v)));
    const keyAt = firstCells.indexOf("Key results");
    const inputsAt = firstCells.indexOf("Inputs");
    const headerAt = [...Array(ws.rowCount).keys()].map((i) => i + 1).find((i) => (ws.getRow(i).values as unknown[]).includes("Inputs (as written → as read)"))!;
    expect(keyAt).toBeGreaterThan(0);
    expect(inputsAt).toBeGreaterThan(keyAt);
    expect(headerAt).toBeGreaterThan(inputsAt);
    expect(ws.getRow(headerAt).values).toContain("Exact");
    expect(ws.getCell(2, 1).value).toMatch(/^Workbook: demo\.xlsx · \d{1,2} [A-Z][a-z]+ \d{4}, \d\d:\d\d UTC · /);
    expect(ws.rowCount).toBeGreaterThan(30);
    expect(html.indexOf("<h2>Key results</h2>")).toBeGreaterThan(0);
    expect(html.indexOf("<h2>Key results</h2>")).toBeLessThan(html.indexOf("<h2>Inputs</h2>"));
    expect(html.indexOf("<h2>Inputs</h2>")).toBeLessThan(html.indexOf('<h3 class="cell">'));
    expect(html).toMatch(/Workbook: <strong>demo\.xlsx<\/strong> · \d{1,2} [A-Z][a-z]+ \d{4}, \d\d:\d\d UTC/);
    expect(readdirSync(join(dir, "out")).filter((f) => f.endsWith(".tmp"))).toEqual([]);
  });
  it("renders workbook text with markup as text in the HTML report", async () => {
    const dir = tempDir();
    const book = new ExcelJS.Workbook();
    const ws = book.addWorksheet("<b>x<b>");
    ws.getCell("A1").value = "<img src=x onerror=alert(1)> (gpm)";
    ws.getCell("A2").value = { formula: 'NAPPE.HEAD("<script>alert(1)</script>")' };
    await save(book, join(dir, "markup.xlsx"));
    await nappe("audit", join(dir, "markup.xlsx"));
    const html = readFileSync(join(dir, "markup.audit.html"), "utf8");
    expect(html).not.toMatch(/<script>alert/);
    expect(html).not.toMatch(/<b>x<b>/);
    expect(html).toMatch(/&lt;script&gt;alert\(1\)&lt;\/script&gt;/);
  });
  it.each([
    ["a missing file", (d: string) => join(d, "nope.xlsx"), /no such file/],
    ["a file that is not a workbook", (d: string) => (writeFileSync(join(d, "t.xlsx"), "just text"), join(d, "t.xlsx")), /not an \.xlsx workbook/],
    ["a password-protected workbook", (d: string) => (writeFileSync(join(d, "p.xlsx"), Buffer.concat([Buffer.from([0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1]), Buffer.alloc(504)])), join(d, "p.xlsx")), /password-protected/],
    ["a corrupt workbook", (d: string) => (writeFileSync(join(d, "c.xlsx"), Buffer.concat([Buffer.from("PK\x03\x04"), Buffer.alloc(64, 7)])), join(d, "c.xlsx")), /could not be read as an \.xlsx workbook/],
    ["a folder without workbooks", (d: string) => d, /no \.xlsx workbook in /],
  ])("gives a clear message and exit 2 for %s, never a stack trace", async (_name, make, message) => {
    const r = await nappe("recalc", make(tempDir()));
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(message);
    expect(r.stderr).not.toMatch(/\n\s+at /);
  });
  it("explains its usage on a bad command line", async () => {
    const r = await nappe("frobnicate");
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/Usage:/);
  });
  it("demo prints the sizing summary and writes the audit, with paths", async () => {
    const dir = tempDir();
    const r = await nappe("demo", "--out", dir);
    expect(r.code).toBe(0);
    for (const label of ["Duty flow", "Chosen impeller", "Impeller trimmed to", "Pump efficiency at duty", "Shaft power at duty", "Motor", "NPSH available", "NPSH required", "NPSH margin ratio"]) {
      expect(r.stdout).toContain(label);
    }
    expect(r.stdout).toMatch(/unit check: Inputs!B14/);
    expect(existsSync(join(dir, "orchard-audit.html"))).toBe(true);
    expect(r.stdout).toContain(join(dir, "orchard-audit.html"));
  });
  it("demo leads with the selection over the envelope: the recommended impeller and a motor that never overloads, first", async () => {
    const dir = tempDir();
    const r = await nappe("demo", "--out", dir);
    // What the workbook's own Envelope sheet finds: the shortlist's recommended row, and the motor for the end-of-curve power.
    const env = recalculate(await readWorkbook(join(dir, DEMO_FILE)), { all: true });
    const shortlist = env.valueOf("Envelope", "A30") as (string | number)[][];
    const header = shortlist[0].map(String);
    const best = shortlist.find((row) => /^recommended/.test(String(row[row.length - 1])))!;
    const impeller = best[0] as number;
    const motor = best[header.findIndex((h) => /^Motor/.test(h))] as number;
    const maxPowerMotor = (env.valueOf("Envelope", "A26") as number[][])[1][2];
    const lines = r.stdout.split("\n").filter((l) => l.trim());
    expect(lines[1]).toMatch(/Selection over the operating envelope/);
    expect(lines[2]).toMatch(new RegExp(`^  Recommended impeller\\s+${impeller} mm$`));
    const headline = Number(/^  Motor that never overloads \(IEC\)\s+(\d+) kW$/.exec(lines[3])?.[1]);
    expect(headline).toBe(motor);
    expect(headline).toBeGreaterThanOrEqual(maxPowerMotor);
    // The single-point figures that read the flagged suction length are marked, and what they become is said.
    expect(r.stdout).toMatch(/^  Shaft power at duty\s+[\d.]+ kW ‡$/m);
    expect(r.stdout).toMatch(/^  Duty flow\s+[\d.]+ m³\/h$/m);
    expect(r.stdout).toMatch(/‡ Computed with Inputs!B14 "Suction pipe length \(ft\)" = 30 read as 30 m/);
    expect(r.stdout).toMatch(/Operating point, full impeller: flow: 87\.46 m³\/h → 87\.81 m³\/h/);
    // 87.81 m³/h is the design case of the envelope, which reads the length in ft: the two now agree.
    expect(r.stdout).toMatch(/design: summer, new pipe\s+87\.81/);
    for (const line of r.stdout.split("\n").filter((l) => !l.includes(dir))) expect(line.length, line).toBeLessThanOrEqual(80);
  });
});

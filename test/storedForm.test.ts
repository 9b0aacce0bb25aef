/**
 * Workbooks as Excel and other programs store them: NAPPE calls as `_xldudf_NAPPE_X_Y` dynamic
 * arrays (and lower case, as LibreOffice keeps them), shared formulas, `_xlfn.` built-ins, spill
 * references, implicit intersection, LET, defined names of both scopes, quoted sheet names,
 * external links, another add-in's functions. The fixtures are XML written by hand in the form
 * ECMA-376 and [MS-OWEXML] describe (test/fixtures/package.ts); expected values are named
 * beside each check.
 */
import { readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import ExcelJS from "exceljs";
import JSZip from "jszip";
import { describe, expect, it } from "vitest";
import { buildDemoWorkbook, DEMO_FILE } from "../demo/build";
import { ADDIN, CONTENT_TYPE, recordedFunctionIds, REL } from "../workbook/excelForm";
import { callSites } from "../workbook/formula";
import { recalculate } from "../workbook/recalc";
import { displayFormula, expandLet, storedFormula } from "../workbook/storedForm";
import { fromExcelJS, readWorkbook } from "../headless/readXlsx";
import { explainCell } from "../taskpane/explain";
import { MemoryHost } from "../taskpane/host/memory";
import { c, row, xlsxPackage } from "./fixtures/package";
import { nappe, relativeError, tempDir } from "./helpers";

const root = join(__dirname, "..");

/** The stored-form workbook of the cases above, written to a temporary file. */
async function storedWorkbook(): Promise<string> {
  const calc = [
    row(1, c("A1", { f: '_xldudf_NAPPE_CONVERT(1,"ft","m")', v: 0.3048, array: "A1", dynamic: true }), c("E1", { f: "_xldudf_NAPPE_PUMP_SCALE(G1:H4,1)", array: "E1:F5", dynamic: true }), c("G1", { v: 0 }), c("H1", { v: 50 }), c("J1", { v: 10 })),
    row(2, c("A2", { f: "_xldudf_nappe_velocity(Inputs!B1,Inputs!B2)", v: 2.5464790894703255, array: "A2", dynamic: true }), c("G2", { v: 0.01 }), c("H2", { v: 48 }), c("J2", { v: 20 }), c("K2", { f: "_xlfn.SINGLE($J$1:$J$3)", v: 20 })),
    row(3, c("A3", { f: "nappe.atmpressure(0)", v: 101325 }), c("G3", { v: 0.02 }), c("H3", { v: 44 }), c("J3", { v: 30 })),
    row(4, c("B4", { f: '_xldudf_NAPPE_CONVERT(C4,"ft","m")', v: 0.3048, shared: { si: 0, ref: "B4:B6" } }), c("C4", { v: 1 }), c("G4", { v: 0.03 }), c("H4", { v: 38 })),
    row(5, c("B5", { v: 0.6096, shared: { si: 0 } }), c("C5", { v: 2 })),
    row(6, c("B6", { v: 0.9144, shared: { si: 0 } }), c("C6", { v: 3 })),
    row(7, c("A7", { f: '_xldudf_NAPPE_CONVERT(Flow,"m^3/s","L/s")', v: 20, array: "A7", dynamic: true })),
    row(8, c("A8", { f: '_xldudf_NAPPE_CONVERT(Ratio,"ft","m")', v: 0.6096, array: "A8", dynamic: true })),
    row(9, c("A9", { f: "_xlfn.LET(_xlpm.q,Inputs!B1,_xldudf_NAPPE_VELOCITY(_xlpm.q,Inputs!B2)*2)", v: 5.092958178940651, array: "A9", dynamic: true })),
    row(10, c("A10", { f: "SUM(_xlfn.ANCHORARRAY(E1))", v: 180.06 })),
    row(12, c("A12", { f: '_xlfn.IFS(A1>0,"pos",TRUE,"neg")', v: "pos" }), c("B12", { f: '_xlfn.CONCAT("a","b")', v: "ab" }), c("C12", { f: "_xlfn.STDEV.S(J1:J3)", v: 10 })),
    row(13, c("A13", { f: "CUBEVALUE(\"Sales\",J1)", v: 20 })),
    row(14, c("A14", { f: "A13*2", v: 40 })),
    row(15, c("A15", { f: "'Pump''s data'!A1*2", v: 10 })),
    row(16, c("A16", { f: "[1]Prices!A1*2", v: 42 })),
    row(17, c("A17", { f: "A16+1", v: 43 })),
    row(18, c("A18", { f: "_xldudf_OTHERADDIN_FOO(1)", v: 7, array: "A18", dynamic: true })),
    row(19, c("A19", { f: "_xldudf_NAPPE_NOSUCH(1)", error: "#NAME?", array: "A19", dynamic: true })),
    row(20, c("A20", { f: "MIN(J1:J3)+MAX(J1:J3)+MATCH(20,J1:J3,0)", v: 42 })),
  ].join("");
  const bytes = await xlsxPackage(
    [
      { name: "Inputs", rows: row(1, c("A1", { v: "Flow" }), c("B1", { v: 0.02 })) + row(2, c("B2", { v: 0.1 })) },
      { name: "Calc", rows: calc },
      { name: "Pump's data", rows: row(1, c("A1", { v: 5 })) },
    ],
    {
      definedNames: '<definedName name="Flow">Inputs!$B$1</definedName><definedName name="Ratio" localSheetId="1">2</definedName><definedName name="Ratio">99</definedName>',
      externalLinks: ["file:///C:/plant/prices.xlsx"],
    },
  );
  const path = join(tempDir(), "stored.xlsx");
  writeFileSync(path, bytes);
  return path;
}

describe("formulas in the stored form", () => {
  it("shows every stored form as people read it", () => {
    expect(displayFormula('_xldudf_NAPPE_PUMP_HEAD(B2,Pump!A1:C9,"ft")')).toBe('NAPPE.PUMP.HEAD(B2,Pump!A1:C9,"ft")');
    expect(displayFormula("_xldudf_nappe_head(1)+nappe.head(2)")).toBe("NAPPE.HEAD(1)+NAPPE.HEAD(2)");
    expect(displayFormula("SUM(_xlfn.ANCHORARRAY(B5))*_xlfn.SINGLE(A1:A3)")).toBe("SUM(B5#)*@A1:A3");
    expect(displayFormula('_xlfn.LET(_xlpm.x,2,_xlpm.x&"_xldudf_NAPPE_HEAD(")')).toBe('LET(x,2,x&"_xldudf_NAPPE_HEAD(")');
  });
  it("writes the stored form Excel resolves, leaving strings alone", () => {
    expect(storedFormula('NAPPE.PUMP.HEAD(1, nappe.head(2), "NAPPE.HEAD(")')).toBe('_xldudf_NAPPE_PUMP_HEAD(1, _xldudf_NAPPE_HEAD(2), "NAPPE.HEAD(")');
  });
  it("writes LET out with each name's value, later names using earlier ones", () => {
    expect(expandLet("_xlfn.LET(_xlpm.x,2,_xlpm.y,_xlpm.x+1,_xlpm.x*_xlpm.y)")).toBe("((2)*((2)+1))");
  });
  it("gives the pane each call by its dotted name", () => {
    expect(callSites("_xldudf_nappe_velocity(A1,_xldudf_NAPPE_PIPE_ID(6,40))").map((s) => [s.name, s.children.map((x) => x.name)])).toEqual([["NAPPE.VELOCITY", ["NAPPE.PIPE.ID"]]]);
  });
});

describe("a workbook saved in Excel's stored form", () => {
  it("recalculates every case with the values the references give", async () => {
    const result = recalculate(await readWorkbook(await storedWorkbook()), { all: true });
    const at = (a: string) => result.cells.find((x) => x.sheet === "Calc" && x.address === a)!;
    const near = (a: string, want: number) => expect(relativeError(at(a).value as number, want), `${a} = ${String(at(a).value)}`).toBeLessThan(1e-12);
    near("A1", 0.3048); // NIST SP 811: 1 ft = 0.3048 m exactly
    near("A2", (4 * 0.02) / (Math.PI * 0.1 ** 2)); // continuity, V = 4Q/(πD²)
    near("A3", 101325); // US Standard Atmosphere 1976: sea-level pressure
    near("B5", 2 * 0.3048); // shared formula, moved down one row
    near("B6", 3 * 0.3048);
    near("A7", 20); // defined name Flow = Inputs!$B$1 = 0.02 m³/s = 20 L/s
    near("A8", 2 * 0.3048); // the sheet's own Ratio (2) wins over the workbook's (99)
    near("A9", (2 * (4 * 0.02)) / (Math.PI * 0.1 ** 2)); // LET
    near("A10", 0 + 0.01 + 0.02 + 0.03 + 50 + 48 + 44 + 38); // SUM over the spill B5#, header text skipped
    expect(result.valueOf("Calc", "K2")).toBe(20); // @J1:J3 in row 2 is J2
    expect([at("A12").value, at("B12").value, at("C12").value]).toEqual(["pos", "ab", 10]); // STDEV.S of 10, 20, 30 is 10
    near("A15", 10); // 'Pump''s data'!A1 * 2
    near("A20", 10 + 30 + 2);
    for (const a of ["A1", "A2", "A3", "B4", "B5", "B6", "A7", "A8", "A9", "A10", "A20"]) expect(at(a).status, `${a}: ${at(a).messages.join("; ")}`).toBe("ok");
  });
  it("counts the NAPPE formulas in every stored form, and shows them dotted", async () => {
    const result = recalculate(await readWorkbook(await storedWorkbook()));
    expect(result.counts).toMatchObject({ nappe: 11, recalculated: 10, notRecalculated: 1, otherAddins: ["OTHERADDIN_FOO"] });
    expect(result.cells.map((x) => x.formula)).toContain("=NAPPE.VELOCITY(Inputs!B1,Inputs!B2)");
    expect(result.cells.map((x) => x.formula)).toContain('=LET(q,Inputs!B1,NAPPE.VELOCITY(q,Inputs!B2)*2)');
  });
  it("says which function is unsupported, and which precedent failed", async () => {
    const result = recalculate(await readWorkbook(await storedWorkbook()), { all: true });
    const at = (a: string) => result.cells.find((x) => x.sheet === "Calc" && x.address === a)!;
    expect(at("A13")).toMatchObject({ status: "error" });
    expect(at("A13").messages.join(" ")).toMatch(/unsupported function CUBEVALUE/);
    expect(at("A14").messages.join(" ")).toMatch(/reads Calc!A13, which failed: unsupported function CUBEVALUE/);
    expect(at("A19").messages.join(" ")).toMatch(/NAPPE\.NOSUCH is not a Nappe function/);
  });
  it("reports external links and another add-in's functions as such, using their cached values", async () => {
    const result = recalculate(await readWorkbook(await storedWorkbook()), { all: true });
    const at = (a: string) => result.cells.find((x) => x.sheet === "Calc" && x.address === a)!;
    expect(at("A16")).toMatchObject({ status: "warning", value: 42 });
    expect(at("A16").messages[0]).toMatch(/reads another workbook, \[1\] file:\/\/\/C:\/plant\/prices\.xlsx/);
    expect(at("A17")).toMatchObject({ status: "ok", value: 43 });
    expect(at("A18").messages[0]).toMatch(/OTHERADDIN_FOO of another add-in/);
  });
  it("is explained in the pane like the dotted form", async () => {
    const host = new MemoryHost(await readWorkbook(await storedWorkbook()));
    const e = await explainCell(host, "Calc", "A2");
    expect(e.formula).toBe("NAPPE.VELOCITY(Inputs!B1,Inputs!B2)");
    expect(e.calls.map((x) => x.id)).toEqual(["VELOCITY"]);
    expect(e.calls[0].args.map((a) => a.written)).toEqual(["Inputs!B1", "Inputs!B2"]);
    // A defined name as an argument: written as the name, read from the cell it names.
    const named = await explainCell(host, "Calc", "A7");
    expect(named.error).toBeUndefined();
    expect(named.calls[0].args[0]).toMatchObject({ written: "Flow", value: "0.02" });
    expect(named.value).toBe("20");
  });
  it("the nappe command names another add-in and exits 1 for the failing cells", async () => {
    const r = await nappe("recalc", await storedWorkbook());
    expect(r.code).toBe(1);
    expect(r.stdout).toMatch(/11 NAPPE formulas found in 23 formulas \(10 recalculated, 1 not recalculated\)/);
    expect(r.stdout).toMatch(/another add-in's functions: OTHERADDIN_FOO/);
  });
});

describe("the demo workbook in the stored form", () => {
  it("has the same NAPPE formula count and values as its dotted twin", async () => {
    const dir = tempDir();
    writeFileSync(join(dir, "dotted.xlsx"), Buffer.from(await (await buildDemoWorkbook()).xlsx.writeBuffer()));
    const stored = recalculate(await readWorkbook(join(root, "demo", DEMO_FILE)));
    const dotted = recalculate(await readWorkbook(join(dir, "dotted.xlsx")));
    expect(stored.counts.nappe).toBe(34);
    expect(stored.counts.nappe).toBe(dotted.counts.nappe);
    expect(stored.cells.map((x) => [x.address, x.formula, x.value])).toEqual(dotted.cells.map((x) => [x.address, x.formula, x.value]));
  });
  it("stores every NAPPE call as Excel does: _xldudf_ name, dynamic array with its metadata, cached value", async () => {
    const zip = await JSZip.loadAsync(readFileSync(join(root, "demo", DEMO_FILE)));
    const sheets = await Promise.all(Object.keys(zip.files).filter((p) => /^xl\/worksheets\/sheet\d+\.xml$/.test(p)).map((p) => zip.file(p)!.async("string")));
    const all = sheets.join("");
    expect(all).not.toMatch(/<f[^>]*>[^<]*NAPPE\./);
    // (s="…": the number format that shows 4 significant figures in any spreadsheet program.)
    expect(all).toMatch(/<c r="B21"( s="\d+")? cm="1"><f t="array" ref="B21">_xldudf_NAPPE_HEADLOSS\(B11&amp;&quot; m\^3\/h&quot;, B16, Inputs!B14, B18, B6\)<\/f><v>/);
    expect(all).toMatch(/<c r="B27"( s="\d+")? cm="1"><f t="array" ref="B27:E27">_xldudf_NAPPE_PUMP_SELECT\(/);
    const cells = [...all.matchAll(/<c\b[^>]*>(?:(?!<\/c>).)*_xldudf_NAPPE_(?:(?!<\/c>).)*<\/c>/g)].map((m) => m[0]);
    expect(cells.length).toBe(34);
    for (const cell of cells) expect(cell).toMatch(/^<c [^>]*cm="1"[^>]*><f t="array" ref="[A-Z]+\d+(:[A-Z]+\d+)?">[^<]+<\/f><v>[^<]*<\/v><\/c>$/);
    const metadata = await zip.file("xl/metadata.xml")!.async("string");
    expect(metadata).toMatch(/<metadataType name="XLDAPR"/);
    expect(metadata).toMatch(/<xda:dynamicArrayProperties fDynamic="1" fCollapsed="0"\/>/);
    expect(metadata).toMatch(/<cellMetadata count="1"><bk><rc t="1" v="0"\/><\/bk><\/cellMetadata>/);
  });
  it("reads the function ids of a web-extension part in Excel's form and in the form earlier versions wrote", () => {
    // The part of a workbook saved by desktop Excel with an add-in's custom functions, verbatim but for the names.
    const excel = `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>
<we:webextension xmlns:we="http://schemas.microsoft.com/office/webextensions/webextension/2010/11" id="{88C9DF49-DEB8-0D4E-B730-E4053453480D}"><we:reference id="00000000-0000-0000-0000-000000000001" version="1.0.0.0" store="developer" storeType="Registry"/><we:alternateReferences/><we:properties/><we:bindings/><we:snapshot xmlns:r="http://schemas.openxmlformats.org/officeDocument/2006/relationships"/><we:extLst><a:ext xmlns:a="http://schemas.openxmlformats.org/drawingml/2006/main" uri="{7C84B067-C214-45C3-A712-C9D94CD141B2}"><we:customFunctionIdList><we:customFunctionIds>_xldudf_EXAMPLE_ADD</we:customFunctionIds><we:customFunctionIds>_xldudf_EXAMPLE_GET</we:customFunctionIds></we:customFunctionIdList></a:ext></we:extLst></we:webextension>`;
    expect(recordedFunctionIds(excel)).toEqual(["_xldudf_EXAMPLE_ADD", "_xldudf_EXAMPLE_GET"]);
    expect(recordedFunctionIds("<we:customFunctionIdList><we:customFunctionId>_xldudf_NAPPE_HEAD</we:customFunctionId></we:customFunctionIdList>")).toEqual(["_xldudf_NAPPE_HEAD"]);
  });
  it("writes the part as Excel writes it: the same elements in the schema's order, the same extension URI", async () => {
    const zip = await JSZip.loadAsync(readFileSync(join(root, "demo", DEMO_FILE)));
    const ours = await zip.file("xl/webextensions/webextension1.xml")!.async("string");
    // Element by element as the Excel-saved part above, with our add-in's Id and functions in place of its.
    const shape = (xml: string) => [...xml.replace(/(<we:customFunctionIds>[^<]*<\/we:customFunctionIds>)+/, "<we:customFunctionIds>x</we:customFunctionIds>").matchAll(/<\/?[\w:]+/g)].map((m) => m[0]).join(" ");
    const excel = `<we:webextension id="x"><we:reference id="x" version="1.0.0.0" store="developer" storeType="Registry"/><we:alternateReferences/><we:properties/><we:bindings/><we:snapshot/><we:extLst><a:ext><we:customFunctionIdList><we:customFunctionIds>a</we:customFunctionIds><we:customFunctionIds>b</we:customFunctionIds></we:customFunctionIdList></a:ext></we:extLst></we:webextension>`;
    expect(shape(ours)).toBe(shape(excel));
    expect(ours).toMatch(/<we:reference id="[0-9a-f-]{36}" version="[\d.]+" store="developer" storeType="Registry"\/>/);
  });
  it("records the add-in: the web-extension part names the manifest's Id and lists the functions used", async () => {
    const zip = await JSZip.loadAsync(readFileSync(join(root, "demo", DEMO_FILE)));
    const text = (p: string) => zip.file(p)!.async("string");
    const manifestId = /<Id>([^<]+)<\/Id>/.exec(readFileSync(join(root, "manifest/manifest.xml"), "utf8"))![1];
    expect(ADDIN.id).toBe(manifestId);
    // The structure [MS-OWEXML] 2.2.7 gives: reference, alternateReferences, properties, bindings, snapshot, extLst.
    const we = await text("xl/webextensions/webextension1.xml");
    const children = [...we.matchAll(/<we:(\w+)/g)].map((m) => m[1]).filter((n) => ["reference", "alternateReferences", "properties", "bindings", "snapshot", "extLst"].includes(n));
    expect(children).toEqual(["reference", "alternateReferences", "properties", "bindings", "snapshot", "extLst"]);
    expect(we).toMatch(new RegExp(`<we:reference id="${manifestId}" version="[\\d.]+" store="developer" storeType="Registry"/>`));
    // Excel's own element names and extension URI, as in a workbook desktop Excel saved with custom functions.
    expect(we).toContain('<we:extLst><a:ext xmlns:a="http://schemas.openxmlformats.org/drawingml/2006/main" uri="{7C84B067-C214-45C3-A712-C9D94CD141B2}"><we:customFunctionIdList><we:customFunctionIds>');
    expect(we).not.toMatch(/<we:customFunctionId>/);
    const ids = recordedFunctionIds(we);
    expect(ids).toContain("_xldudf_NAPPE_HEADLOSS");
    expect(ids).toContain("_xldudf_NAPPE_PUMP_SELECT");
    expect(ids.length).toBe(new Set(ids).size);
    expect(await text("xl/webextensions/taskpanes.xml")).toMatch(/<wetp:webextensionref [^>]*r:id="rId1"\/>/);
    expect(await text("xl/webextensions/_rels/taskpanes.xml.rels")).toContain(`Type="${REL.webextension}" Target="webextension1.xml"`);
    expect(await text("_rels/.rels")).toContain(`Type="${REL.taskpanes}" Target="xl/webextensions/taskpanes.xml"`);
    expect(await text("xl/_rels/workbook.xml.rels")).toContain(`Type="${REL.sheetMetadata}" Target="metadata.xml"`);
    const types = await text("[Content_Types].xml");
    for (const [part, type] of [["/xl/metadata.xml", CONTENT_TYPE.metadata], ["/xl/webextensions/webextension1.xml", CONTENT_TYPE.webextension], ["/xl/webextensions/taskpanes.xml", CONTENT_TYPE.taskpanes]]) {
      expect(types).toContain(`<Override PartName="${part}" ContentType="${type}"/>`);
    }
  });
});

describe("no silent empty audit", () => {
  async function plain(): Promise<string> {
    const path = join(tempDir(), "plain.xlsx");
    writeFileSync(path, await xlsxPackage([{ name: "S", rows: row(1, c("A1", { v: 2 }), c("B1", { f: "A1*2", v: 4 }), c("C1", { f: "_xldudf_OTHERADDIN_FOO(A1)", v: 5, array: "C1", dynamic: true })) }]));
    return path;
  }
  it("recalc says no NAPPE formulas were found, names the other add-in, and exits 3", async () => {
    const r = await nappe("recalc", await plain());
    expect(r.code).toBe(3);
    expect(r.stderr.replace(/\s+/g, " ")).toMatch(/no NAPPE formulas found in .*plain\.xlsx \(2 formulas, none calling NAPPE\): nothing was checked/);
    expect(r.stderr.replace(/\s+/g, " ")).toMatch(/custom functions of another add-in.*: OTHERADDIN_FOO/);
  });
  it("audit writes nothing and exits 3; --allow-empty writes a report that says so and exits 0", async () => {
    const path = await plain();
    const r = await nappe("audit", path);
    expect(r.code).toBe(3);
    const html = join(tempDir(), "r.html");
    const r2 = await nappe("audit", path, "--allow-empty", "--html", html, "--xlsx", join(tempDir(), "r.xlsx"));
    expect(r2.code).toBe(0);
    expect(readFileSync(html, "utf8")).toMatch(/No NAPPE formulas found in this workbook: nothing was checked/);
  });
  it("--all labels every formula truthfully", async () => {
    const r = await nappe("recalc", await storedWorkbook(), "--all");
    expect(r.stdout).toMatch(/23 formulas, 11 of them calling NAPPE/);
  });
});

describe("robust reading", () => {
  it("reads a sheet with a whole-sheet data validation and conditional format without expanding them", async () => {
    const path = join(tempDir(), "whole.xlsx");
    const after =
      '<conditionalFormatting sqref="A1:XFD1048576"><cfRule type="cellIs" dxfId="0" priority="1" operator="greaterThan"><formula>0</formula></cfRule></conditionalFormatting>' +
      '<dataValidations count="1"><dataValidation type="decimal" allowBlank="1" sqref="A1:XFD1048576"><formula1>0</formula1></dataValidation></dataValidations>';
    writeFileSync(path, await xlsxPackage([{ name: "S", rows: row(1, c("A1", { f: '_xldudf_NAPPE_CONVERT(1,"ft","m")', v: 0.3048, array: "A1", dynamic: true })), after }]));
    const r = await nappe("recalc", path, "--max-seconds", "20");
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/1 NAPPE formula found/);
  });
  it("exits 2 for a zip that is not a workbook (no xl/workbook.xml)", async () => {
    const path = join(tempDir(), "nowb.xlsx");
    writeFileSync(path, await xlsxPackage([{ name: "S", rows: "" }], { noWorkbook: true }));
    const r = await nappe("recalc", path);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/not an \.xlsx workbook: it has no xl\/workbook\.xml/);
  });
  it("stops with a clear message over the time or memory budget", async () => {
    const demo = join(root, "demo", DEMO_FILE);
    const slow = await nappe("recalc", demo, "--max-seconds", "0.001");
    expect(slow.code).toBe(2);
    expect(slow.stderr).toMatch(/over the time budget of 0\.001 s \(raise it with --max-seconds\)/);
    const big = await nappe("recalc", demo, "--max-memory", "1");
    expect(big.code).toBe(2);
    expect(big.stderr).toMatch(/over the memory budget of 1 MB \(raise it with --max-memory\)/);
  });
  it("recalculates a 20,000-row running total in dependency order, with no depth limit", () => {
    const book = new ExcelJS.Workbook();
    const ws = book.addWorksheet("Run");
    ws.getCell("A1").value = 1;
    for (let r = 2; r <= 20000; r++) ws.getCell(`A${r}`).value = { formula: `A${r - 1}+1` };
    ws.getCell("B1").value = { formula: 'NAPPE.CONVERT(A20000, "ft", "m")' };
    const result = recalculate(fromExcelJS(book), { all: true });
    expect(result.valueOf("Run", "A20000")).toBe(20000);
    expect(result.cells.filter((x) => x.status === "error")).toEqual([]);
    expect(relativeError(result.valueOf("Run", "B1") as number, 20000 * 0.3048)).toBeLessThan(1e-12); // NIST SP 811
  });
  it("never loses output piped into another program", async () => {
    const book = new ExcelJS.Workbook();
    const ws = book.addWorksheet("Many");
    for (let r = 1; r <= 1500; r++) ws.getCell(`A${r}`).value = { formula: `NAPPE.CONVERT(${r}, "ft", "m")` };
    const path = join(tempDir(), "many.xlsx");
    writeFileSync(path, Buffer.from(await book.xlsx.writeBuffer()));
    const { execFileSync } = await import("node:child_process");
    const out = execFileSync("sh", ["-c", `"${process.execPath}" "${join(root, "bin/nappe.mjs")}" recalc "${path}" | cat`], { maxBuffer: 1 << 26 }).toString();
    expect(out.length).toBeGreaterThan(64 * 1024);
    expect(out.trimEnd().split("\n").slice(-2).join("\n")).toMatch(/^1500 NAPPE formulas found in 1500 formulas \(1500 recalculated\):\n {2}1500 ok, 0 warning, 0 error$/);
  });
});

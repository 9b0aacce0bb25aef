/**
 * Builds the demo workbook: an invented hillside orchard pumping station. Every number in it
 * is invented demo data, not a real site, pump or product. The workbook's cached values come
 * from Nappe's own recalculation, so Excel shows them before it recalculates.
 *
 *   npm run demo:build   writes demo/orchard-pumping-station.xlsx (demo/write.ts)
 */
import ExcelJS from "exceljs";
import { excelStoredForm } from "../workbook/excelForm";
import { recalculate } from "../workbook/recalc";
import { addressOf, parseAddress } from "../workbook/address";
import { fromExcelJS } from "../workbook/fromExcelJS";
import { numberFormatFor } from "../workbook/format";

export const DEMO_FILE = "orchard-pumping-station.xlsx";
const INVENTED = "INVENTED DEMO DATA: not a real site, pump or product.";

type Row = [label: string, value: string | number | { f: string; spill?: string }, unit?: string, note?: string];

/** Invented impeller family: a 280 mm curve and two smaller impellers scaled from it. */
function family(): (string | number)[][] {
  const q = [0, 30, 60, 90, 120, 150];
  const h = [128, 127, 123, 115, 103, 87];
  const eff = [0, 45, 63, 72, 74, 70];
  const npshr: (number | string)[] = ["", 2.0, 2.4, 3.1, 4.2, 5.9];
  const rows: (string | number)[][] = [];
  for (const [d, effLoss] of [[250, 2], [265, 1], [280, 0]] as const) {
    const r = d / 280;
    q.forEach((qq, i) => {
      const round1 = (x: number) => Math.round(x * 10) / 10;
      rows.push([d, round1(qq * r), round1(h[i] * r * r), i === 0 ? 0 : eff[i] - effLoss, npshr[i] === "" ? "" : round1((npshr[i] as number) * r * r)]);
    });
  }
  return rows;
}

const INPUTS: Row[] = [
  ["Site elevation above sea level", 1850, "m"],
  ["Water temperature in summer", "82 degF", "", "text quantity"],
  ["Reservoir surface below pump centreline", 3.2, "m", "suction lift"],
  ["Highest sprinkler above pump centreline", 38, "m"],
  ["Sprinkler guns running at once", 2, ""],
  ["Gun nozzle diameter", "22 mm", "", "text quantity"],
  ["Pressure at the gun (regulated)", "4.8 bar", "", "text quantity; regulators hold it constant"],
  ["Nozzle discharge coefficient", 0.96, "", "invented"],
  ["Jet elevation angle", 27, "deg"],
  ["Nozzle height above ground", 1.5, "m"],
  ["Suction pipe length (ft)", 30, "ft", "labelled in feet, but the formula reads a bare number in metres: the unit check flags it"],
  ["Discharge pipe length", 420, "m"],
  ["Pipe material", "commercial steel", ""],
  ["Pump speed", 2950, "rpm"],
  ["Running hours per season", 1400, "h"],
  ["Motor efficiency", "93%", "", "percent text"],
];

// Row numbers in the comments: the formulas refer to each other by them.
const CALC: (Row | [string])[] = [
  /* 3 */ ["Water and air at the site"],
  /* 4 */ ["Atmospheric pressure", { f: 'NAPPE.ATMPRESSURE(Inputs!B4, "kPa")' }, "kPa"],
  /* 5 */ ["Water density", { f: "NAPPE.WATER.DENSITY(Inputs!B5)" }, "kg/m³"],
  /* 6 */ ["Kinematic viscosity", { f: 'NAPPE.WATER.KINVISC(Inputs!B5, B4&" kPa")' }, "m²/s"],
  /* 7 */ ["Vapour pressure", { f: 'NAPPE.WATER.VAPORPRESSURE(Inputs!B5, "kPa")' }, "kPa"],
  /* 8 */ ["Sprinklers and duty"],
  /* 9 */ ["Pressure head at the gun", { f: 'NAPPE.HEAD(Inputs!B10, B5, "m")' }, "m"],
  /* 10 */ ["Flow per gun", { f: 'NAPPE.NOZZLE.FLOW(Inputs!B9, B9, Inputs!B11, "m^3/h")' }, "m³/h"],
  /* 11 */ ["Duty flow", { f: "B10*Inputs!B8" }, "m³/h"],
  /* 12 */ ["Jet velocity (Cv 0.98)", { f: "NAPPE.JET.VELOCITY(B9, 0.98)" }, "m/s"],
  /* 13 */ ["Throw with no air drag", { f: "NAPPE.JET.REACH(B12, Inputs!B12, Inputs!B13)" }, "m", "real throw is much shorter"],
  /* 14 */ ["Jet rise with no air drag", { f: "NAPPE.JET.HEIGHT(B12, Inputs!B12)" }, "m"],
  /* 15 */ ["Piping"],
  /* 16 */ ["Suction inside diameter, NPS 6 Sch 40", { f: "NAPPE.PIPE.ID(6, 40)" }, "m"],
  /* 17 */ ["Discharge inside diameter, NPS 5 Sch 40", { f: 'NAPPE.PIPE.ID(5, "40")' }, "m"],
  /* 18 */ ["Pipe roughness", { f: "NAPPE.PIPE.ROUGHNESS(Inputs!B16)" }, "m"],
  /* 19 */ ["Suction K: foot valve and elbow", { f: 'NAPPE.FITTING.K("foot valve", B16)+NAPPE.FITTING.K("elbow 90", B16)' }, ""],
  /* 20 */ ["Discharge K: check, gate, 4 elbows, exit", { f: 'NAPPE.FITTING.K("swing check", B17)+NAPPE.FITTING.K("gate valve", B17)+4*NAPPE.FITTING.K("elbow 90", B17)+NAPPE.FITTING.K("exit", B17)' }, ""],
  /* 21 */ ["Suction friction loss", { f: 'NAPPE.HEADLOSS(B11&" m^3/h", B16, Inputs!B14, B18, B6)' }, "m"],
  /* 22 */ ["Suction fitting loss", { f: 'NAPPE.HEADLOSS.MINOR(B11&" m^3/h", B16, B19)' }, "m"],
  /* 23 */ ["Suction loss", { f: "B21+B22" }, "m"],
  /* 24 */ ["Static lift plus pressure head at the gun", { f: "Inputs!B6+Inputs!B7+B9" }, "m"],
  /* 25 */ ["Head the pump must add at duty", { f: 'NAPPE.SYSTEM.HEAD(B11&" m^3/h", B24, E3:H5, B6)' }, "m"],
  /* 26 */ ["Pump"],
  /* 27 */ ["Selected impeller: size, head, efficiency, NPSHr", { f: 'NAPPE.PUMP.SELECT(Pump!A3:E21, B11&" m^3/h", B25, "m")', spill: "B27:E27" }, "mm, m, –, m"],
  /* 28 */ ["Operating point of the full 265 mm impeller", { f: 'NAPPE.PUMP.DUTY(Pump!H3:K9, B24, E3:H5, B6, "m^3/h", "m")', spill: "B28:C28" }, "m³/h, m"],
  /* 29 */ ["Impeller trimmed to meet the duty", { f: 'NAPPE.TRIM(Pump!H3:K9, "265 mm", B11&" m^3/h", B25, "mm")' }, "mm"],
  /* 30 */ ["Speed that would meet the duty untrimmed", { f: 'NAPPE.SPEED(Pump!H3:K9, Inputs!B17, B11&" m^3/h", B25)' }, "rpm"],
  /* 31 */ ["Shaft power at duty", { f: 'NAPPE.POWER.SHAFT(B11&" m^3/h", B25, D27, B5, "kW")' }, "kW"],
  /* 32 */ ["Motor, IEC, 15 % margin", { f: 'NAPPE.MOTOR.SIZE(B31&" kW", "IEC", "15%", "kW")' }, "kW"],
  /* 33 */ ["Energy per season", { f: 'NAPPE.ENERGY.ANNUAL(B11&" m^3/h", B25, D27, Inputs!B18, Inputs!B19, B5, "MWh")' }, "MWh"],
  /* 34 */ ["Specific speed, US units", { f: 'NAPPE.SPECIFICSPEED(Inputs!B17, B11&" m^3/h", B25, "US")' }, ""],
  /* 35 */ ["Suction and surge"],
  /* 36 */ ["NPSH available", { f: 'NAPPE.NPSHA(B4&" kPa", -Inputs!B6, B23, Inputs!B5, B5, "m")' }, "m"],
  /* 37 */ ["NPSH required at duty", { f: "E27" }, "m"],
  /* 38 */ ["NPSH margin ratio", { f: "NAPPE.NPSH.MARGIN(B36, B37)" }, ""],
  /* 39 */ ["Pressure-wave speed, steel 6.55 mm wall", { f: 'NAPPE.SURGE.WAVESPEED(B17, "6.55 mm", "200 GPa", , B5)' }, "m/s"],
  /* 40 */ ["Surge on a sudden pump stop", { f: 'NAPPE.SURGE.PRESSURE(B39, NAPPE.VELOCITY(B11&" m^3/h", B17), B5, "bar")' }, "bar"],
];

/** The shortlist's recommended row on the Envelope sheet (its verdict starts "recommended"), column by column. */
const pick = (col: string) => `INDEX(Envelope!${col}31:${col}33,MATCH("recommended*",Envelope!K31:K33,0))`;

/**
 * The answer first: the selection over the whole operating envelope (the Envelope sheet), then
 * the design duty as a single point (the Calc sheet). A section heading is a label alone.
 */
const SUMMARY: (Row | [string])[] = [
  ["Results"],
  ["Selection over the operating envelope (Envelope sheet)"],
  ["Recommended impeller", { f: pick("A") }, "mm"],
  ["Motor that never overloads (IEC)", { f: pick("H") }, "kW"],
  ["End-of-curve shaft power", { f: pick("G") }, "kW"],
  ["Why", { f: pick("K") }, ""],
  ["Best efficiency point: flow", { f: "Envelope!A16" }, "m³/h"],
  ["Best efficiency point: efficiency", { f: "Envelope!C16/100" }, "fraction"],
  ["Design case: % of BEP flow", { f: pick("D") }, "%"],
  ["Worst NPSH margin ratio over the envelope", { f: pick("I") }, ""],
  ["Energy per year over the envelope", { f: `${pick("J")}/1000` }, "MWh"],
  ["Design duty, single point (Calc sheet)"],
  ["Duty flow", { f: "Calc!B11" }, "m³/h"],
  ["Head the pump must add", { f: "Calc!B25" }, "m"],
  ["Chosen impeller (full size)", { f: "Calc!B27" }, "mm"],
  ["Impeller trimmed to", { f: "Calc!B29" }, "mm"],
  ["Operating point, full impeller: flow", { f: "Calc!B28" }, "m³/h"],
  ["Operating point, full impeller: head", { f: "Calc!C28" }, "m"],
  ["Pump efficiency at duty", { f: "Calc!D27" }, "fraction"],
  ["Shaft power at duty", { f: "Calc!B31" }, "kW"],
  ["Motor for the duty point alone (IEC, 15 % margin)", { f: "Calc!B32" }, "kW"],
  ["NPSH available", { f: "Calc!B36" }, "m"],
  ["NPSH required", { f: "Calc!B37" }, "m"],
  ["NPSH margin ratio", { f: "Calc!B38" }, ""],
  ["Energy per season", { f: "Calc!B33" }, "MWh"],
  ["Surge on a sudden stop", { f: "Calc!B40" }, "bar"],
];

function title(ws: ExcelJS.Worksheet, text: string): void {
  ws.getCell("A1").value = text;
  ws.getCell("A1").font = { bold: true, size: 14 };
  ws.getCell("A2").value = INVENTED;
  ws.getCell("A2").font = { italic: true, color: { argb: "FFB00020" } };
}

function writeRows(ws: ExcelJS.Worksheet, rows: (Row | [string])[], firstRow: number): void {
  rows.forEach((row, i) => {
    const r = firstRow + i;
    ws.getCell(r, 1).value = row[0];
    if (row.length === 1) {
      ws.getCell(r, 1).font = { bold: true, color: { argb: "FF0E5463" } };
      return;
    }
    const [, value, unit, note] = row;
    const cell = ws.getCell(r, 2);
    if (typeof value === "object") {
      cell.value = value.spill ? ({ formula: value.f, shareType: "array", ref: value.spill } as ExcelJS.CellFormulaValue) : { formula: value.f };
    } else cell.value = value;
    if (unit) ws.getCell(r, 3).value = unit;
    if (note) ws.getCell(r, 4).value = note;
  });
}

/** The demo workbook with formulas only (no cached results yet). */
function layout(): ExcelJS.Workbook {
  const book = new ExcelJS.Workbook();
  book.creator = "Nappe demo builder";
  book.created = new Date(Date.UTC(2026, 0, 1));
  book.modified = book.created;

  const summary = book.addWorksheet("Summary");
  title(summary, "Hillside orchard pumping station: sizing summary");
  writeRows(summary, SUMMARY, 3);
  // Section headings, and the recommendation's reason wrapped across B:D.
  const why = 3 + SUMMARY.findIndex((r) => r[0] === "Why");
  summary.mergeCells(why, 2, why, 4);
  summary.getCell(why, 2).alignment = { wrapText: true, vertical: "top" };
  summary.getCell(why, 1).alignment = { vertical: "top" };
  summary.getRow(why).height = 45;

  const inputs = book.addWorksheet("Inputs");
  title(inputs, "Inputs");
  ["Quantity", "Value", "Unit", "Note"].forEach((h, j) => {
    inputs.getCell(3, j + 1).value = h;
    inputs.getCell(3, j + 1).font = { bold: true };
  });
  writeRows(inputs, INPUTS, 4);

  const calc = book.addWorksheet("Calc");
  title(calc, "Calculation (NAPPE worksheet functions)");
  writeRows(calc, CALC, 3);
  // Pipe segments from pump suction to the guns, as a table with unit headers.
  const seg = [
    ["Length (m)", "ID (m)", "Roughness (m)", "K"],
    [{ formula: "Inputs!B14" }, { formula: "B16" }, { formula: "B18" }, { formula: "B19" }],
    [{ formula: "Inputs!B15" }, { formula: "B17" }, { formula: "B18" }, { formula: "B20" }],
  ];
  seg.forEach((row, i) => row.forEach((v, j) => (calc.getCell(3 + i, 5 + j).value = v as ExcelJS.CellValue)));
  calc.getCell("J2").value = "System curve (spilled)";
  calc.getCell("J3").value = { formula: 'NAPPE.SYSTEM.CURVE(B24, E3:H5, "150 m^3/h", 11, B6, "m^3/h", "m")', shareType: "array", ref: "J3:K15" } as ExcelJS.CellFormulaValue;

  const pump = book.addWorksheet("Pump");
  title(pump, "Invented pump family, 2950 rpm");
  const header = ["Impeller (mm)", "Flow (m^3/h)", "Head (m)", "Eff (%)", "NPSHr (m)"];
  [header, ...family()].forEach((row, i) => row.forEach((v, j) => (pump.getCell(3 + i, 1 + j).value = v === "" ? null : v)));
  pump.getCell("H2").value = "Curve of the 265 mm impeller";
  const curve = [header.slice(1), ...family().filter((r) => r[0] === 265).map((r) => r.slice(1))];
  curve.forEach((row, i) => row.forEach((v, j) => (pump.getCell(3 + i, 8 + j).value = v === "" ? null : v)));

  const envelope = book.addWorksheet("Envelope");
  envelopeSheet(envelope);

  for (const ws of [summary, inputs, calc, pump]) {
    ws.getColumn(1).width = ws === pump ? 14 : 44;
    for (let c = 2; c <= 11; c++) ws.getColumn(c).width = 14;
  }
  // Calc prints landscape one page wide at 70 % or more: its number columns narrower than the others'.
  for (let c = 2; c <= 8; c++) calc.getColumn(c).width = 12;
  calc.getColumn(9).width = 3;
  pump.getColumn(6).width = 3;
  pump.getColumn(7).width = 3;
  inputs.getColumn(4).width = 40;
  for (let r = 4; r < 4 + INPUTS.length; r++) inputs.getCell(r, 4).alignment = { wrapText: true, vertical: "top" };
  summary.getColumn(4).width = 30;
  printSetup(summary, `A1:D${2 + SUMMARY.length}`, "portrait");
  printSetup(inputs, `A1:D${3 + INPUTS.length}`, "portrait", "3:3");
  printSetup(calc, `A1:K${2 + CALC.length}`, "landscape");
  printSetup(pump, "A1:K21", "landscape", "3:3");
  return book;
}

/**
 * The pump over its operating envelope: the reservoir low and high, aged pipe, a cold spring
 * and a second pump running. The suction and discharge lines are those of the Calc sheet, with
 * the suction length's unit joined to it here.
 */
function envelopeSheet(ws: ExcelJS.Worksheet): void {
  title(ws, "Operating envelope of the 265 mm impeller, and the impellers compared over it");
  const put = (address: string, value: ExcelJS.CellValue, bold = false) => {
    ws.getCell(address).value = value;
    if (bold) ws.getCell(address).font = { bold: true };
  };
  put("A3", "Cases: the design duty first", true);
  const cases: (string | number | null)[][] = [
    ["Case", "Suction level (m)", "Discharge level (m)", "Discharge pressure (bar)", "Roughness (m)", "Temperature (degC)", "Pumps", "Speed", "Hours"],
    ["design: summer, new pipe", -3.2, 38, 4.8, null, 28, 1, 1, 1400],
    ["reservoir low, aged pipe", -4.5, 38, 4.8, 0.0005, 28, 1, 1, 300],
    ["reservoir high, cold spring", -1, 38, 4.8, null, 12, 1, 1, 400],
    ["second pump on", -3.2, 38, 4.8, null, 28, 2, 1, 200],
  ];
  cases.forEach((row, i) => row.forEach((v, j) => (ws.getCell(4 + i, 1 + j).value = v)));
  put("A10", "Suction line of each pump", true);
  const suction = [["Length (m)", "ID (m)", "Roughness (m)", "K"], [{ formula: 'Inputs!B14&" ft"' }, { formula: "Calc!B16" }, { formula: "Calc!B18" }, { formula: "Calc!B19" }]];
  suction.forEach((row, i) => row.forEach((v, j) => (ws.getCell(11 + i, 1 + j).value = v as ExcelJS.CellValue)));
  put("F10", "Discharge line", true);
  const discharge = [["Length (m)", "ID (m)", "Roughness (m)", "K"], [{ formula: "Inputs!B15" }, { formula: "Calc!B17" }, { formula: "Calc!B18" }, { formula: "Calc!B20" }]];
  discharge.forEach((row, i) => row.forEach((v, j) => (ws.getCell(11 + i, 6 + j).value = v as ExcelJS.CellValue)));
  const spill = (address: string, formula: string, ref: string) => (ws.getCell(address).value = { formula, shareType: "array", ref } as ExcelJS.CellFormulaValue);
  put("A14", "Best efficiency point and preferred operating region (70 %–120 % of BEP, common practice)", true);
  spill("A15", 'NAPPE.PUMP.BEP(Pump!H3:K9, , , , "m^3/h", "m")', "A15:E16");
  put("A18", "Every case on the 265 mm impeller (site atmosphere from Calc!B4)", true);
  spill("A19", 'NAPPE.PUMP.ENVELOPE(Pump!H3:K9, A4:I8, A11:D12, F11:I12, , Calc!B4&" kPa", , , , , "m^3/h", "m", "kW")', "A19:L23");
  put("A25", "Largest power on the curve (end of curve) and the motor that never overloads", true);
  spill("A26", 'NAPPE.PUMP.MAXPOWER(Pump!H3:K9, Calc!B5, , "IEC", "m^3/h", "kW")', "A26:C27");
  put("A29", "The impellers compared over every case; the design case must deliver the duty flow (Calc!B11)", true);
  spill("A30", 'NAPPE.PUMP.SHORTLIST(Pump!A3:E21, A4:I8, A11:D12, F11:I12, , Calc!B4&" kPa", , "IEC", "m^3/h", "m", "kW", Calc!B11&" m^3/h")', "A30:K33");
  // Narrow number columns and wrapped verdicts (the envelope's in L, the selection table's in K),
  // so that the sheet prints one page wide at 60 % or more on A4 and Letter.
  ws.getColumn(1).width = 22;
  for (let c = 2; c <= 10; c++) ws.getColumn(c).width = 10;
  ws.getColumn(11).width = 24;
  ws.getColumn(12).width = 24;
  for (const r of [4, 11, 15, 19, 26, 30]) {
    ws.getRow(r).alignment = { wrapText: true, vertical: "top" };
    ws.getRow(r).height = r === 4 ? 42 : 28;
  }
  for (const address of ["L20", "L21", "L22", "L23", "K31", "K32", "K33"]) ws.getCell(address).alignment = { wrapText: true, vertical: "top" };
  for (const r of [20, 21, 22, 23]) ws.getRow(r).height = 26;
  for (const r of [9, 13, 17, 24, 28]) ws.getRow(r).height = 8;
  for (const r of [31, 32, 33]) ws.getRow(r).height = r === 33 ? 80 : 50;
  printSetup(ws, "A1:L33", "landscape");
}

/**
 * What a printed page shows: the used area only, fitted to one page wide (the sheets are laid
 * out so that this stays at 60 % or more on A4 and Letter), as many pages tall as needed, with
 * the header row repeated.
 */
function printSetup(ws: ExcelJS.Worksheet, area: string, orientation: "portrait" | "landscape", titles?: string): void {
  ws.pageSetup = {
    ...ws.pageSetup,
    printArea: area,
    orientation,
    paperSize: 9,
    fitToPage: true,
    fitToWidth: 1,
    fitToHeight: 0,
    // Each sheet's pages numbered from 1 (without it LibreOffice numbers on from the sheet before).
    firstPageNumber: 1,
    horizontalCentered: false,
    margins: { left: 0.5, right: 0.5, top: 0.6, bottom: 0.6, header: 0.3, footer: 0.3 },
    ...(titles ? { printTitlesRow: titles } : {}),
  };
  ws.headerFooter = { oddFooter: "&L&A&RPage &P" };
}

/** The demo workbook with every formula's result cached from Nappe's recalculation. */
export async function buildDemoWorkbook(): Promise<ExcelJS.Workbook> {
  const book = layout();
  const result = recalculate(fromExcelJS(book), { all: true });
  for (const cell of result.cells) {
    const ws = book.getWorksheet(cell.sheet)!;
    const target = ws.getCell(cell.address);
    const v = target.value as ExcelJS.CellFormulaValue & { shareType?: string; ref?: string };
    // Every computed number shows the figures rule (4 significant figures) in any spreadsheet program.
    const figures = (c: ExcelJS.Cell, x: unknown) => {
      if (typeof x === "number") c.numFmt = numberFormatFor(x);
    };
    if (Array.isArray(cell.value)) {
      const rows = cell.value;
      const { row, col } = parseAddress(cell.address);
      target.value = { ...v, result: (rows[0]?.[0] ?? undefined) as never };
      figures(target, rows[0]?.[0]);
      rows.forEach((r, i) => r.forEach((x, j) => {
        if (!i && !j) return;
        const c = ws.getCell(addressOf(row + i, col + j));
        c.value = x as ExcelJS.CellValue;
        figures(c, x);
      }));
    } else {
      target.value = { ...v, result: (cell.value ?? undefined) as never };
      figures(target, cell.value);
    }
  }
  return book;
}

/** The demo workbook as Excel saves it (NAPPE calls in the stored form, the add-in recorded): the file's bytes. */
export async function demoWorkbookBytes(): Promise<Buffer> {
  const book = await buildDemoWorkbook();
  return (await excelStoredForm(Buffer.from(await book.xlsx.writeBuffer()))).bytes;
}


/**
 * Cross-checks of hand calculations: invented workbooks with plain formulas as an engineer
 * writes them, each with a deliberate slip the cross-check must find and name.
 */
import ExcelJS from "exceljs";
import { describe, expect, it } from "vitest";
import { colebrookFriction, swameeJainFriction } from "../functions/calc/friction";
import { crossCheckCell } from "../taskpane/crossCheck";
import { MemoryHost } from "../taskpane/host/memory";
import { fromExcelJS } from "../workbook/fromExcelJS";
import { recalculate } from "../workbook/recalc";
import { relativeError, run } from "./helpers";

/** A sheet of label/value rows (values may be formulas), as a hand calculation is laid out. */
function handSheet(rows: [string, number | string][]): MemoryHost {
  const book = new ExcelJS.Workbook();
  const ws = book.addWorksheet("Hand");
  rows.forEach(([label, v], i) => {
    ws.getCell(i + 1, 1).value = label;
    ws.getCell(i + 1, 2).value = typeof v === "string" ? { formula: v } : v;
  });
  return new MemoryHost(fromExcelJS(book));
}

// Invented pipe: 400 gpm of water at about 20 °C (1.0764e-5 ft²/s = 1 cSt) in 1000 ft of NPS 6 Sch 40 (6.065 in), ε = 0.0018 in.
const PIPE: [string, number | string][] = [
  ["Flow (gpm)", 400],
  ["Inside diameter (in)", 6.065],
  ["Length (ft)", 1000],
  ["Roughness (in)", 0.0018],
  ["Kinematic viscosity (ft^2/s)", 1.0764e-5],
];

describe("cross-check of a hand head-loss calculation", () => {
  it("finds an explicit friction formula: the friction factor is the first step that departs", async () => {
    const host = handSheet([
      ...PIPE,
      ["Velocity (ft/s)", "B1*0.002228009/(PI()*(B2/12)^2/4)"],
      ["Reynolds number", "B6*(B2/12)/B5"],
      ["Friction factor", "0.25/LOG10(B4/B2/3.7+5.74/B7^0.9)^2"],
      ["Head loss (ft)", "B8*B3/(B2/12)*B6^2/(2*32.174)"],
    ]);
    const r = await crossCheckCell(host, "Hand", "B9", "HEADLOSS");
    expect(Object.fromEntries(r.inputs.map((x) => [x.name, x.from]))).toMatchObject({ flow: "B1", diameter: "B2", length: "B3", roughness: "B4", kinematic_viscosity: "B5" });
    // Independent check of the difference: Swamee–Jain against Colebrook at the same Re and ε/D (the other factors cancel).
    const re = r.evaluation.steps.find((s) => s.symbol === "Re")!.value;
    const want = swameeJainFriction(re, 0.0018 / 6.065) / colebrookFriction(re, 0.0018 / 6.065) - 1;
    expect(Math.abs(r.relativeDifference - want)).toBeLessThan(1e-5);
    expect(r.departures[0]).toMatchObject({ cell: "B8", symbol: "f" });
    expect(r.lines[1]).toMatch(/^First step that departs: B8 f \(Darcy friction factor\) 0\.0\d+ vs Nappe 0\.0\d+, \+0\.\d+ %$/);
    expect(r.causes.join("; ")).toMatch(/explicit friction formula \(Swamee–Jain\)/);
    expect(r.keepFormula).toBe('NAPPE.CROSSCHECK(B9, NAPPE.HEADLOSS(B1&" gpm", B2&" in", B3&" ft", B4&" in", B5&" ft^2/s", "ft"), 0.005)');
  });
  it("finds a gpm / ft³/s slip at the velocity", async () => {
    const host = handSheet([
      ...PIPE,
      ["Velocity (ft/s)", "B1/(PI()*(B2/12)^2/4)"],
      ["Reynolds number", "B6*(B2/12)/B5"],
      ["Friction factor", "0.25/LOG10(B4/B2/3.7+5.74/B7^0.9)^2"],
      ["Head loss (ft)", "B8*B3/(B2/12)*B6^2/(2*32.174)"],
    ]);
    const r = await crossCheckCell(host, "Hand", "B9", "HEADLOSS");
    expect(r.verdict).toBe("differs");
    expect(r.departures[0]).toMatchObject({ cell: "B6", symbol: "V" });
    expect(r.causes.join("; ")).toMatch(/gpm \/ ft³\/s slip/);
  });
});

describe("cross-check of a hand shaft-power calculation", () => {
  it("never agrees while a default stands in: incomplete (no temperature anywhere), and names g = 9.81 and a density of 1000", async () => {
    const host = handSheet([
      ["Flow (m^3/h)", 100],
      ["Head (m)", 50],
      ["Efficiency", 0.75],
      ["Shaft power (kW)", "1000*9.81*B1/3600*B2/B3/1000"],
    ]);
    const r = await crossCheckCell(host, "Hand", "B4", "POWER.SHAFT");
    // By hand: 1000·9.81 over water at 20 °C (998.21 kg/m³, IAPWS-IF97; from the water tests) times 9.80665.
    expect(relativeError(1 + r.relativeDifference, (1000 * 9.81) / (998.21 * 9.80665))).toBeLessThan(2e-5);
    expect(r.verdict).toBe("incomplete");
    expect(r.headline).toMatch(/^Incomplete: Nappe assumed water at 20 °C for the density/);
    expect(r.causes.join("; ")).toMatch(/g = 9\.81 m\/s²/);
    expect(r.causes.join("; ")).toMatch(/density 1000 kg\/m³/);
  });
});

describe("cross-check of a hand NPSHa calculation", () => {
  it("names gauge pressure used where absolute is expected", async () => {
    const host = handSheet([
      ["Surface pressure, gauge (kPa)", 0],
      ["Liquid level above the eye (m)", -3],
      ["Suction loss (m)", 1],
      ["Water temperature (degC)", 20],
      ["Vapour pressure (kPa)", 2.3393],
      ["NPSH available (m)", "(B1-B5)*1000/(998.2*9.80665)+B2-B3"],
    ]);
    // Nappe needs an absolute pressure and the temperature (the hand formula reads only the vapour
    // pressure): the reviewer maps both by hand.
    const r = await crossCheckCell(host, "Hand", "B6", "NPSHA", { mapping: { surface_pressure: "101.325 kPa", temperature: "20 degC" } });
    expect(r.verdict).toBe("differs");
    expect(r.causes.join("; ")).toMatch(/gauge pressure used where absolute is expected/);
    expect(r.causes.join("; ")).not.toMatch(/density 1000/); // its 1000 turns kPa into Pa: not a density
    // The gap is the atmosphere as head: 101.325 kPa/(ρg) ≈ 10.35 m at 20 °C.
    expect(Math.abs(r.hand - r.nappe + 101325 / (998.21 * 9.80665))).toBeLessThan(0.02);
  });
});

describe("NAPPE.CROSSCHECK keeps the check in the workbook", () => {
  it("returns (hand − Nappe)/Nappe, warns beyond the tolerance, and is listed by the recalculation", () => {
    expect(run("CROSSCHECK", 10.2, 10).value).toBeCloseTo(0.02, 15);
    expect(run("CROSSCHECK", 10.2, 10).warnings[0]).toMatch(/^Differs: the hand value is 2\.00 % above Nappe's \(tolerance 0\.500 %\)/);
    expect(run("CROSSCHECK", 10.03, 10).warnings).toEqual([]);
    const book = new ExcelJS.Workbook();
    const ws = book.addWorksheet("Hand");
    ws.getCell("A1").value = 3.2;
    ws.getCell("B1").value = { formula: 'NAPPE.CROSSCHECK(A1, NAPPE.CONVERT(1, "m", "m")*3.3, "1%")' };
    const [cell] = recalculate(fromExcelJS(book)).cells;
    expect(cell.status).toBe("warning");
    expect(cell.messages.join(" ")).toMatch(/Differs/);
  });
});

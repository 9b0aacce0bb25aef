/**
 * The pump over its operating envelope, against independent solutions: every corner solved
 * with SciPy (PCHIP, brentq, Colebrook) and the BEP from numpy.polyfit, in
 * test/reference/envelope_reference.py; parallel pumps against hand-added flows at equal head;
 * end-of-curve power against the table's own power column.
 */
import { describe, expect, it } from "vitest";
import { failure, relativeError, run } from "./helpers";
import ref from "./reference/envelope_reference.json";

const HP = 745.69987158227022; // W per mechanical horsepower (NIST SP 811)
const curve = [["Flow (gpm)", "Head (ft)", "Eff (%)", "NPSHr (ft)"], ...ref.curve.map((r) => r.map((v) => (v === null ? "" : v)))];
const segments = (rows: number[][]) => [["Length (m)", "ID (m)", "Roughness (m)", "K"], ...rows];
const cases = [
  ["Case", "Suction level (m)", "Discharge level (m)", "Roughness (m)", "Temperature (degC)", "Pumps", "Speed", "Hours"],
  ...ref.cases.map(([label, zs, zd, rough, temp, n, r, hours]) => [label, zs, zd, rough ?? "", temp, n, r, hours]),
] as (string | number)[][];
const envelope = (...more: (string | number | null)[]) => run("PUMP.ENVELOPE", curve, cases, segments(ref.suction), segments(ref.discharge), ...more);
type Row = (string | number)[];

describe("best efficiency point", () => {
  it("is the vertex of the least-squares parabola through the top efficiency point and its neighbours (numpy.polyfit)", () => {
    const [, row] = run("PUMP.BEP", curve).value as Row[];
    expect(relativeError(row[0] as number, ref.bep.flow)).toBeLessThan(1e-12);
    expect(relativeError(row[2] as number, ref.bep.efficiency * 100)).toBeLessThan(1e-12);
    expect(relativeError(row[1] as number, ref.bep.head)).toBeLessThan(1e-12); // SciPy PCHIP head at the BEP flow
    expect(relativeError(row[3] as number, 0.7 * ref.bep.flow)).toBeLessThan(1e-12); // POR 70 %–120 %: common practice (ANSI/HI 9.6.3, from memory)
  });
  it("takes the maker's BEP flow and limits when given", () => {
    const [, row] = run("PUMP.BEP", curve, "280 gpm", 0.8, 1.1, "gpm").value as Row[];
    expect(row[0]).toBeCloseTo(280, 9);
    expect(row[3]).toBeCloseTo(224, 9);
    expect(row[4]).toBeCloseTo(308, 9);
  });
  it("warns outside the preferred region and refuses flows outside the allowable region or below the minimum flow", () => {
    expect(run("PUMP.REGION", "150 gpm", curve).warnings.join(" ")).toMatch(/51 % of BEP is outside the preferred region \(70 % to 120 %\)/);
    expect(run("PUMP.REGION", "250 gpm", curve).warnings).toEqual([]);
    expect(() => run("PUMP.REGION", "150 gpm", curve, null, null, null, "180 gpm")).toThrow(/outside the allowable region \(180 gpm to 400 gpm\)/);
    expect(() => run("PUMP.REGION", "90 gpm", curve, null, null, null, null, null, "100 gpm")).toThrow(/below the minimum continuous stable flow 100 gpm/);
  });
  it("needs an efficiency column, and says so", () => {
    expect(() => run("PUMP.BEP", [["Flow (gpm)", "Head (ft)"], [0, 100], [200, 92], [400, 60]])).toThrow(/no efficiency column/);
  });
});

describe("envelope corners", () => {
  const table = envelope(null, null, null, null, null, null, "m^3/s", "m", "W").value as Row[];
  const byLabel = (label: string) => table.find((r) => r[0] === label)!;
  it.each(ref.corners.map((c) => [c.label, c] as const))("%s: flow, head, % BEP, efficiency, power, NPSHa, NPSHr and margin as SciPy solves them", (label, c) => {
    const row = byLabel(label);
    // Water in the reference is from 5-figure handbook tables (from memory), so agreement is about 1e-5.
    const close = (got: Row[number], want: number) => expect(relativeError(got as number, want), `${label}: ${got} vs ${want}`).toBeLessThan(3e-5);
    close(row[1], c.flow_total);
    close(row[2], c.flow_per_pump);
    close(row[3], c.head);
    close(row[4], c.fraction_of_bep * 100);
    close(row[5], c.efficiency * 100);
    close(row[6], c.shaft_power);
    close(row[7], c.npsha);
    close(row[8], c.npshr);
    close(row[9], c.margin);
    close(row[10], c.energy_kwh);
  });
  it("gives each corner its verdict: a parallel pump far left of BEP warns, a deep lift fails on NPSH margin", () => {
    expect(byLabel("design")[11]).toBe("ok");
    expect(byLabel("two pumps")[11]).toMatch(/^warning: 61 % of BEP is outside the preferred region/);
    expect(byLabel("deep lift")[11]).toMatch(/^fails: NPSH margin 0\.54 is below 1\.1/);
    expect(envelope().warnings.join(" ")).toMatch(/1 of 5 corners fail: deep lift/);
  });
  it("with two pumps in parallel, each gives the head at its own flow and the flows add at equal head (hand check)", () => {
    const two = byLabel("two pumps");
    expect(two[1]).toBeCloseTo(2 * (two[2] as number), 12);
    expect(relativeError(two[3] as number, run("PUMP.HEAD", two[2] as number, curve).value as number)).toBeLessThan(1e-12);
    // The combined curve (flows doubled at each head) gives the same head at the total flow.
    const combined = run("PUMP.COMBINE", curve, 2, "parallel").value as Row[];
    expect(relativeError(run("PUMP.HEAD", two[1] as number, combined).value as number, two[3] as number)).toBeLessThan(1e-12);
  });
  it("takes the pump maker's own preferred region: at 60 %–130 % the parallel corner is inside it", () => {
    const rows = envelope(null, null, null, null, null, null, null, null, null, 0.6, 1.3).value as Row[];
    expect(rows[3][11]).toBe("ok");
  });
  it("a corner beyond the curve's end is a failing row that says so, not an error of the whole table", () => {
    const high = [cases[0], cases[1], ["above shutoff", 0, 40, "", 15, 1, 1, 100]];
    const rows = run("PUMP.ENVELOPE", curve, high, segments(ref.suction), segments(ref.discharge)).value as Row[];
    expect(rows[1][11]).toBe("ok");
    expect(rows[2][11]).toMatch(/^fails: the system needs more head than the pump gives anywhere on its curve/);
    expect(rows[2][1]).toBe("");
  });
  it("says when the motor covers every case but not the end of the curve (8.66 hp at 400 gpm, against the table)", () => {
    const four = cases.slice(0, 5);
    const ev = run("PUMP.ENVELOPE", curve, four, segments(ref.suction), segments(ref.discharge), null, null, null, "8 hp", null, null, "gpm", "ft", "hp");
    expect((ev.value as Row[]).slice(1).map((r) => r[11])).not.toContainEqual(expect.stringMatching(/overloads/));
    expect(ev.warnings.join(" ")).toMatch(/The 8 hp motor covers every case but not the end of the curve: 8\.6\d* hp at 400 gpm/);
    expect(run("PUMP.ENVELOPE", curve, four, segments(ref.suction), segments(ref.discharge), null, null, null, "10 hp").warnings.join(" ")).not.toMatch(/end of the curve/);
  });
  it("fails a corner whose shaft power overloads the motor given", () => {
    const rows = envelope(null, null, null, "7.5 hp", null, null, "gpm", "ft", "hp").value as Row[];
    expect(rows[1][11]).toBe("fails: shaft power 7.97 hp overloads the 7.5 hp motor");
    expect(rows[5][11]).toMatch(/^fails: NPSH margin 0\.54 is below 1\.1 \(NPSHa 4\.49\d* ft, NPSHr 8\.29\d* ft\)/);
  });
});

describe("end-of-curve power and the selection table", () => {
  it("the largest power of a curve with a power column is the table's largest (here its last point)", () => {
    const withPower = [["Flow (m^3/h)", "Head (m)", "Power (kW)"], [0, 40, 5], [50, 38, 8], [100, 33, 11], [150, 25, 13]];
    const [, row] = run("PUMP.MAXPOWER", withPower, null, null, "iec", "m^3/h", "kW").value as Row[];
    expect(row[0]).toBeCloseTo(13, 9);
    expect(row[1]).toBeCloseTo(150, 9);
    expect(row[2]).toBe(15); // IEC 60072-1: 11 then 15 kW (from memory)
  });
  it("finds the flow of the largest power inside the curve to 1e-7, as SciPy's bounded optimiser does (not to the nearest grid step)", () => {
    // test/reference/envelope_reference.py: the best of 400 even steps, then minimize_scalar(method="bounded") between its neighbours.
    const peak = [["Flow (gpm)", "Head (ft)", "Eff (%)"], ...(ref.curve_peak as number[][])];
    const [, row] = run("PUMP.MAXPOWER", peak, 999.1, null, "nema", "m^3/s", "W").value as Row[];
    expect(Math.abs((row[1] as number) / ref.max_power_peak_15C.flow - 1)).toBeLessThan(1e-7);
    expect(Math.abs((row[0] as number) / ref.max_power_peak_15C.power - 1)).toBeLessThan(1e-12);
    // 810.51 gpm: between the grid's steps of 2.5 gpm (810 and 812.5).
    expect((row[1] as number) / (3.785411784e-3 / 60)).toBeCloseTo(810.513, 3);
  });
  it("names the speed ratio when it is not above 0, and the duty flow when it is negative", () => {
    const curve = [["Flow (gpm)", "Head (ft)", "Eff (%)"], ...(ref.curve_peak as number[][])];
    expect(failure("PUMP.MAXPOWER", curve, null, -0.9).message).toMatch(/^ratio: expected a speed ratio above 0/);
    expect(failure("PUMP.MAXPOWER", curve, null, 0).message).toMatch(/^ratio: expected a speed ratio above 0/);
    const family = [["Impeller (mm)", "Flow (gpm)", "Head (ft)", "Eff (%)", "NPSHr (ft)"], ...ref.curve.map(([q, ...r]) => [250, q, ...r.map((v) => (v === null ? "" : v))])];
    expect(failure("PUMP.SHORTLIST", family, cases.slice(0, 2), segments(ref.suction), segments(ref.discharge), null, null, null, "nema", "gpm", "ft", "hp", "-50 gpm").message).toMatch(/^duty_flow: expected a flow above 0 .*got -50 gpm/);
  });
  it("a curve whose largest power no listed motor covers is an error naming the curve, with figures that differ (found by the fuzz test)", () => {
    const big = [["Flow (m^3/h)", "Head (m)", "Power (kW)"], [0, 40, 500], [50, 38, 700], [100, 33, 745.7 + 0.001]];
    expect(failure("PUMP.MAXPOWER", big, null, null, "nema", "m^3/h", "kW").message).toMatch(/^curve: 745\.70100 kW \(the largest shaft power on it\) is above the largest NEMA rating listed here \(745\.69987 kW\)/);
  });
  it("in the selection table, a candidate no listed motor covers is a failing row, not an error of the table", () => {
    // The same curve with every flow ×200: its end-of-curve power is 200 × 8.66 hp, beyond NEMA's 1000 hp.
    const family = [["Impeller (mm)", "Flow (gpm)", "Head (ft)", "Eff (%)", "NPSHr (ft)"], ...ref.curve.map(([q, ...r]) => [250, (q as number) * 200, ...r.map((v) => (v === null ? "" : v))])];
    const rows = run("PUMP.SHORTLIST", family, cases.slice(0, 2), segments(ref.suction), segments(ref.discharge), null, null, null, "nema", "gpm", "ft", "hp").value as Row[];
    expect(rows[1][7]).toBe("");
    expect(rows[1][10]).toMatch(/no listed motor rating covers its 17\d\d(\.\d+)? hp/);
  });
  it("the selection table recommends the passing impeller with the best design efficiency and says why the other lost", () => {
    const family = [
      ["Impeller (mm)", "Flow (gpm)", "Head (ft)", "Eff (%)", "NPSHr (ft)"],
      ...[230, 250].flatMap((d) => (d === 250 ? ref.curve : [[0, 86, 0, null], [100, 84, 53, 6], [200, 78, 70, 8], [300, 66, 73, 11], [400, 46, 66, 16]]).map((r) => [d, ...r.map((v) => (v === null ? "" : v))])),
    ];
    const rows = run("PUMP.SHORTLIST", family, cases, segments(ref.suction), segments(ref.discharge), null, null, null, "nema", "gpm", "ft", "hp").value as Row[];
    // With the deep-lift case both fail on NPSH margin; nothing is recommended and both say why.
    expect(rows[1][10]).toMatch(/^fails: deep lift: NPSH margin/);
    expect(rows[2][10]).toMatch(/^fails: deep lift: NPSH margin/);
    const fourCases = cases.slice(0, 5);
    const ok = run("PUMP.SHORTLIST", family, fourCases, segments(ref.suction), segments(ref.discharge), null, null, null, "nema", "gpm", "ft", "hp");
    const table = ok.value as Row[];
    expect(table[2][10]).toMatch(/^recommended/);
    expect(table[1][10]).toMatch(/^passes, but 72\.6 % at the design duty against 76\.0 % for 250$/);
    expect(relativeError(table[2][6] as number, ref.end_of_curve_15C.power / HP)).toBeLessThan(2e-4); // water at 15 °C from the handbook (from memory)
    // Asked to deliver 280 gpm at the design case, the smaller impeller (266.6 gpm there) fails and says by how much.
    const duty = run("PUMP.SHORTLIST", family, fourCases, segments(ref.suction), segments(ref.discharge), null, null, null, "nema", "gpm", "ft", "hp", "280 gpm").value as Row[];
    expect(duty[1][10]).toMatch(/^fails: design: delivers 266\.6\d* gpm, short of the duty 280 gpm$/);
    expect(duty[2][10]).toMatch(/^recommended/);
  });
});

describe("every duty against its BEP", () => {
  it("PUMP.DUTY keeps its result and shape, and now records % of BEP and warns outside the preferred region", () => {
    // Static head 60 ft with a small resistance: the duty sits far right of the BEP (292.6 gpm).
    const ev = run("PUMP.DUTY", curve, "60 ft", 0, null, "gpm", "ft");
    const [[q, h]] = ev.value as number[][];
    expect(h).toBeCloseTo(60, 9);
    expect(q).toBeGreaterThan(351); // beyond 120 % of BEP
    expect(ev.steps.find((s) => s.symbol === "Q*/Q_BEP")!.value).toBeCloseTo(q / (ref.bep.flow / (3.785411784e-3 / 60)), 9);
    expect(ev.warnings.join(" ")).toMatch(/1\d\d % of BEP is outside the preferred region \(70 % to 120 %\)/);
  });
});

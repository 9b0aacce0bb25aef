import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { affinityRatioThrough } from "../functions/calc/affinity";
import { operatingPoint } from "../functions/calc/operatingPoint";
import { checkSeries, interpolant, valueAt } from "../functions/calc/pumpCurve";
import type { RawArg } from "../functions/bind/evaluate";
import { failure, relativeError, run } from "./helpers";

// SciPy PchipInterpolator, numpy.polyfit and scipy.optimize.brentq, run by
// test/reference/curve_reference.py (versions recorded in the JSON).
const ref = JSON.parse(readFileSync(new URL("./reference/curve_reference.json", import.meta.url), "utf8")) as {
  curves: Record<string, { x: number[]; y: number[]; q: number[]; pchip: number[]; quadratic?: number[]; cubic?: number[] }>;
  operating_points: { curve: string; static_head: number; k: number; flow: number; head: number }[];
  affinity_ratios: { curve: string; flow: number; head: number; ratio: number }[];
};


describe("curve evaluation against SciPy and NumPy", () => {
  for (const [name, c] of Object.entries(ref.curves)) {
    it(`PCHIP matches scipy.interpolate.PchipInterpolator on the "${name}" curve`, () => {
      const f = interpolant({ x: c.x, y: c.y }, "pchip");
      c.q.forEach((q, i) => expect(Math.abs(f.at(q) - c.pchip[i]), `q = ${q}`).toBeLessThan(1e-12 * Math.max(1, Math.abs(c.pchip[i]))));
    });
    for (const fit of ["quadratic", "cubic"] as const) {
      const want = c[fit];
      if (!want) continue;
      it(`least-squares ${fit} matches numpy.polyfit on the "${name}" curve`, () => {
        const f = interpolant({ x: c.x, y: c.y }, fit);
        c.q.forEach((q, i) => expect(Math.abs(f.at(q) - want[i]), `q = ${q}`).toBeLessThan(1e-9 * Math.max(1, Math.abs(want[i]))));
      });
    }
  }
  it("never extrapolates beyond the curve's flows", () => {
    const f = interpolant({ x: [0, 1, 2], y: [3, 2, 1] });
    expect(() => valueAt("flow", "head", f, 2.5)).toThrow(/^flow: .*never extrapolated/);
    expect(valueAt("flow", "head", f, 2)).toBe(1);
  });
  it("preserves monotonic data (no overshoot between points)", () => {
    const c = ref.curves.falling;
    const f = interpolant({ x: c.x, y: c.y });
    for (let q = 0; q <= 0.05; q += 0.0005) expect(f.at(q)).toBeLessThanOrEqual(52 + 1e-12);
  });
});

describe("operating point against independently solved cases", () => {
  it.each(ref.operating_points)("matches brentq on SciPy PCHIP: $curve curve, Hs = $static_head m, k = $k", (c) => {
    const curve = ref.curves[c.curve];
    const p = operatingPoint(interpolant({ x: curve.x, y: curve.y }), (q) => c.static_head + c.k * q * q).value;
    expect(relativeError(p.flow, c.flow)).toBeLessThan(1e-10);
    expect(relativeError(p.head, c.head)).toBeLessThan(1e-10);
  });
  it("lies on both curves", () => {
    const c = ref.curves.falling;
    const f = interpolant({ x: c.x, y: c.y });
    const p = operatingPoint(f, (q) => 25 + 6000 * q * q).value;
    expect(Math.abs(f.at(p.flow) - (25 + 6000 * p.flow * p.flow))).toBeLessThan(1e-9);
  });
  it("is an error when the system needs more head than the pump has", () => {
    const c = ref.curves.falling;
    expect(() => operatingPoint(interpolant({ x: c.x, y: c.y }), () => 60)).toThrow(/^system: the system needs more head/);
  });
  it("is an error when the pump would run beyond its curve", () => {
    const c = ref.curves.falling;
    expect(() => operatingPoint(interpolant({ x: c.x, y: c.y }), () => 10)).toThrow(/^system: the curves do not cross/);
  });
  it("takes the higher-flow crossing of a drooping curve, with a warning", () => {
    const c = ref.curves.drooping;
    const p = operatingPoint(interpolant({ x: c.x, y: c.y }), () => 31);
    expect(p.value.flow).toBeGreaterThan(0.012);
    expect(p.warnings.join(" ")).toMatch(/cross 2 times/);
  });
});

describe("affinity ratio, trim and speed", () => {
  it.each(ref.affinity_ratios)("ratio matches brentq on SciPy PCHIP: $curve curve through ($flow, $head)", (c) => {
    const curve = ref.curves[c.curve];
    expect(relativeError(affinityRatioThrough(interpolant({ x: curve.x, y: curve.y }), c.flow, c.head).value, c.ratio)).toBeLessThan(1e-10);
  });
  const table = ref.curves.falling.x.map((x, i) => [x, ref.curves.falling.y[i]]);
  it("the scaled curve passes through the duty point (affinity identity)", () => {
    const r = run("AFFINITY.RATIO", table, 0.03, 38).value as number;
    const scaled = run("PUMP.SCALE", table, r).value as number[][];
    expect(Math.abs((run("PUMP.HEAD", 0.03, scaled).value as number) - 38)).toBeLessThan(0.05); // a new PCHIP through scaled points: close, not exact
  });
  it("scaling by r then 1/r returns the curve", () => {
    const back = run("PUMP.SCALE", run("PUMP.SCALE", table, 0.8).value as RawArg[][], 1 / 0.8).value as number[][];
    back.forEach((row, i) => row.forEach((v, j) => expect(relativeError(v, table[i][j]) < 1e-12 || Math.abs(v - table[i][j]) < 1e-15).toBe(true)));
  });
  it("TRIM = ratio × diameter, and warns on deep trims (common practice: more than 10 %)", () => {
    const t = run("TRIM", table, "250 mm", 0.03, 38, "mm");
    expect(relativeError(t.value as number, 250 * 0.9293993574625354)).toBeLessThan(1e-10);
    expect(t.warnings.join(" ")).not.toMatch(/Trim of/);
    expect(run("TRIM", table, 0.25, 0.02, 25).warnings.join(" ")).toMatch(/Trim/);
  });
  it("TRIM above the full diameter is an error", () => {
    expect(failure("TRIM", table, 0.25, 0.02, 60)).toMatchObject({ arg: "head", kind: "num" });
  });
  it("SPEED = ratio × speed and warns above the curve's speed", () => {
    const s = run("SPEED", table, 1450, 0.02, 60);
    expect(relativeError(s.value as number, 1450 * 1.1008929028323229)).toBeLessThan(1e-10);
    expect(s.warnings.join(" ")).toMatch(/maximum speed/);
  });
});

describe("curve tables", () => {
  const US = [
    ["Flow (gpm)", "Head [ft]", "Eff (%)"],
    [300, 80, 76],
    [0, 100, 0],
    [200, 92, 72],
    [100, 98, 55],
    ["", "", ""],
    [null, null, null],
  ];
  it("reads units from the header, sorts unsorted flows and ignores blank trailing rows", () => {
    const h = run("PUMP.HEAD", "100 gpm", US, "ft").value as number;
    expect(h).toBeCloseTo(98, 10);
  });
  it("gives the same head from SI and US tables", () => {
    const si = [["Q (L/s)", "H (m)"], ...[0, 100, 200, 300].map((g, i) => [g * 0.0630901964, [100, 98, 92, 80][i] * 0.3048])];
    expect(run("PUMP.HEAD", "150 gpm", si, "ft").value).toBeCloseTo(run("PUMP.HEAD", "150 gpm", US, "ft").value as number, 9);
  });
  it("accepts text quantities in cells", () => {
    expect(run("PUMP.HEAD", "100 gpm", [["0 gpm", "100 ft"], ["100 gpm", "98 ft"], ["200 gpm", "92 ft"]], "ft").value).toBeCloseTo(98, 10);
  });
  it("rejects repeated flows", () => {
    expect(failure("PUMP.HEAD", 0.01, [[0, 10], [0.01, 9], [0.01, 8]]).message).toMatch(/appears twice/);
  });
  it("rejects fewer than three points", () => {
    expect(failure("PUMP.HEAD", 0.005, [[0, 10], [0.01, 9]]).message).toMatch(/at least 3 points/);
  });
  it("rejects a head curve that falls and rises again", () => {
    expect(failure("PUMP.HEAD", 0.01, [[0, 10], [0.01, 9], [0.02, 9.5], [0.03, 7]]).message).toMatch(/rises again/);
  });
  it("rejects a percent-looking efficiency column without a % header", () => {
    const e = failure("PUMP.EFFICIENCY", 0.01, [["Flow", "Head", "Eff"], [0, 10, 0], [0.01, 9, 70], [0.02, 8, 75]]);
    expect(e.message).toMatch(/looks like percent/);
  });
  it("names an unknown header", () => {
    expect(failure("PUMP.HEAD", 0.01, [["Flow (gpm)", "Colour"], [0, 1], [1, 1], [2, 1]]).message).toMatch(/header "Colour"/);
  });
  it("rejects a header unit of the wrong dimension", () => {
    expect(failure("PUMP.HEAD", 0.01, [["Flow (psi)", "Head (ft)"], [0, 1], [1, 1], [2, 1]]).message).toMatch(/pressure unit/);
  });
  it("rejects a blank row inside the table", () => {
    expect(failure("PUMP.HEAD", 0.01, [[0, 10], [null, null], [0.01, 9], [0.02, 8]]).message).toMatch(/blank inside/);
  });
  // The same invented curve in the layouts engineers' own workbooks use: each reads as "Flow (gpm)" does.
  it.each([
    ["a units row under the names", [["Flow", "Head", "Eff", "P"], ["gpm", "ft", "%", "bhp"]]],
    ["name, comma, unit", [["Flow, gpm", "Head, ft", "Eff, %", "Power, bhp"]]],
    ["name then unit", [["Q gpm", "H ft", "Eff. %", "P bhp"]]],
    ["US gallons said so", [["Q (US gpm)", "TDH (ft)", "Eff.%", "P (bhp)"]]],
  ])("reads the header as %s", (_, head) => {
    const rows = [[0, 100, 0, 4], [100, 98, 55, 5], [200, 92, 72, 6.5], [300, 80, 76, 8]];
    const table = [...head, ...rows];
    expect(run("PUMP.HEAD", "150 gpm", table, "ft").value).toBeCloseTo(run("PUMP.HEAD", "150 gpm", US, "ft").value as number, 12);
    expect(run("PUMP.EFFICIENCY", "200 gpm", table).value).toBeCloseTo(0.72, 12);
    expect(run("PUMP.POWER", "200 gpm", table, null, "hp").value).toBeCloseTo(6.5, 12);
  });
  it("reads the imperial gallon only when the header says so: 100 UK gpm = 120.095 US gpm (4.54609 L vs 3.785411784 L, NIST SP 811)", () => {
    const uk = [["Q (UK gpm)", "H (ft)"], [0, 100], [100, 98], [200, 92], [300, 80]];
    const us = [["Q (gpm)", "H (ft)"], [0, 100], [120.09499255, 98], [240.1899851, 92], [360.28497765, 80]];
    expect(run("PUMP.HEAD", "150 igpm", uk, "ft").value).toBeCloseTo(run("PUMP.HEAD", "180.1424888 gpm", us, "ft").value as number, 6);
    expect(run("CONVERT", 100, "igpm", "gpm").value).toBeCloseTo(120.09499255, 6);
  });
  it("names the column whose unit cannot be read, and a names row and units row that disagree", () => {
    expect(failure("PUMP.HEAD", 0.01, [["Flow, bananas", "Head (m)"], [0, 1], [1, 1], [2, 1]]).message).toMatch(/unknown unit "bananas"/);
    expect(failure("PUMP.HEAD", 0.01, [["Flow (gpm)", "Head"], ["L/s", "m"], [0, 1], [1, 1], [2, 1]]).message).toMatch(/column "Flow \(gpm\)" names the unit gpm and the units row under it L\/s/);
  });
  it("says which column is missing", () => {
    expect(failure("PUMP.NPSHR", 0.01, [[0, 10], [0.01, 9], [0.02, 8]]).message).toMatch(/no NPSHr column/);
  });
});

describe("PUMP.POWER, COMBINE and SELECT", () => {
  const curve = [["Flow (m^3/h)", "Head (m)", "Power (kW)"], [0, 40, 5], [50, 38, 8], [100, 33, 11], [150, 25, 13]];
  it("uses the power column when there is one", () => {
    expect(run("PUMP.POWER", "50 m^3/h", curve, null, "kW").value).toBeCloseTo(8, 10);
  });
  it("series pumps double the head and keep the flows", () => {
    const s = run("PUMP.COMBINE", curve, 2, "series").value as (number | string)[][];
    expect(s[0]).toEqual(["Flow (m^3/h)", "Head (m)", "Power (kW)"]);
    expect(s[2]).toEqual([50, 76, 16]);
  });
  it("selects the smallest impeller that meets the duty and errors when none does", () => {
    const family = [
      ["Impeller", "Flow (gpm)", "Head (ft)"],
      ["large", 0, 120], ["large", 200, 110], ["large", 400, 80],
      ["small", 0, 90], ["small", 200, 82], ["small", 400, 60],
    ];
    // Labels are taken in the order listed.
    expect((run("PUMP.SELECT", family, "200 gpm", "100 ft", "ft").value as unknown[][])[0][0]).toBe("large");
    expect(failure("PUMP.SELECT", family, "200 gpm", "130 ft")).toMatchObject({ arg: "head" });
    expect(failure("PUMP.SELECT", family, "500 gpm", "50 ft")).toMatchObject({ arg: "flow" });
  });
  it("chooses the smallest of several sized impellers that meet the duty, whatever the order listed", () => {
    // Invented family, hand-checkable: at 200 gpm the 9, 10 and 11 in impellers give 95, 105 and 115 ft (table points).
    const rows = (d: number, h0: number) => [[d, 0, h0 + 10], [d, 200, h0], [d, 400, h0 - 30]];
    const family = [["Impeller (in)", "Flow (gpm)", "Head (ft)", "Eff (%)"], ...[...rows(11, 115), ...rows(9, 95), ...rows(10, 105)].map((r) => [...r, 60 + r[0]])];
    const out = run("PUMP.SELECT", family, "200 gpm", "100 ft", "ft").value as unknown[][];
    expect(out[0][0]).toBe(10); // 10 and 11 in both reach 100 ft; the smaller wins
    expect(out[0][1]).toBeCloseTo(105, 10);
    expect(out[0][2]).toBeCloseTo(0.7, 12); // 70 % at that point, as a fraction
    expect((run("PUMP.SELECT", family, "200 gpm", "90 ft", "ft").value as unknown[][])[0][0]).toBe(9);
  });
});

describe("table validation reaches the calc core", () => {
  it("checkSeries sorts and rejects negative flows", () => {
    expect(checkSeries("curve", "head", [2, 0, 1], [1, 3, 2], 0).x).toEqual([0, 1, 2]);
    expect(() => checkSeries("curve", "head", [-1, 0, 1], [1, 3, 2], 0)).toThrow(/zero or more/);
  });
});

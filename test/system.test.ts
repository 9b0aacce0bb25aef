import { describe, expect, it } from "vitest";
import { relativeError, run } from "./helpers";

const SEGMENTS = [
  ["Length (ft)", "ID (in)", "Roughness (mm)", "K"],
  [40, 6.065, 0.045, 1.3],
  [600, 4.026, 0.045, 5.2],
];

describe("system head", () => {
  it("equals static head plus HEADLOSS and HEADLOSS.MINOR of each segment", () => {
    const q = "350 gpm";
    const parts = [
      [run("HEADLOSS", q, "6.065 in", "40 ft", "0.045 mm").value, run("HEADLOSS.MINOR", q, "6.065 in", 1.3).value],
      [run("HEADLOSS", q, "4.026 in", "600 ft", "0.045 mm").value, run("HEADLOSS.MINOR", q, "4.026 in", 5.2).value],
    ].flat() as number[];
    const total = run("SYSTEM.HEAD", q, "35 ft", SEGMENTS).value as number;
    expect(relativeError(total, 35 * 0.3048 + parts.reduce((a, b) => a + b))).toBeLessThan(1e-12);
  });
  it("spills a system curve with a unit header that PUMP.DUTY can read back", () => {
    const curve = run("SYSTEM.CURVE", "35 ft", SEGMENTS, "500 gpm", 6, null, "gpm", "ft").value as (number | string)[][];
    expect(curve[0]).toEqual(["Flow (gpm)", "Head (ft)"]);
    expect(curve).toHaveLength(7);
    expect(curve[1]).toEqual([0, 35]);
    expect(relativeError(curve[6][1] as number, (run("SYSTEM.HEAD", "500 gpm", "35 ft", SEGMENTS, null, "ft").value as number))).toBeLessThan(1e-12);
  });
  it("PUMP.DUTY with a segments table lies on SYSTEM.HEAD and PUMP.HEAD", () => {
    const pump = [["Flow (gpm)", "Head (ft)"], [0, 140], [200, 133], [400, 115], [600, 85], [700, 66]];
    const [[q, h]] = run("PUMP.DUTY", pump, "35 ft", SEGMENTS, null, "gpm", "ft").value as number[][];
    expect(Math.abs((run("SYSTEM.HEAD", `${q} gpm`, "35 ft", SEGMENTS, null, "ft").value as number) - h)).toBeLessThan(1e-6);
    expect(Math.abs((run("PUMP.HEAD", `${q} gpm`, pump, "ft").value as number) - h)).toBeLessThan(1e-6);
  });
  it("PUMP.DUTY accepts a resistance k in a one-cell range", () => {
    const pump = [[0, 50], [0.02, 46], [0.04, 35]];
    const [[q, h]] = run("PUMP.DUTY", pump, 10, [[25000]]).value as number[][];
    expect(Math.abs(h - (10 + 25000 * q * q))).toBeLessThan(1e-9);
  });
  it("rejects a segment with zero diameter, naming the table and row", () => {
    expect(() => run("SYSTEM.HEAD", 0.01, 5, [[10, 0, 0.0001, 0]])).toThrow(/^segments: segment 1: inside diameter/);
  });
});

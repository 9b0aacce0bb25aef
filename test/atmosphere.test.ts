import { describe, expect, it } from "vitest";
import { standardAtmospherePressure } from "../functions/calc/atmosphere";

describe("US Standard Atmosphere 1976", () => {
  // Table I of NOAA-S/T 76-1562 (geometric altitude), five significant figures; transcribed from memory.
  it.each([
    [-1000, 1.1393e5],
    [0, 1.01325e5],
    [1000, 8.9876e4],
    [2000, 7.9501e4],
    [3000, 7.0121e4],
    [5000, 5.4048e4],
    [10000, 2.65e4],
    [11000, 2.27e4],
    [20000, 5.5293e3],
    [30000, 1.197e3],
    [50000, 7.9779e1],
  ])("matches table I at %d m", (z, p) => {
    expect(Math.abs(standardAtmospherePressure(z).value / p - 1)).toBeLessThan(1.5e-4);
  });
  it("rejects elevations outside -5 km to 86 km, naming the argument", () => {
    expect(() => standardAtmospherePressure(-6000)).toThrow(/^elevation: /);
    expect(() => standardAtmospherePressure(90000)).toThrow(/^elevation: /);
  });
  it("warns above 11 km", () => {
    expect(standardAtmospherePressure(12000).warnings.length).toBe(1);
    expect(standardAtmospherePressure(3000).warnings).toEqual([]);
  });
});

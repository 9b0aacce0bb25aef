import { describe, expect, it } from "vitest";
import { convertUnits, fromBase, parseQuantity } from "../functions/units/quantity";

const rel = (a: number, b: number) => Math.abs(a / b - 1);

describe("conversion factors (NIST SP 811, appendix B)", () => {
  // Exact factors to 1e-15; NIST SP 811's 7-digit factors to their rounding (5e-7).
  it.each([
    ["1 in", "length", 0.0254, 1e-15],
    ["1 ft", "length", 0.3048, 1e-15],
    ["1 gpm", "flow", 3.785411784e-3 / 60, 1e-15],
    ["1 MGD", "flow", 3.785411784e3 / 86400, 1e-15],
    ["1 cfs", "flow", 0.3048 ** 3, 1e-15],
    ["1 psi", "pressure", 6.894757e3, 5e-7],
    ["1 ftH2O", "pressure", 2.989067e3, 5e-7],
    ["1 inH2O", "pressure", 2.490889e2, 5e-7],
    ["1 mmHg", "pressure", 1.333224e2, 5e-7],
    ["1 inHg", "pressure", 3.386389e3, 5e-7],
    ["1 bar", "pressure", 1e5, 1e-15],
    ["1 hp", "power", 7.456999e2, 5e-7],
    ["1 lb/ft^3", "density", 1.601846e1, 5e-7],
    ["1 cP", "viscosity", 1e-3, 1e-15],
    ["1 cSt", "kinematicViscosity", 1e-6, 1e-15],
    ["1 kWh", "energy", 3.6e6, 1e-15],
  ] as const)("reads %s as NIST SP 811's factor", (text, dim, si, tol) => {
    expect(rel(parseQuantity("x", text, dim).base, si)).toBeLessThan(tol);
  });
  it("converts temperatures with their offsets (NIST SP 811 B.9)", () => {
    expect(parseQuantity("t", "68 degF", "temperature").base).toBeCloseTo(20, 12);
    expect(parseQuantity("t", "300 K", "temperature").base).toBeCloseTo(26.85, 12);
    expect(parseQuantity("t", "68 °F", "temperature").base).toBeCloseTo(20, 12);
    expect(fromBase("unit", 100, "temperature", "degF")).toBeCloseTo(212, 12);
  });
  it("reads rpm and Hz as rotational speed", () => {
    expect(parseQuantity("n", "30 Hz", "rotationalSpeed").base).toBeCloseTo(1800, 10);
  });
});

describe("text quantities", () => {
  it("reads bare numeric text in the base unit", () => {
    expect(parseQuantity("x", " 12.5 ", "length")).toEqual({ base: 12.5, number: 12.5, unit: "" });
  });
  it("reads percent for dimensionless arguments only", () => {
    expect(parseQuantity("efficiency", "78%", "efficiency").base).toBeCloseTo(0.78, 15);
    expect(() => parseQuantity("length", "78%", "length")).toThrow(/^length: /);
  });
  it("names the dimension a wrong unit belongs to", () => {
    expect(() => parseQuantity("diameter", "35 psi", "length")).toThrow('diameter: "psi" is a pressure unit, not a length');
  });
  it("rejects unknown units with the argument's name", () => {
    expect(() => parseQuantity("flow", "12 bananas", "flow")).toThrow(/^flow: unknown unit "bananas"/);
  });
  it("rejects commas rather than guess the locale", () => {
    expect(() => parseQuantity("flow", "4,000 gpm", "flow")).toThrow(/comma/);
  });
  it("never evaluates expressions or function calls", () => {
    for (const text of ["5+3 m", "2*3 m", "sqrt(4) m", "1 m; 2", "a=1", "import('x')", "cos(0) m", "1 m to ft"]) {
      expect(() => parseQuantity("length", text, "length")).toThrow(/^length: /);
    }
  });
  it("returns the same cached reading for the same text", () => {
    const a = parseQuantity("x", "400 gpm", "flow");
    expect(parseQuantity("x", "400 gpm", "flow")).toBe(a);
  });
  it("rejects numbers too large to represent", () => {
    expect(() => parseQuantity("x", "1e400 m", "length")).toThrow(/too large/);
  });
});

describe("CONVERT", () => {
  it("converts between units of one dimension", () => {
    expect(convertUnits(1, "psi", "kPa")).toBeCloseTo(6.894757293168361, 12);
  });
  it("refuses units of different dimensions, naming to_unit", () => {
    expect(() => convertUnits(1, "psi", "ft")).toThrow(/^to_unit: /);
  });
  it("refuses unknown units, naming which", () => {
    expect(() => convertUnits(1, "furlongs per fortnight", "m/s")).toThrow(/^from_unit: /);
    expect(() => convertUnits(1, "m/s", "parsecs")).toThrow(/^to_unit: /);
  });
  it("refuses a unit argument that carries a number of its own (found by the fuzz test: \"-500 degC\")", () => {
    expect(() => convertUnits(0, "-500 degC", "degF")).toThrow(/^from_unit: /);
    expect(() => convertUnits(0, "degC", "3 degF")).toThrow(/^to_unit: /);
  });
});

describe("the common-unit table (functions/units/unitFactors.ts)", () => {
  it("holds exactly the factors mathjs works out, so reading a unit gives the same number either way", async () => {
    const { UNIT_FACTORS } = await import("../functions/units/unitFactors");
    const { quantity } = await import("../functions/units/mathjs");
    const { DIMENSIONS } = await import("../functions/units/dimensions");
    let n = 0;
    for (const [dim, units] of Object.entries(UNIT_FACTORS)) {
      for (const [name, factor] of Object.entries(units)) {
        expect({ dim, name, factor }).toEqual({ dim, name, factor: quantity(1, name).toNumber(DIMENSIONS[dim as keyof typeof DIMENSIONS].base) });
        n++;
      }
    }
    expect(n).toBeGreaterThan(80);
  });
  it("leaves units it does not list to mathjs (same result as a listed spelling)", () => {
    // "gal/h" is not in the table; "L/h" is. 1 gal/h = 3.785411784 L/h exactly (NIST SP 811 B.8).
    expect(rel(parseQuantity("flow", "1 gal/h", "flow").base, parseQuantity("flow", "3.785411784 L/h", "flow").base)).toBeLessThan(1e-15);
  });
});

import { describe, expect, it } from "vitest";
import { IEC_KW, motorSize, NEMA_HP, HORSEPOWER } from "../functions/calc/motor";
import { specificSpeedValue, suctionSpecificSpeed } from "../functions/calc/specificSpeed";
import { surgePressure, waveSpeed } from "../functions/calc/surge";
import { annualEnergy } from "../functions/calc/energy";
import { relativeError } from "./helpers";

describe("motor ratings", () => {
  it("lists the NEMA MG 1 horsepower series (from memory)", () => {
    expect(NEMA_HP.slice(2, 20)).toEqual([1, 1.5, 2, 3, 5, 7.5, 10, 15, 20, 25, 30, 40, 50, 60, 75, 100, 125, 150]);
  });
  it("lists the IEC 60072-1 kW series (from memory)", () => {
    expect(IEC_KW.slice(8, 28)).toEqual([1.1, 1.5, 2.2, 3, 4, 5.5, 7.5, 11, 15, 18.5, 22, 30, 37, 45, 55, 75, 90, 110, 132, 160]);
  });
  it("picks the next rating at or above power × (1 + margin)", () => {
    expect(motorSize(40 * HORSEPOWER, "nema", 0).value / HORSEPOWER).toBeCloseTo(40, 12);
    expect(motorSize(40 * HORSEPOWER, "nema", 0.15).value / HORSEPOWER).toBeCloseTo(50, 12);
    expect(motorSize(7600, "iec", 0).value).toBe(11000);
  });
  it("rejects margins given as percent numbers and powers beyond the series", () => {
    expect(() => motorSize(1000, "iec", 15)).toThrow(/^margin: /);
    expect(() => motorSize(5e6, "nema", 0)).toThrow(/^power: /);
  });
  it("reminds to size for the end of the curve when no margin is given", () => {
    expect(motorSize(1000, "iec", 0).warnings.join(" ")).toMatch(/end of curve/);
  });
});

describe("specific speed conventions (published conversions; from memory)", () => {
  const n = 1780;
  const q = 0.05;
  const h = 30;
  it("US = 51.65 × SI (rpm, gpm, ft against rpm, m³/s, m)", () => {
    expect(relativeError(specificSpeedValue(n, q, h, "us") / specificSpeedValue(n, q, h, "si"), 51.65)).toBeLessThan(3e-4);
  });
  it("US = 2733 × dimensionless", () => {
    expect(relativeError(specificSpeedValue(n, q, h, "us") / specificSpeedValue(n, q, h, "dimensionless"), 2733)).toBeLessThan(3e-4);
  });
  it("the ratio is exact from the unit definitions: √(gal/min per m³/s) / (ft per m)^0.75", () => {
    const exact = Math.sqrt(60 / 3.785411784e-3) / Math.pow(1 / 0.3048, 0.75);
    expect(relativeError(specificSpeedValue(n, q, h, "us") / specificSpeedValue(n, q, h, "si"), exact)).toBeLessThan(1e-14);
  });
  it("warns on high suction specific speed", () => {
    expect(suctionSpecificSpeed(3550, 0.06, 3, "us").warnings.join(" ")).toMatch(/11 000/);
  });
});

describe("surge", () => {
  it("water in a rigid pipe: a = √(K/ρ), about 1483 m/s (definition)", () => {
    expect(relativeError(waveSpeed(0.3, 0.01, 1e20, 2.2e9, 1000, 1).value, Math.sqrt(2.2e6))).toBeLessThan(1e-9);
  });
  it("steel is slower than rigid, PVC much slower (Wylie & Streeter ranges: steel about 1000–1400 m/s, PVC about 300–500 m/s; from memory)", () => {
    const steel = waveSpeed(0.2, 0.008, 200e9, 2.2e9, 998, 1).value;
    const pvc = waveSpeed(0.2, 0.01, 3e9, 2.2e9, 998, 1).value;
    expect(steel).toBeGreaterThan(1000);
    expect(steel).toBeLessThan(1400);
    expect(pvc).toBeGreaterThan(300);
    expect(pvc).toBeLessThan(500);
  });
  it("Joukowsky Δp = ρaΔv", () => {
    expect(surgePressure(1200, 2, 1000).value).toBe(2.4e6);
  });
});

describe("annual energy", () => {
  it("is shaft power over motor efficiency times hours", () => {
    const e = annualEnergy(0.02, 50, 0.8, 4000, 0.9, 1000).value;
    expect(relativeError(e, ((1000 * 9.80665 * 0.02 * 50) / (0.8 * 0.9)) * 4000 * 3600)).toBeLessThan(1e-15);
  });
  it("rejects more hours than a year has", () => {
    expect(() => annualEnergy(0.02, 50, 0.8, 9000, 0.9, 1000)).toThrow(/^hours: /);
  });
});

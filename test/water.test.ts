import { describe, expect, it } from "vitest";
import {
  iapws2008Viscosity,
  if97Region1SpecificVolume,
  if97SaturationPressure,
  if97SaturationTemperature,
  saturationPressure,
  waterDensity,
  waterKinematicViscosity,
  waterViscosity,
} from "../functions/calc/water";

const rel = (a: number, b: number) => Math.abs(a / b - 1);

describe("IAPWS-IF97 region 1", () => {
  // IAPWS R7-97(2012), table 5: specific volume at the verification points.
  it.each([
    [300, 3e6, 0.100215168e-2],
    [300, 80e6, 0.971180894e-3],
    [500, 3e6, 0.1202418e-2],
  ])("matches IF97 table 5 at %d K, %d Pa", (T, p, v) => {
    expect(rel(if97Region1SpecificVolume(T, p), v)).toBeLessThan(1e-8);
  });
});

describe("IAPWS-IF97 region 4", () => {
  // IAPWS R7-97(2012), table 35: saturation pressure.
  it.each([
    [300, 0.353658941e-2],
    [500, 0.263889776e1],
    [600, 0.123443146e2],
  ])("matches IF97 table 35 at %d K", (T, pMPa) => {
    expect(rel(if97SaturationPressure(T), pMPa * 1e6)).toBeLessThan(1e-8);
  });
  // IAPWS R7-97(2012), table 36: saturation temperature.
  it.each([
    [0.1, 0.372755919e3],
    [1, 0.453035632e3],
    [10, 0.584149488e3],
  ])("matches IF97 table 36 at %d MPa", (pMPa, T) => {
    expect(rel(if97SaturationTemperature(pMPa * 1e6), T)).toBeLessThan(1e-8);
  });
  it("rejects temperatures outside the saturation line, naming the argument", () => {
    expect(() => saturationPressure(-5)).toThrow(/^temperature: /);
    expect(() => saturationPressure(400)).toThrow(/373.946/);
  });
});

describe("IAPWS 2008 viscosity", () => {
  // IAPWS R12-08, table 4: check values with μ2 = 1 (µPa·s).
  it.each([
    [298.15, 998, 889.7351],
    [298.15, 1200, 1437.649467],
    [373.15, 1000, 307.883622],
    [433.15, 1, 14.538324],
    [433.15, 1000, 217.685358],
    [873.15, 1, 32.619287],
    [873.15, 100, 35.802262],
    [873.15, 600, 77.430195],
    [1173.15, 1, 44.217245],
    [1173.15, 100, 47.640433],
    [1173.15, 400, 64.154608],
  ])("matches IAPWS 2008 table 4 at %d K, %d kg/m³", (T, rho, muMicro) => {
    expect(rel(iapws2008Viscosity(T, rho) * 1e6, muMicro)).toBeLessThan(1e-7);
  });
});

describe("liquid water at the default state", () => {
  it("gives 998.21 kg/m³ at 20 °C, 1 atm (handbook value from IAPWS-95 tables; from memory)", () => {
    expect(waterDensity(20, 101325).value).toBeCloseTo(998.21, 1);
  });
  it("gives 1.0016 mPa·s at 20 °C (CRC Handbook; from memory)", () => {
    expect(waterViscosity(20, 101325).value).toBeCloseTo(1.0016e-3, 6);
  });
  it("gives the kinematic viscosity of water at 20 °C, 1.0034 mm²/s (1.0016 mPa·s over 998.21 kg/m³: the handbook values above, from memory)", () => {
    expect(rel(waterKinematicViscosity(20, 101325).value, 1.0016e-3 / 998.21)).toBeLessThan(2e-4);
  });
});

describe("water outside the liquid range", () => {
  it("is an error above the boiling point at the given pressure, with the boiling point in the message", () => {
    expect(() => waterDensity(120, 101325)).toThrow(/temperature: .*boils at 99\.97 °C/);
  });
  it("is liquid at 120 °C under 3 bar", () => {
    expect(waterDensity(120, 3e5).value).toBeCloseTo(943.2, 0);
  });
  it("is an error below 0 °C (ice)", () => {
    expect(() => waterDensity(-1, 101325)).toThrow(/^temperature: expected liquid water/);
  });
  it("is an error for a pressure of zero or above 100 MPa", () => {
    expect(() => waterDensity(20, 0)).toThrow(/^pressure: /);
    expect(() => waterDensity(20, 2e8)).toThrow(/^pressure: /);
  });
});

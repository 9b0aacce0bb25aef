import { describe, expect, it } from "vitest";
import { fittingK, fullyTurbulentFriction } from "../functions/calc/fittings";
import { pipeDimensions } from "../functions/calc/pipeSchedule";
import { roughnessOf } from "../functions/calc/roughness";

const IN = 0.0254;

describe("pipe inside diameters (ASME B36.10M / B36.19M; values from memory of the tables)", () => {
  it.each([
    ["1/2", "40", 0.622],
    ["3/4", "40", 0.824],
    [1, "40", 1.049],
    ["1-1/4", "40", 1.38],
    ["1-1/2", "40", 1.61],
    [2, "40", 2.067],
    ["2-1/2", "40", 2.469],
    [3, "40", 3.068],
    [4, "40", 4.026],
    [6, "40", 6.065],
    [8, "40", 7.981],
    [10, "40", 10.02],
    [12, "40", 11.938],
    [12, "STD", 12.0],
    [2, "80", 1.939],
    [4, "80", 3.826],
    [6, "80", 5.761],
    [8, "XS", 7.625],
    [12, "XS", 11.75],
    [2, "160", 1.687],
    [6, "10S", 6.357],
    [4, "5S", 4.334],
    [24, "20", 23.25],
    [16, "30", 15.25],
  ] as const)("NPS %s Sch %s has ID %d in", (nps, sch, id) => {
    expect(pipeDimensions(nps, sch).inside / IN).toBeCloseTo(id, 3);
  });
  it("reads sizes and schedules written several ways", () => {
    expect(pipeDimensions("1 1/2", "sch 40").inside).toBe(pipeDimensions(1.5, 40).inside);
    expect(pipeDimensions("6\"", "std").inside).toBe(pipeDimensions(6, "STD").inside);
  });
  it("rejects sizes and schedules the standards do not list", () => {
    expect(() => pipeDimensions(7, 40)).toThrow(/^nps: /);
    expect(() => pipeDimensions(6, 45)).toThrow(/^schedule: /);
    expect(() => pipeDimensions("1/8", "160")).toThrow(/lists no schedule 160 for NPS 1\/8/);
  });
});

describe("fittings (Crane Technical Paper 410; values from memory)", () => {
  // Crane TP-410 table of f_T for clean commercial steel pipe, by nominal size (two digits; the
  // table runs up to 0.001 above the rough-pipe Colebrook value, so agreement within 6 percent).
  it.each([
    ["1/2", 0.027],
    [1, 0.023],
    [2, 0.019],
    [3, 0.018],
    [4, 0.017],
    [6, 0.015],
    [8, 0.014],
    [12, 0.013],
    [24, 0.012],
  ] as const)("f_T for NPS %s Sch 40 is within 6 percent of Crane's %d", (nps, fT) => {
    const d = pipeDimensions(nps, nps === 24 ? "STD" : "40").inside;
    expect(Math.abs(fullyTurbulentFriction(d) / fT - 1)).toBeLessThanOrEqual(0.06);
  });
  it("gives K = f_T·L/D for valves and bends", () => {
    const d = 0.1;
    expect(fittingK("gate valve", d).value).toBeCloseTo(8 * fullyTurbulentFriction(d), 15);
    expect(fittingK("Elbow-90", d).value).toBeCloseTo(30 * fullyTurbulentFriction(d), 15);
  });
  it("gives fixed K for entrances and exits", () => {
    expect(fittingK("entrance sharp", 0.1).value).toBe(0.5);
    expect(fittingK("exit", 0.1).value).toBe(1);
  });
  it("lists the known fittings when one is unknown", () => {
    expect(() => fittingK("flux capacitor", 0.1)).toThrow(/^fitting: unknown fitting .*"gate valve"/);
  });
});

describe("roughness (Moody 1944; values from memory)", () => {
  it("gives 0.045 mm for commercial steel and 0.26 mm for cast iron", () => {
    expect(roughnessOf("commercial steel").value).toBeCloseTo(0.045e-3, 12);
    expect(roughnessOf("Cast Iron").value).toBeCloseTo(0.26e-3, 12);
  });
  it("accepts common aliases and rejects unknown materials", () => {
    expect(roughnessOf("galvanised").value).toBe(roughnessOf("galvanized iron").value);
    expect(() => roughnessOf("cheese")).toThrow(/^material: /);
  });
});

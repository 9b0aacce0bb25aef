/**
 * Loads the built worksheet-functions bundle the way Excel's JavaScript runtime does: a plain
 * JS context with a CustomFunctions stub, no DOM, no Node. Requires `npm run build` first
 * (`npm test` does it).
 */
import { existsSync, readFileSync } from "node:fs";
import { join } from "node:path";
import vm from "node:vm";
import { beforeAll, describe, expect, it } from "vitest";
import { CATALOG } from "../functions/catalog";
import { expectMatchesExample, relativeError } from "./helpers";
import curveReference from "./reference/curve_reference.json";

const dist = join(__dirname, "..", "dist");

class StubError extends Error {
  constructor(readonly code: string, message?: string) {
    super(message);
  }
}
const ErrorCode = { invalidValue: "#VALUE!", invalidNumber: "#NUM!", notAvailable: "#N/A", divisionByZero: "#DIV/0!", nullReference: "#NULL!", invalidName: "#NAME?", notAvailableYet: "#GETTING_DATA" };
const registry = new Map<string, (...args: unknown[]) => unknown>();

function call(id: string, ...args: unknown[]): unknown {
  const fn = registry.get(id);
  if (!fn) throw new Error(`${id} is not registered`);
  return fn(...args);
}

function callError(id: string, ...args: unknown[]): StubError {
  try {
    call(id, ...args);
  } catch (e) {
    if (e instanceof StubError) return e;
    throw e;
  }
  throw new Error(`${id} did not return a worksheet error`);
}

beforeAll(() => {
  const bundle = join(dist, "functions.js");
  if (!existsSync(bundle)) throw new Error("dist/functions.js is missing: run `npm run build` (npm test does)");
  const context = vm.createContext({
    CustomFunctions: { associate: (id: string, fn: (...a: unknown[]) => unknown) => registry.set(id, fn), Error: StubError, ErrorCode },
  });
  vm.runInContext(readFileSync(bundle, "utf8"), context, { filename: "functions.js" });
});

describe("built bundle registration", () => {
  it("associates exactly the catalogue's functions", () => {
    expect([...registry.keys()].sort()).toEqual(CATALOG.map((s) => s.id).sort());
  });
});

describe("the worksheet bundle carries the calculations, not the documentation", () => {
  it("has no spec's assumptions or cautions (scripts/specDocsLoader.cjs); the pane's bundle keeps them", () => {
    const worksheet = readFileSync(join(dist, "functions.js"), "utf8");
    const pane = readFileSync(join(dist, "taskpane.js"), "utf8");
    // Plain-ASCII texts (the minifier may write other characters as escapes), long enough to be unique.
    const texts = CATALOG.flatMap((s) => [...s.assumptions, s.purpose]).filter((t) => t.length > 40 && /^[ -~]+$/.test(t));
    expect(texts.length).toBeGreaterThan(30);
    for (const t of texts) {
      expect(worksheet.includes(t), t).toBe(false);
      expect(pane.includes(t), t).toBe(true);
    }
  });
});

describe("generated functions.json agrees with the catalogue", () => {
  const metadata = JSON.parse(readFileSync(join(dist, "functions.json"), "utf8")) as {
    functions: { id: string; name: string; description: string; parameters: { name: string; type: string; optional?: boolean; dimensionality?: string }[]; result: { type?: string; dimensionality?: string } }[];
  };
  it("lists the same functions in the same order", () => {
    expect(metadata.functions.map((f) => f.id)).toEqual(CATALOG.map((s) => s.id));
    for (const f of metadata.functions) expect(f.name).toBe(f.id);
  });
  it.each(CATALOG.map((s) => [s.id, s]))("%s has the catalogue's parameters, order and optionality", (id, spec) => {
    const f = metadata.functions.find((x) => x.id === id)!;
    expect(f.description).toBe(spec.purpose);
    expect(f.parameters.map((p) => [p.name, Boolean(p.optional)])).toEqual(spec.params.map((p) => [p.name, Boolean(p.optional)]));
  });
  it("types every parameter as any, so text quantities reach our code", () => {
    for (const f of metadata.functions) for (const p of f.parameters) expect(p.type, `${f.id}.${p.name}`).toBe("any");
  });
});

describe("every catalogue example through the bundle, Excel-style", () => {
  const cases = CATALOG.flatMap((s) => s.examples.map((ex) => ({ id: s.id, ex, source: ex.source })));
  it.each(cases)("NAPPE.$id ($source)", ({ id, ex }) => {
    const spec = CATALOG.find((s) => s.id === id)!;
    const padded = spec.params.map((_, i) => (i < ex.args.length ? ex.args[i] : null));
    expectMatchesExample(call(id, ...padded), ex, id);
  });
});

describe("bare numbers, text quantities and output units through the bundle", () => {
  it("HEADLOSS with bare SI numbers equals the same call in US units converted", () => {
    const si = call("HEADLOSS", 0.02, 0.1541, 300, 4.6e-5, null, null) as number;
    const us = call("HEADLOSS", "317.006 gpm", "6.067 in", "984.252 ft", "0.0018110 in", null, "ft") as number;
    expect(Math.abs((us * 0.3048) / si - 1)).toBeLessThan(1e-4);
  });
  it("a cell joined with a unit (B3&\" gpm\") reads as a text quantity", () => {
    expect(call("VELOCITY", `${400}` + " gpm", "4 in", "ft/s")).toBeCloseTo(10.2124, 3); // 0.4085 × gpm / in² (common practice)
  });
  it("NPSHA from ATMPRESSURE at an invented 2000 m site", () => {
    const p = call("ATMPRESSURE", 2000, null) as number;
    const npsha = call("NPSHA", p, -2.5, 0.6, 26.85, 997, "m") as number;
    // By hand from published values: US Standard Atmosphere 1976 table I, 7.9501e4 Pa at 2000 m;
    // IAPWS-IF97 table 35, saturation pressure 3536.58941 Pa at 300 K (26.85 °C); ρ = 997 given.
    const byHand = (7.9501e4 - 3536.58941) / (997 * 9.80665) - 2.5 - 0.6;
    expect(relativeError(npsha, byHand)).toBeLessThan(1e-4);
  });
  it("POWER.SHAFT in hp from gpm, ft and percent efficiency", () => {
    expect(call("POWER.SHAFT", "500 gpm", "120 ft", "75%", null, "hp")).toBeCloseTo((500 * 120) / (3960 * 0.75), 1); // US common-practice formula
  });
});

describe("worksheet errors through the bundle", () => {
  it("wrong dimension is #VALUE! naming the argument", () => {
    const e = callError("VELOCITY", "100 gpm", "35 psi", null);
    expect(e.code).toBe("#VALUE!");
    expect(e.message).toMatch(/^diameter: /);
  });
  it("out of range is #NUM! naming the argument", () => {
    const e = callError("POWER.SHAFT", 0.05, 30, 80, null, null);
    expect(e.code).toBe("#NUM!");
    expect(e.message).toMatch(/^efficiency: /);
  });
  it("water boiling at the given pressure is #NUM!", () => {
    const e = callError("WATER.VISCOSITY", 150, null, null);
    expect(e.code).toBe("#NUM!");
    expect(e.message).toMatch(/^temperature: .*boils/);
  });
  it("never returns NaN or Infinity on extreme numbers", () => {
    for (const spec of CATALOG) {
      for (const x of [0, -1, 1e-300, 1e300, Number.MAX_VALUE]) {
        const args = spec.params.map((p) => (p.optional ? null : p.kind === "choice" ? p.options[0] : p.kind === "unit" ? "m" : x));
        try {
          const v = call(spec.id, ...args);
          expect(Number.isFinite(v as number), `${spec.id}(${x}) = ${v}`).toBe(true);
        } catch (e) {
          expect(e, `${spec.id}(${x})`).toBeInstanceOf(StubError);
        }
      }
    }
  });
  it("keeps messages short enough for Excel", () => {
    const e = callError("HEAD", "x".repeat(150) + " psi", null, null);
    expect(e.message.length).toBeLessThanOrEqual(250);
  });
});

describe("tables and spilled results through the bundle", () => {
  const metadata = JSON.parse(readFileSync(join(dist, "functions.json"), "utf8")) as {
    functions: { id: string; parameters: { name: string; dimensionality?: string }[]; result: { dimensionality?: string } }[];
  };
  it("marks table parameters and spilled results as matrices in functions.json", () => {
    for (const spec of CATALOG) {
      const f = metadata.functions.find((x) => x.id === spec.id)!;
      spec.params.forEach((p, i) => expect(f.parameters[i].dimensionality === "matrix", `${spec.id}.${p.name}`).toBe(p.kind === "table"));
      expect(f.result.dimensionality === "matrix", spec.id).toBe(Boolean(spec.result.spill));
    }
  });
  // Invented pump: the same curve in US and SI headers (1 gpm = 0.0630901964 L/s; 1 ft = 0.3048 m).
  const US = [["Flow (gpm)", "Head (ft)", "Eff (%)", "NPSHr (ft)"], [0, 140, 0, ""], [200, 133, 58, 7], [400, 115, 74, 9], [600, 85, 72, 14], [700, 66, 65, 18]];
  const SI = [
    ["Flow (L/s)", "Head (m)", "Eff", "NPSHr (m)"],
    ...US.slice(1).map((r) => [(r[0] as number) * 0.0630901964, (r[1] as number) * 0.3048, (r[2] as number) / 100, r[3] === "" ? "" : (r[3] as number) * 0.3048]),
  ];
  const SEG_US = [["Length (ft)", "ID (in)", "Roughness (in)", "K"], [40, 6.065, 0.0018, 1.3], [600, 4.026, 0.0018, 5.2]];
  const SEG_SI = [["Length (m)", "ID (mm)", "Roughness (mm)", "K"], [12.192, 154.051, 0.04572, 1.3], [182.88, 102.2604, 0.04572, 5.2]];

  it("PUMP.DUTY gives the same operating point from US and SI tables", () => {
    const us = call("PUMP.DUTY", US, "35 ft", SEG_US, null, "gpm", "ft") as number[][];
    const si = call("PUMP.DUTY", SI, "10.668 m", SEG_SI, null, "gpm", "ft") as number[][];
    expect(us).toHaveLength(1);
    expect(us[0][0]).toBeCloseTo(si[0][0], 6);
    expect(us[0][1]).toBeCloseTo(si[0][1], 6);
  });
  it("PUMP.EFFICIENCY reads a % header and a fraction column alike", () => {
    expect(call("PUMP.EFFICIENCY", "450 gpm", US, null)).toBeCloseTo(call("PUMP.EFFICIENCY", "450 gpm", SI, null) as number, 12);
  });
  it("PUMP.SCALE spills the curve in its own header units", () => {
    const out = call("PUMP.SCALE", US, 0.9) as (number | string)[][];
    expect(out[0]).toEqual(US[0]);
    expect(out[2][0]).toBeCloseTo(180, 12);
    expect(out[2][1]).toBeCloseTo(133 * 0.81, 12);
    expect(out[2][2]).toBeCloseTo(58, 12);
    expect(out[1][3]).toBe("");
  });
  it("SYSTEM.CURVE spills a header row then numbers", () => {
    const out = call("SYSTEM.CURVE", "35 ft", SEG_US, "600 gpm", 4, null, "gpm", "ft") as (number | string)[][];
    expect(out.map((r) => r.length)).toEqual([2, 2, 2, 2, 2]);
    expect(out[0]).toEqual(["Flow (gpm)", "Head (ft)"]);
  });
  it("PUMP.SELECT, TRIM and SPEED run on header tables", () => {
    const family = [["Impeller (in)", ...US[0]], ...US.slice(1).map((r) => [10, ...r]), ...US.slice(1).map((r) => [9, r[0], (r[1] as number) * 0.81, r[2], r[3]])];
    const sel = call("PUMP.SELECT", family, "400 gpm", "90 ft", "ft") as (number | string)[][];
    expect(sel[0][0]).toBe(9);
    // SciPy: brentq on PchipInterpolator of the "falling" curve through (0.03 m³/s, 38 m): r = 0.92939935746 (test/reference/curve_reference.json).
    const falling = curveReference.curves.falling;
    const headed = [["Flow (m^3/s)", "Head (m)"], ...falling.x.map((q, i) => [q, falling.y[i]])];
    const { ratio } = curveReference.affinity_ratios.find((r) => r.curve === "falling" && r.flow === 0.03)!;
    expect(relativeError(call("TRIM", headed, "10 in", 0.03, 38, "in") as number, 10 * ratio)).toBeLessThan(1e-9);
    expect(relativeError(call("SPEED", headed, 1770, "0.03 m^3/s", "38 m") as number, 1770 * ratio)).toBeLessThan(1e-9);
  });
  it("a table error is #VALUE! naming the table argument", () => {
    const e = callError("PUMP.HEAD", "100 gpm", [["Flow (gpm)", "Head (psi)"], [0, 1], [1, 1], [2, 1]], null, null);
    expect(e.code).toBe("#VALUE!");
    expect(e.message).toMatch(/^curve: /);
  });
});

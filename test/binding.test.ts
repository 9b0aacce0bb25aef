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
import { expectMatchesExample } from "./helpers";

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
  it("NPSHA from ATMPRESSURE at an invented 1500 m site", () => {
    const p = call("ATMPRESSURE", 1500, null) as number;
    const npsha = call("NPSHA", p, -2.5, 0.6, 25, null, "ft") as number;
    expect(npsha).toBeGreaterThan(0);
    expect(Number.isFinite(npsha)).toBe(true);
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

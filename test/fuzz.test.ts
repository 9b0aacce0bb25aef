/**
 * Fuzzing the worksheet layer: thousands of random Excel-style calls per function through the
 * built bundle (numbers of every magnitude, text, empty, booleans, wrong-shaped and very large
 * ranges, 10 000-character strings, unit strings built to look like code). Every call must give
 * a number, a spilled array, or a worksheet error whose message names an argument (or the
 * result, when absurd inputs overflow it): never another exception, an internal failure
 * ("failed unexpectedly"), NaN, Infinity or a hang (the test's own time limit).
 */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import vm from "node:vm";
import fc from "fast-check";
import { beforeAll, describe, expect, it } from "vitest";
import { CATALOG } from "../functions/catalog";

class StubError extends Error {
  constructor(readonly code: string, message?: string) {
    super(message);
  }
}
const registry = new Map<string, (...args: unknown[]) => unknown>();

beforeAll(() => {
  const context = vm.createContext({
    CustomFunctions: { associate: (id: string, fn: (...a: unknown[]) => unknown) => registry.set(id, fn), Error: StubError, ErrorCode: { invalidValue: "#VALUE!", invalidNumber: "#NUM!" } },
  });
  vm.runInContext(readFileSync(join(__dirname, "..", "dist", "functions.js"), "utf8"), context);
});

const CODE_LIKE = [
  "", " ", "6 in", "400 gpm", "78%", "NaN", "Infinity", "-Infinity", "1e999 m", "1e-999 m", "__proto__", "constructor", "prototype", "toString",
  "1 m; process.exit()", "import('fs')", "eval('1') m", "1 m^1e308", "1 m/0", "1 m^-1e9", "0 degF", "-500 degC", "1 __proto__", "1 constructor",
  "${1}", "<script>alert(1)</script>", "1 m)(", "((((((1 m", "1 m^(2)", "=1+1", "1,5 m", "1.2.3 m", "0x10 m", "1_000 m", "½ in", "1 m m m m",
  "NAPPE.HEAD(1)", "Flow (gpm)", "Head [ft]", "Eff (%)", "colebrook", "parallel", "nema", "STD", "1-1/2",
];
const LONG = "9".repeat(10000);
const scalar = fc.oneof(
  { weight: 4, arbitrary: fc.double() },
  { weight: 2, arbitrary: fc.integer({ min: -1e6, max: 1e6 }) },
  { weight: 2, arbitrary: fc.constantFrom(0, -0, 1e-300, 1e300, Number.MAX_VALUE, -Number.MAX_VALUE, 5e-324, 0.5, 1, 2, 20, 100) },
  { weight: 3, arbitrary: fc.constantFrom(...CODE_LIKE) },
  { weight: 2, arbitrary: fc.string({ maxLength: 30 }) },
  { weight: 1, arbitrary: fc.constantFrom(LONG, `${LONG} m`, "x".repeat(10000)) },
  { weight: 1, arbitrary: fc.boolean() },
  { weight: 2, arbitrary: fc.constant(null) },
);
const smallRange = fc.array(fc.array(scalar, { minLength: 1, maxLength: 6 }), { minLength: 1, maxLength: 9 });
const bigRange = fc.constant(Array.from({ length: 1000 }, (_, i) => [i * 0.001, 100 - i * 0.05, 0.5, 3, 10]));
const argument = fc.oneof({ weight: 6, arbitrary: scalar }, { weight: 3, arbitrary: smallRange }, { weight: 1, arbitrary: bigRange });

function finiteEverywhere(v: unknown): boolean {
  if (typeof v === "number") return Number.isFinite(v);
  if (typeof v === "string") return true;
  if (Array.isArray(v)) return v.every((row) => Array.isArray(row) && row.every((c) => typeof c === "string" || (typeof c === "number" && Number.isFinite(c))));
  return false;
}

// A fixed seed keeps CI reproducible (a random one once failed a landing on a new counterexample);
// NAPPE_FUZZ_SEED=<integer> explores other seeds locally, and fast-check prints the seed of any failure.
const SEED = Number(process.env.NAPPE_FUZZ_SEED ?? 20261202);

describe("fuzzing every worksheet function through the built bundle", () => {
  it.each(CATALOG.map((s) => [s.id, s.params.length]))("NAPPE.%s: 1000 random calls, each a value or a worksheet error", (id, arity) => {
    const fn = registry.get(id as string)!;
    const names = [...CATALOG.find((s) => s.id === id)!.params.map((p) => p.name), "result"];
    fc.assert(
      fc.property(fc.array(argument, { minLength: arity as number, maxLength: arity as number }), (args) => {
        try {
          const v = fn(...args);
          expect(finiteEverywhere(v), `NAPPE.${id}(${JSON.stringify(args).slice(0, 200)}) = ${String(v)}`).toBe(true);
        } catch (e) {
          expect(e, `NAPPE.${id}(${JSON.stringify(args).slice(0, 200)}) threw ${String(e)}`).toBeInstanceOf(StubError);
          const err = e as StubError;
          expect(["#VALUE!", "#NUM!"]).toContain(err.code);
          const call = `NAPPE.${id}(${JSON.stringify(args).slice(0, 200)})`;
          // An internal failure is a defect, not an answer: the message must name an argument of the call.
          expect(err.message, call).not.toMatch(/failed unexpectedly/);
          expect(err.message, call).not.toMatch(/[⟦⟧]/); // every marked quantity is written out in a unit
          expect(names.some((n) => err.message.startsWith(`${n}:`)), `${call}: ${err.message}`).toBe(true);
        }
      }),
      { numRuns: 1000, seed: SEED },
    );
  }, 180_000);
});

/**
 * The catalogue's types catch mistakes at compile time: compute functions receive each argument
 * with the type its parameter declares, so a misspelt name or a wrong type does not compile.
 * (The `@ts-expect-error` lines below are the test: `npm run typecheck` fails if one of them
 * stops being an error.)
 */
import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { ok } from "../functions/calc/_lib/result";
import { defineSpec } from "../functions/catalog/types";

const base = { id: "T", topic: "t", purpose: "", result: { dim: "flow" as const, description: "" }, equation: "", assumptions: [], validity: [], cautions: [], sources: [], examples: [] };

describe("typed specs", () => {
  it("type each argument by its parameter, and reject misspelt names and wrong types", () => {
    const spec = defineSpec({
      ...base,
      params: [
        { name: "flow", kind: "quantity", dim: "flow", description: "" },
        { name: "method", kind: "choice", options: ["a", "b"], description: "" },
        { name: "unit", kind: "unit", optional: true, description: "" },
      ],
      compute: (a) => {
        const flow: number = a.flow;
        const method: "a" | "b" = a.method;
        const unit: string | undefined = a.unit;
        // @ts-expect-error a misspelt argument name does not compile
        void a.flwo;
        // @ts-expect-error an optional argument with no default may be missing
        const sure: string = a.unit;
        void [method, unit, sure];
        return ok(flow);
      },
    });
    expect(spec.compute({ flow: 2, method: "a" }).value).toBe(2);
  });
  it("leave no casts of compute arguments in the catalogue", () => {
    const dir = join(__dirname, "..", "functions", "catalog");
    const casts = readdirSync(dir)
      .filter((f) => f.endsWith(".ts"))
      .flatMap((f) => [...readFileSync(join(dir, f), "utf8").matchAll(/\ba\.\w+ as \w+|as never\b/g)].map((m) => `${f}: ${m[0]}`));
    expect(casts).toEqual([]);
  });
});

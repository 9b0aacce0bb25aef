import { execFileSync } from "node:child_process";
import { join } from "node:path";
import { describe, expect, it } from "vitest";

const root = join(__dirname, "..");

describe("generated files", () => {
  it("functions.ts, the catalogue index and README's reference match the catalogue (npm run generate)", () => {
    const out = execFileSync(process.execPath, ["--import", "tsx", "scripts/generate.ts", "--check"], { cwd: root, encoding: "utf8" });
    expect(out).toMatch(/up to date/);
  });
});

import { execFile } from "node:child_process";
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { promisify } from "node:util";
import { expect } from "vitest";
import { CalcError } from "../functions/calc/_lib/result";
import { evaluate, type Evaluation, type RawArg } from "../functions/bind/evaluate";
import { CATALOG_BY_ID } from "../functions/catalog";
import type { Cell, Example } from "../functions/catalog/types";

/** Evaluates worksheet function `id` (without NAPPE.) on Excel-style arguments, in Node. */
export function run(id: string, ...args: RawArg[]): Evaluation {
  const spec = CATALOG_BY_ID.get(id);
  if (!spec) throw new Error(`no spec ${id}`);
  return evaluate(spec, args);
}

/** The CalcError a call fails with; fails the test if it does not fail that way. */
export function failure(id: string, ...args: RawArg[]): CalcError {
  try {
    run(id, ...args);
  } catch (e) {
    if (e instanceof CalcError) return e;
    throw e;
  }
  throw new Error(`${id} did not fail`);
}

/** Relative difference, with absolute difference where the expected value is zero. */
export function relativeError(got: number, want: number): number {
  return want === 0 ? Math.abs(got) : Math.abs(got / want - 1);
}

/** Checks a worksheet result against an example's expected number or spilled cells. */
export function expectMatchesExample(got: unknown, ex: Pick<Example, "expect" | "tolerance">, label = ""): void {
  const tol = ex.tolerance ?? 1e-9;
  if (typeof ex.expect === "number") {
    expect(typeof got, label).toBe("number");
    expect(relativeError(got as number, ex.expect), label).toBeLessThanOrEqual(tol);
    return;
  }
  const rows = got as Cell[][];
  expect(Array.isArray(rows), label).toBe(true);
  expect(rows.length, label).toBe(ex.expect.length);
  ex.expect.forEach((row, i) => {
    expect(rows[i].length, `${label} row ${i}`).toBe(row.length);
    row.forEach((want, j) => {
      const cell = rows[i][j];
      if (typeof want === "number") expect(relativeError(cell as number, want), `${label} [${i}][${j}] = ${cell}`).toBeLessThanOrEqual(tol);
      else expect(cell, `${label} [${i}][${j}]`).toBe(want);
    });
  });
}

const execFileAsync = promisify(execFile);

/** Runs the nappe command as a shell would; never throws on a non-zero exit. */
export async function nappe(...args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  try {
    const { stdout, stderr } = await execFileAsync(process.execPath, [join(__dirname, "..", "bin/nappe.mjs"), ...args], { cwd: join(__dirname, ".."), maxBuffer: 1 << 26 });
    return { code: 0, stdout, stderr };
  } catch (e) {
    const err = e as { code: number; stdout: string; stderr: string };
    return { code: err.code, stdout: err.stdout, stderr: err.stderr };
  }
}

/** A new empty folder for one test's files. */
export function tempDir(): string {
  return mkdtempSync(join(tmpdir(), "nappe-test-"));
}

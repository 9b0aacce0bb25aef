/** Worksheet formula text for the catalogue's examples (the guide's insert button, the README). */
import type { ExampleArg as Literal, FunctionSpec } from "./types";


/** One argument as Excel writes it: numbers, quoted text, array constants {1,2;3,4}, or nothing. */
export function excelLiteral(a: Literal): string {
  if (a === null) return "";
  if (typeof a === "number") return String(a);
  if (typeof a === "string") return `"${a.replace(/"/g, '""')}"`;
  return `{${a.map((row) => row.map((c) => (c === null || c === "" ? '""' : excelLiteral(c))).join(",")).join(";")}}`;
}

/** The first example as a formula a user can paste, trailing skipped arguments dropped. */
export function exampleFormula(spec: FunctionSpec): string | undefined {
  const ex = spec.examples[0];
  if (!ex) return undefined;
  const args = ex.args.map((a) => excelLiteral(a));
  while (args.length && args[args.length - 1] === "") args.pop();
  return `=NAPPE.${spec.id}(${args.join(", ")})`;
}

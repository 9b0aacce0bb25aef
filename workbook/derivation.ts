/**
 * A derivation as plain text, as a reviewer pastes it into a report: the cell and its formula,
 * what the call computes, the equation with the numbers put in, each input as written and as
 * read, each intermediate value, the result, and the warnings. Built from the call-view model.
 */
import type { CallView } from "./callView";
import { formatSpillText } from "./format";

/** One call's derivation, line by line. */
export function derivationText(where: { sheet: string; address: string; formula: string }, view: CallView): string {
  const lines = [`${where.sheet}!${where.address}: ${where.formula.startsWith("=") ? where.formula : `=${where.formula}`}`, `NAPPE.${view.id}: ${view.purpose}`];
  if (view.substituted) lines.push(`  ${view.substituted}`);
  if (view.args.length) lines.push("Inputs:", ...view.args.map((a) => `  ${a.name} = ${a.written || "(left out)"} → ${a.value}${a.unit && !a.value.endsWith(a.unit) ? ` ${a.unit}` : ""}${a.base && a.base !== a.value && a.base !== `${a.value} ${a.unit}` ? ` (${a.base})` : ""}`));
  if (view.steps.length) lines.push("Intermediate values:", ...view.steps.map((s) => `  ${s.symbol} = ${s.value}  (${s.name}; ${s.how})`));
  lines.push(view.error ? `Error: ${view.error}` : `Result: ${view.result ?? ""}${view.resultBase && view.resultBase !== view.result ? ` (${view.resultBase})` : ""}`);
  if (!view.error && view.table) lines.push(formatSpillText(view.table, "  "));
  lines.push(...view.diagnosis);
  for (const w of [...view.warnings, ...view.unitFindings.map((f) => `Unit check: ${f.message}`)]) lines.push(`Warning: ${w}`);
  return lines.join("\n");
}

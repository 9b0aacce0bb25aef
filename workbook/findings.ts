/**
 * What a recalculated NAPPE formula's status is made of, besides its own warnings, added in one
 * place so that every command and view counts the same: the unit check of the arguments read from
 * labelled cells, and the diagnosis of a kept cross-check (NAPPE.CROSSCHECK). `nappe recalc`,
 * `nappe audit`, the hand-off copy and the pane's workbook check all call it.
 */
import { CATALOG_BY_ID } from "../functions/catalog";
import type { CheckSource, diagnoseKeptCheck } from "./crossCheck";
import { callSites, evaluationOrder } from "./formula";
import type { CallRecord, CellOutcome } from "./recalc";
import { checkCallUnits, type LabelSource } from "./unitCheck";

/** The kept check's own warning, which the diagnosis says in full. */
const CHECK_WARNING = /^Differs: the hand value is /;

/** The kept check's diagnosis (workbook/crossCheck.ts), passed in: the pane loads it as a chunk of its own. */
export type KeptDiagnosis = typeof diagnoseKeptCheck;

/**
 * Adds the unit check's findings and a kept cross-check's diagnosis to an outcome (status,
 * messages, the call's record). `diagnose` is workbook/crossCheck.ts's diagnoseKeptCheck: every
 * caller that counts statuses passes it (the command, the pane's analyses).
 */
export function addFindings(outcome: CellOutcome, src: CheckSource, labels: LabelSource, diagnose?: KeptDiagnosis): CellOutcome {
  if (outcome.status === "error" && !outcome.recalculated) return outcome;
  const messages = [...outcome.messages];
  let status = outcome.status;
  const raise = () => {
    if (status === "ok") status = "warning";
  };
  for (const call of outcome.calls) {
    const spec = CATALOG_BY_ID.get(call.id);
    if (!spec || !call.evaluation) continue;
    for (const f of checkCallUnits(spec, call.evaluation, call.refs, outcome.sheet, labels)) {
      messages.push(`NAPPE.${call.id}: unit check: ${f.message}`);
      raise();
    }
  }
  const calls = outcome.calls.map((call, i) => {
    if (call.id !== "CROSSCHECK" || !call.evaluation || !call.refs[0] || !diagnose) return call;
    const inner = innerCall(outcome, i);
    if (!inner?.evaluation) return call;
    try {
      const tolerance = call.evaluation.readings.find((r) => r.name === "tolerance")?.value;
      const diagnosis = diagnose(src, outcome.sheet, call.refs[0], inner.evaluation, inner.id, typeof tolerance === "number" ? tolerance : 0.005);
      const at = messages.findIndex((m) => m.startsWith("NAPPE.CROSSCHECK: ") && CHECK_WARNING.test(m.slice(18)));
      const lines = diagnosis.lines.map((l) => `NAPPE.CROSSCHECK: ${l}`);
      if (diagnosis.verdict !== "agrees") {
        if (at >= 0) messages.splice(at, 1, ...lines);
        else messages.push(...lines);
        raise();
      }
      return { ...call, diagnosis };
    } catch (e) {
      messages.push(`NAPPE.CROSSCHECK: could not diagnose the check: ${e instanceof Error ? e.message : String(e)}`);
      raise();
      return call;
    }
  });
  return { ...outcome, status, messages, calls };
}

/** The NAPPE call a CROSSCHECK call compares with: the one its second argument makes. */
function innerCall(outcome: CellOutcome, index: number): CallRecord | undefined {
  let id: string | undefined;
  try {
    // The k-th CROSSCHECK recorded is the k-th in the formula's evaluation order.
    const k = outcome.calls.slice(0, index).filter((c) => c.id === "CROSSCHECK").length;
    const site = evaluationOrder(callSites(outcome.formula.replace(/^=/, ""))).filter((s) => s.name === "NAPPE.CROSSCHECK")[k];
    id = /^NAPPE\.([A-Z.]+)\s*\(/i.exec(site?.args[1]?.text ?? "")?.[1]?.toUpperCase();
  } catch {
    return undefined;
  }
  for (let j = index - 1; j >= 0; j--) if (outcome.calls[j].id === id) return outcome.calls[j];
  return undefined;
}

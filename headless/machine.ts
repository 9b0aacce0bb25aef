/**
 * Output for machines: the JSON report (documented, versioned: docs/nappe-json.schema.json) and
 * the JUnit XML that CI services read. Both are built from the same records: a workbook's
 * formulas with their status, messages and a kept cross-check's diagnosis.
 */
import { GENERAL_CAUTIONS } from "../workbook/audit";
import type { Diagnosis } from "../workbook/crossCheck";
import type { CellValue } from "../workbook/model";
import type { CellOutcome, RecalcResult, Status } from "../workbook/recalc";

/** The version of the JSON formats; raised when a field changes meaning or goes away (new fields keep it). */
export const JSON_VERSION = 1;

interface DiagnosisRecord {
  spec: string;
  verdict: Diagnosis["verdict"];
  hand: number;
  nappe: number;
  unit: string;
  relativeDifference: number;
  tolerance: number;
  firstDeparture: { cell: string; symbol: string; hand: string; nappe: string; difference: string } | null;
  causes: string[];
  notes: string[];
  incomplete: string[];
  lines: string[];
}

interface FormulaRecord {
  sheet: string;
  cell: string;
  formula: string;
  value: CellValue | CellValue[][];
  unit: string;
  cached: CellValue;
  status: Status;
  messages: string[];
  diagnosis?: DiagnosisRecord;
}

/** One workbook's part of a recalc or audit report. */
export interface WorkbookRecord {
  file: string;
  /** The exit status this workbook alone gives (0, 1, 2 or 3). */
  exit: number;
  /** Why the workbook could not be checked (exit 2). */
  error?: string;
  summary?: string;
  notice?: string;
  counts?: { formulas: number; nappe: number; recalculated: number; notRecalculated: number; ok: number; warning: number; error: number };
  formulas?: FormulaRecord[];
  /** Reports written (audit, handoff). */
  written?: string[];
}

function diagnosisRecord(d: Diagnosis): DiagnosisRecord {
  const f = d.departures[0];
  return {
    spec: d.specId,
    verdict: d.verdict,
    hand: d.hand,
    nappe: d.nappe,
    unit: d.unit,
    relativeDifference: d.relativeDifference,
    tolerance: d.tolerance,
    firstDeparture: f ? { cell: f.cell, symbol: f.symbol, hand: f.hand, nappe: f.nappe, difference: f.difference } : null,
    causes: d.causes,
    notes: d.notes,
    incomplete: d.incomplete,
    lines: d.lines,
  };
}

function finite(v: CellValue | CellValue[][]): CellValue | CellValue[][] {
  // JSON has no NaN or Infinity: such a value is given as its text.
  if (typeof v === "number" && !Number.isFinite(v)) return String(v);
  return Array.isArray(v) ? v.map((r) => r.map((x) => finite(x) as CellValue)) : v;
}

/** A formula cell as the JSON report gives it. */
function formulaRecord(c: CellOutcome): FormulaRecord {
  const diagnosis = c.calls.find((x) => x.diagnosis)?.diagnosis;
  return {
    sheet: c.sheet,
    cell: c.address,
    formula: c.formula,
    value: finite(c.value),
    unit: c.unit,
    cached: finite(c.cached) as CellValue,
    status: c.status,
    messages: c.messages,
    ...(diagnosis ? { diagnosis: diagnosisRecord(diagnosis) } : {}),
  };
}

/** A checked workbook's record: its counts, the one summary line, every reported formula. */
export function workbookRecord(file: string, result: RecalcResult, cells: readonly CellOutcome[], summary: string, exit: number, extra: { notice?: string; written?: string[] } = {}): WorkbookRecord {
  const n = { ok: 0, warning: 0, error: 0 };
  for (const c of cells) n[c.status]++;
  const k = result.counts;
  return {
    file,
    exit,
    summary,
    ...(extra.notice ? { notice: extra.notice } : {}),
    counts: { formulas: k.formulas, nappe: k.nappe, recalculated: k.recalculated, notRecalculated: k.notRecalculated, ...n },
    formulas: cells.map(formulaRecord),
    ...(extra.written ? { written: extra.written } : {}),
  };
}

/** The JSON report of a recalc or audit run over one or more workbooks. */
export function jsonReport(command: "recalc" | "audit", workbooks: readonly WorkbookRecord[], exit: number): string {
  const totals = { workbooks: workbooks.length, formulas: 0, nappe: 0, ok: 0, warning: 0, error: 0, unreadable: 0 };
  for (const w of workbooks) {
    if (w.error) totals.unreadable++;
    if (!w.counts) continue;
    totals.formulas += w.counts.formulas;
    totals.nappe += w.counts.nappe;
    totals.ok += w.counts.ok;
    totals.warning += w.counts.warning;
    totals.error += w.counts.error;
  }
  // The cautions every report carries: sizing is a design aid, and the work can hurt people.
  return `${JSON.stringify({ format: "nappe-report", version: JSON_VERSION, command, exit, totals, cautions: GENERAL_CAUTIONS, workbooks }, null, 2)}\n`;
}

function xml(text: string): string {
  // XML 1.0 allows no control characters but tab, newline and return.
  // eslint-disable-next-line no-control-regex
  return text.replace(/[\u0000-\u0008\u000b\u000c\u000e-\u001f]/g, "").replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
}

/** One test case of a JUnit report. */
interface JunitCase {
  classname: string;
  name: string;
  /** A failure: the test's finding (an error, a difference, a moved result). */
  failure?: { message: string; text: string };
  /** Printed with the case: warnings, the derivation's notes. */
  output?: string;
}

/** A JUnit XML report: one test suite per workbook (or comparison), one test case per NAPPE formula. */
export function junitXml(suites: readonly { name: string; cases: readonly JunitCase[]; error?: string }[]): string {
  const total = (f: (s: (typeof suites)[number]) => number) => suites.reduce((n, s) => n + f(s), 0);
  const failures = (s: (typeof suites)[number]) => s.cases.filter((c) => c.failure).length;
  const errors = (s: (typeof suites)[number]) => (s.error ? 1 : 0);
  const tests = (s: (typeof suites)[number]) => s.cases.length + errors(s);
  const out = [`<?xml version="1.0" encoding="UTF-8"?>`, `<testsuites name="nappe" tests="${total(tests)}" failures="${total(failures)}" errors="${total(errors)}">`];
  for (const s of suites) {
    out.push(`  <testsuite name="${xml(s.name)}" tests="${tests(s)}" failures="${failures(s)}" errors="${errors(s)}">`);
    out.push("    <properties>", ...GENERAL_CAUTIONS.map((c) => `      <property name="caution" value="${xml(c)}"/>`), "    </properties>");
    if (s.error) out.push(`    <testcase classname="${xml(s.name)}" name="read the workbook">`, `      <error message="${xml(s.error)}">${xml(s.error)}</error>`, "    </testcase>");
    for (const c of s.cases) {
      out.push(`    <testcase classname="${xml(c.classname)}" name="${xml(c.name)}">`);
      if (c.failure) out.push(`      <failure message="${xml(c.failure.message)}">${xml(c.failure.text)}</failure>`);
      if (c.output) out.push(`      <system-out>${xml(c.output)}</system-out>`);
      out.push("    </testcase>");
    }
    out.push("  </testsuite>");
  }
  out.push("</testsuites>");
  return `${out.join("\n")}\n`;
}

/** The JUnit cases of a checked workbook: a failure per error (an error of its own, or a value that differs from the file's cache). */
export function junitCases(w: WorkbookRecord): JunitCase[] {
  return (w.formulas ?? []).map((f) => ({
    classname: `${w.file}.${f.sheet}`,
    name: `${f.sheet}!${f.cell} ${f.formula}`,
    ...(f.status === "error" ? { failure: { message: f.messages[0] ?? "error", text: f.messages.join("\n") } } : {}),
    ...(f.messages.length && f.status !== "error" ? { output: f.messages.join("\n") } : {}),
  }));
}

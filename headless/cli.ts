/**
 * nappe: recalculate and audit NAPPE workbooks outside Excel, and write hand-off copies.
 *
 *   nappe recalc  <workbook.xlsx> [--tolerance 1e-6] [--all] [--allow-empty] [--spills 5|all]
 *   nappe audit   <workbook.xlsx> [--html report.html] [--xlsx audit.xlsx] [--text audit.txt] [--allow-empty]
 *   nappe handoff <workbook.xlsx> [--out copy.xlsx]
 *   nappe demo    [--out folder]
 *   (every command reading a workbook also takes --max-seconds 60 --max-memory 1024, and
 *   --digits 4: the significant figures reports and tables show, 2 to 15)
 *
 * Exit status: 0 when every NAPPE cell is ok or only warns; 1 when one errors or differs from
 * the value cached in the file; 2 for a usage error, a file that cannot be read, or a run over
 * its time or memory budget; 3 when the workbook holds no NAPPE formula (0 with --allow-empty).
 */
import { basename, extname, join, resolve } from "node:path";
import { parseArgs as parseCommandLine } from "node:util";
import { buildAudit, GENERAL_CAUTIONS } from "../workbook/audit";
import { demoSummaryLines, slipsOf, wrap } from "./demoSummary";
import { setSignificantFigures } from "../workbook/format";
import { writeAtomically } from "./atomic";
import { Budget, DEFAULT_LIMITS, type Limits } from "./package";
import { recalculate, type RecalcResult, savedWithoutAddinNotice, summaryLine } from "../workbook/recalc";
import { hasNappeCall } from "../workbook/storedForm";
import { diagnoseKeptCheck } from "../workbook/crossCheck";
import { addAuditSheet, renderTable, renderText } from "./render";
import { BudgetError, labelSource, readWorkbook, type WorkbookModel, WorkbookError } from "./readXlsx";

class UsageError extends Error {}

const USAGE = `Usage:
  nappe recalc  <workbook.xlsx> [--tolerance 1e-6] [--all] [--allow-empty] [--spills 5|all]
  nappe audit   <workbook.xlsx> [--html report.html] [--xlsx audit.xlsx] [--text audit.txt] [--allow-empty]
  nappe handoff <workbook.xlsx> [--out copy.xlsx]
  nappe demo    [--out folder]
Options for every command that reads a workbook:
  --max-seconds 60   time budget for reading and recalculating one file
  --max-memory 1024  memory budget in MB
  --digits 4         significant figures shown (2 to 15); exact values stay in the audit's "Exact" column
  --spills 5         rows of each spilled result shown under it (all: every row)
Exit status: 0 ok or warnings only; 1 an error or a value that differs from the file's cache;
2 usage, unreadable file or budget exceeded; 3 no NAPPE formula found (0 with --allow-empty).`;

/** The workbook holds no NAPPE formula. */
export const EXIT_EMPTY = 3;

/** Formulas above this count get a progress bar on a terminal. */
const PROGRESS_FROM = 300;

interface Options {
  command: string;
  file?: string;
  flags: {
    tolerance?: string;
    html?: string;
    text?: string;
    xlsx?: string;
    out?: string;
    all?: boolean;
    "allow-empty"?: boolean;
    "max-seconds"?: string;
    "max-memory"?: string;
    digits?: string;
    spills?: string;
  };
}

function parseArgs(argv: string[]): Options {
  const [command, ...rest] = argv;
  if (!command || command === "--help" || command === "-h") throw new UsageError(USAGE);
  let parsed;
  try {
    parsed = parseCommandLine({
      args: rest,
      allowPositionals: true,
      strict: true,
      options: {
        tolerance: { type: "string" },
        html: { type: "string" },
        text: { type: "string" },
        xlsx: { type: "string" },
        out: { type: "string" },
        all: { type: "boolean" },
        "allow-empty": { type: "boolean" },
        "max-seconds": { type: "string" },
        "max-memory": { type: "string" },
        digits: { type: "string" },
        spills: { type: "string" },
      },
    });
  } catch (e) {
    throw new UsageError(`${e instanceof Error ? e.message : String(e)}\n\n${USAGE}`);
  }
  const [file, extra] = parsed.positionals;
  if (extra !== undefined) throw new UsageError(`one workbook at a time; got ${file} and ${extra}`);
  return { command, file, flags: parsed.values };
}

function positiveNumber(flag: string, text: string | undefined, fallback: number): number {
  if (text === undefined) return fallback;
  const n = Number(text);
  if (!(n > 0) || !Number.isFinite(n)) throw new UsageError(`--${flag} must be a number above zero; got ${text}`);
  return n;
}

function limitsOf(flags: Options["flags"]): Limits {
  return { seconds: positiveNumber("max-seconds", flags["max-seconds"], DEFAULT_LIMITS.seconds), megabytes: positiveNumber("max-memory", flags["max-memory"], DEFAULT_LIMITS.megabytes) };
}


/** A progress line on stderr, only when stderr is a terminal (never in pipes, files or CI logs). */
function progressFor(total: number): { update(done: number): void; stop(): void } {
  if (total < PROGRESS_FROM || !process.stderr.isTTY) return { update() {}, stop() {} };
  let shown = -1;
  return {
    update(done) {
      const percent = Math.floor((100 * done) / total);
      if (percent === shown) return;
      shown = percent;
      process.stderr.write(`\rrecalculating ${done}/${total} formulas (${percent} %)`);
    },
    stop: () => process.stderr.write("\r\x1b[K"),
  };
}

async function load(file: string, flags: Options["flags"]): Promise<{ wb: WorkbookModel; result: RecalcResult }> {
  const limits = limitsOf(flags);
  const budget = new Budget(limits, file);
  const wb = await readWorkbook(file, limits);
  budget.check("reading the workbook");
  const tol = flags.tolerance;
  const tolerance = tol === undefined ? undefined : Number(tol);
  if (tolerance !== undefined && !(tolerance >= 0)) throw new UsageError(`--tolerance must be a number of zero or more; got ${String(tol)}`);
  const total = wb.sheets.reduce((n, s) => n + [...s.cells.values()].filter((c) => c.formula).length, 0);
  const progress = progressFor(total);
  try {
    return { wb, result: recalculate(wb, { tolerance, all: flags.all, budget, diagnose: diagnoseKeptCheck, onProgress: (d) => progress.update(d) }) };
  } finally {
    progress.stop();
  }
}

/** What the run found and did, in one line (workbook/recalc.ts), after the notice of a copy saved without the add-in. */
function found(result: RecalcResult, all = false): string {
  return summaryLine(result.counts, result.cells.filter((c) => all || hasNappeCall(c.formula)), all);
}

/** Says loudly that nothing was found; names other add-ins' functions when there are any. */
function emptyNotice(file: string, result: RecalcResult): string {
  const k = result.counts;
  const others = k.otherAddins.length ? `\nIt calls custom functions of another add-in, which Nappe does not recalculate: ${k.otherAddins.join(", ")}.` : "";
  return `nappe: no NAPPE formulas found in ${file} (${k.formulas} formulas, none calling NAPPE): nothing was checked.${others}`;
}

async function writeAudit(wb: WorkbookModel, result: RecalcResult, source: string, htmlPath: string, xlsxPath: string, textPath: string, title: string) {
  const report = buildAudit(result.cells, { title, source, found: found(result), notice: savedWithoutAddinNotice(result.counts), workbook: wb }, labelSource(wb));
  const { renderHtml } = await import("./renderHtml");
  await writeAtomically(htmlPath, renderHtml(report));
  await writeAtomically(textPath, renderText(report));
  // exceljs and the demo load only when a command writes a workbook: recalc starts without them.
  const { default: ExcelJS } = await import("exceljs");
  const book = new ExcelJS.Workbook();
  addAuditSheet(book, report);
  await writeAtomically(xlsxPath, Buffer.from(await book.xlsx.writeBuffer()));
  return report;
}

async function main(argv: string[]): Promise<number> {
  const opts = parseArgs(argv);
  if (opts.flags.digits !== undefined) {
    const n = Number(opts.flags.digits);
    if (!(Number.isInteger(n) && n >= 2 && n <= 15)) throw new UsageError(`--digits must be a whole number from 2 to 15; got ${opts.flags.digits}`);
    setSignificantFigures(n);
  }
  const { flags } = opts;
  switch (opts.command) {
    case "recalc": {
      if (!opts.file) throw new UsageError(`recalc needs a workbook\n\n${USAGE}`);
      const spills = flags.spills === undefined ? 5 : flags.spills === "all" ? Infinity : Number(flags.spills);
      if (!(spills >= 0) || (Number.isFinite(spills) && !Number.isInteger(spills))) throw new UsageError(`--spills takes a number of rows or "all"; got ${flags.spills}`);
      const width = process.stdout.isTTY ? process.stdout.columns : undefined;
      const { result } = await load(opts.file, flags);
      if (result.counts.nappe === 0 && !flags["allow-empty"]) {
        if (flags.all && result.cells.length) console.log(renderTable(result.cells, { spills, width }));
        console.error(emptyNotice(opts.file, result));
        return EXIT_EMPTY;
      }
      const notice = savedWithoutAddinNotice(result.counts);
      if (notice) console.log(`${notice}\n`);
      console.log(renderTable(result.cells, { spills, width }));
      console.log(`\n${found(result, flags.all)}`);
      if (result.counts.otherAddins.length) console.log(`Not recalculated, another add-in's functions: ${result.counts.otherAddins.join(", ")}`);
      return result.cells.some((c) => c.status === "error") ? 1 : 0;
    }
    case "audit": {
      if (!opts.file) throw new UsageError(`audit needs a workbook\n\n${USAGE}`);
      const stem = opts.file.slice(0, opts.file.length - extname(opts.file).length);
      const html = resolve(flags.html ?? `${stem}.audit.html`);
      const xlsx = resolve(flags.xlsx ?? `${stem}.audit.xlsx`);
      const text = resolve(flags.text ?? `${stem}.audit.txt`);
      if ([html, xlsx, text].includes(resolve(opts.file))) throw new UsageError("the report would overwrite the workbook; choose another --html, --xlsx or --text path");
      const { wb, result } = await load(opts.file, flags);
      if (result.counts.nappe === 0 && !flags["allow-empty"]) {
        console.error(`${emptyNotice(opts.file, result)}\nNo audit written (--allow-empty writes one that says so).`);
        return EXIT_EMPTY;
      }
      const report = await writeAudit(wb, result, basename(opts.file), html, xlsx, text, `Nappe audit of ${basename(opts.file)}`);
      console.log(`${report.notice ? `${report.notice}\n` : ""}${found(result)}\nAudit written:\n  ${html}\n  ${xlsx}\n  ${text}`);
      return report.counts.error ? 1 : 0;
    }
    case "handoff": {
      if (!opts.file) throw new UsageError(`handoff needs a workbook\n\n${USAGE}`);
      const stem = opts.file.slice(0, opts.file.length - extname(opts.file).length);
      const out = resolve(flags.out ?? `${stem}.handoff.xlsx`);
      if (out === resolve(opts.file)) throw new UsageError("the copy would overwrite the workbook; choose another --out path");
      const { wb, result } = await load(opts.file, flags);
      if (result.counts.nappe === 0 && !flags["allow-empty"]) {
        console.error(`${emptyNotice(opts.file, result)}\nNo copy written.`);
        return EXIT_EMPTY;
      }
      const report = buildAudit(result.cells, { title: `Nappe audit of ${basename(opts.file)}`, source: basename(opts.file), found: found(result), notice: savedWithoutAddinNotice(result.counts), workbook: wb }, labelSource(wb));
      const { writeHandoff } = await import("./handoff");
      const frozen = await writeHandoff(opts.file, out, result, report, limitsOf(flags));
      console.log(`${found(result)}\nHand-off copy written: ${out}\n  ${frozen.nappe} NAPPE formulas frozen to their values${frozen.other ? `, ${frozen.other} formulas of another add-in frozen to their cached values` : ""}; the original is untouched.`);
      return report.counts.error ? 1 : 0;
    }
    case "demo":
      return demo(resolve(flags.out ?? "demo-output"));
    default:
      throw new UsageError(`unknown command "${opts.command}"\n\n${USAGE}`);
  }
}

/** The main job: build the demo workbook, recalculate it, print the sizing summary, write the audit. */
async function demo(out: string): Promise<number> {
  const { demoWorkbookBytes, DEMO_FILE } = await import("../demo/build");
  const path = join(out, DEMO_FILE);
  await writeAtomically(path, await demoWorkbookBytes());
  const { wb, result } = await load(path, {});
  const report = await writeAudit(wb, result, DEMO_FILE, join(out, "orchard-audit.html"), join(out, "orchard-audit.xlsx"), join(out, "orchard-audit.txt"), "Nappe audit: hillside orchard pumping station (invented demo)");
  console.log("Nappe demo: hillside orchard pumping station (invented scenario)");
  for (const line of demoSummaryLines(wb, result, slipsOf(wb, report))) console.log(line);
  const flagged = result.cells.filter((c) => c.status !== "ok").flatMap((c) => c.messages.map((m) => ({ c, m })));
  console.log(`\nWarnings and checks (${flagged.length}):`);
  for (const { c, m } of flagged) for (const line of wrap(m, `  ${c.sheet}!${c.address}: `, "      ")) console.log(line);
  const { writeHandoff } = await import("./handoff");
  await writeHandoff(path, join(out, "orchard-handoff.xlsx"), result, report, DEFAULT_LIMITS);
  console.log("");
  const [what, tally] = found(result).split(/(?<=\)): /);
  console.log(tally ? `${what}:\n  ${tally}` : what);
  console.log(`Workbook: ${path}\nAudit report: ${join(out, "orchard-audit.html")}\nAudit sheet:  ${join(out, "orchard-audit.xlsx")}\nAudit text:   ${join(out, "orchard-audit.txt")}\nHand-off copy (values, no add-in needed): ${join(out, "orchard-handoff.xlsx")}`);
  console.log("");
  for (const line of wrap(GENERAL_CAUTIONS.join(" "), "", "")) console.log(line);
  return report.counts.error ? 1 : 0;
}

// process.exitCode, never process.exit(): the process ends once stdout has drained, so output
// piped into another program (nappe recalc … | less) is never cut short.
main(process.argv.slice(2)).then(
  (code) => {
    process.exitCode = code;
  },
  (e) => {
    process.exitCode = 2;
    if (e instanceof UsageError) console.error(e.message);
    else if (e instanceof BudgetError || e instanceof WorkbookError) console.error(`nappe: ${e.message}`);
    else console.error(`nappe: unexpected failure: ${e instanceof Error ? e.message : String(e)}`);
  },
);

/**
 * nappe: recalculate and audit NAPPE workbooks outside Excel.
 *
 *   nappe recalc <workbook.xlsx> [--tolerance 1e-6] [--all]
 *   nappe audit  <workbook.xlsx> [--html report.html] [--xlsx audit.xlsx]
 *   nappe demo   [--out folder]
 *
 * Exit status: 0 when every NAPPE cell is ok or only warns; 1 when one errors or differs from
 * the value cached in the file; 2 for a usage error or a file that cannot be read.
 */
import { mkdir, rename, writeFile } from "node:fs/promises";
import { basename, dirname, extname, join, resolve } from "node:path";
import cliProgress from "cli-progress";
import ExcelJS from "exceljs";
import { buildAudit, formatValue } from "./audit";
import { buildDemoWorkbook, DEMO_FILE } from "../demo/build";
import { recalculate, type RecalcResult } from "./recalc";
import { addAuditSheet, renderHtml, renderTable } from "./render";
import { labelSource, readWorkbook, type WorkbookModel, WorkbookError } from "./workbook";

class UsageError extends Error {}

const USAGE = `Usage:
  nappe recalc <workbook.xlsx> [--tolerance 1e-6] [--all]
  nappe audit  <workbook.xlsx> [--html report.html] [--xlsx audit.xlsx]
  nappe demo   [--out folder]`;

/** Formulas above this count get a progress bar on a terminal. */
const PROGRESS_FROM = 300;

interface Options {
  command: string;
  file?: string;
  flags: Map<string, string | true>;
}

function parseArgs(argv: string[]): Options {
  const [command, ...rest] = argv;
  if (!command || command === "--help" || command === "-h") throw new UsageError(USAGE);
  const flags = new Map<string, string | true>();
  let file: string | undefined;
  for (let i = 0; i < rest.length; i++) {
    const a = rest[i];
    if (a.startsWith("--")) {
      const next = rest[i + 1];
      if (["--tolerance", "--html", "--xlsx", "--out"].includes(a)) {
        if (next === undefined) throw new UsageError(`${a} needs a value\n\n${USAGE}`);
        flags.set(a, next);
        i++;
      } else if (a === "--all") flags.set(a, true);
      else throw new UsageError(`unknown option ${a}\n\n${USAGE}`);
    } else if (!file) file = a;
    else throw new UsageError(`one workbook at a time; got ${file} and ${a}`);
  }
  return { command, file, flags };
}

/** Writes a file atomically: a temporary file beside it, then a rename. */
export async function writeAtomically(path: string, data: string | Buffer): Promise<void> {
  await mkdir(dirname(path), { recursive: true });
  const tmp = join(dirname(path), `.${basename(path)}.${process.pid}.tmp`);
  await writeFile(tmp, data);
  await rename(tmp, path);
}

function progressFor(total: number): { update(done: number): void; stop(): void } {
  if (total < PROGRESS_FROM || !process.stderr.isTTY) return { update() {}, stop() {} };
  const bar = new cliProgress.SingleBar({ stream: process.stderr, format: "recalculating [{bar}] {value}/{total} formulas" }, cliProgress.Presets.shades_classic);
  bar.start(total, 0);
  return { update: (d) => bar.update(d), stop: () => bar.stop() };
}

function run(wb: WorkbookModel, flags: Options["flags"]): RecalcResult {
  const tol = flags.get("--tolerance");
  const tolerance = tol === undefined ? undefined : Number(tol);
  if (tolerance !== undefined && !(tolerance >= 0)) throw new UsageError(`--tolerance must be a number of zero or more; got ${String(tol)}`);
  const total = wb.sheets.reduce((n, s) => n + [...s.cells.values()].filter((c) => c.formula).length, 0);
  const progress = progressFor(total);
  try {
    return recalculate(wb, { tolerance, all: flags.has("--all"), onProgress: (d) => progress.update(d) });
  } finally {
    progress.stop();
  }
}

function summaryLine(result: RecalcResult): string {
  const n = { ok: 0, warning: 0, error: 0 };
  for (const c of result.cells) n[c.status]++;
  return `${result.cells.length} NAPPE formulas: ${n.ok} ok, ${n.warning} warning, ${n.error} error`;
}

async function writeAudit(wb: WorkbookModel, result: RecalcResult, source: string, htmlPath: string, xlsxPath: string, title: string) {
  const report = buildAudit(result.cells, { title, source }, labelSource(wb));
  await writeAtomically(htmlPath, renderHtml(report));
  const book = new ExcelJS.Workbook();
  addAuditSheet(book, report);
  await writeAtomically(xlsxPath, Buffer.from(await book.xlsx.writeBuffer()));
  return report;
}

async function main(argv: string[]): Promise<number> {
  const opts = parseArgs(argv);
  switch (opts.command) {
    case "recalc": {
      if (!opts.file) throw new UsageError(`recalc needs a workbook\n\n${USAGE}`);
      const wb = await readWorkbook(opts.file);
      const result = run(wb, opts.flags);
      console.log(renderTable(result.cells));
      console.log(`\n${summaryLine(result)}`);
      return result.cells.some((c) => c.status === "error") ? 1 : 0;
    }
    case "audit": {
      if (!opts.file) throw new UsageError(`audit needs a workbook\n\n${USAGE}`);
      const wb = await readWorkbook(opts.file);
      const result = run(wb, opts.flags);
      const stem = opts.file.slice(0, opts.file.length - extname(opts.file).length);
      const html = resolve(String(opts.flags.get("--html") ?? `${stem}.audit.html`));
      const xlsx = resolve(String(opts.flags.get("--xlsx") ?? `${stem}.audit.xlsx`));
      if ([html, xlsx].includes(resolve(opts.file))) throw new UsageError("the report would overwrite the workbook; choose another --html or --xlsx path");
      const report = await writeAudit(wb, result, basename(opts.file), html, xlsx, `Nappe audit of ${basename(opts.file)}`);
      console.log(`${summaryLine(result)}\nAudit written:\n  ${html}\n  ${xlsx}`);
      return report.counts.error ? 1 : 0;
    }
    case "demo":
      return demo(resolve(String(opts.flags.get("--out") ?? "demo-output")));
    default:
      throw new UsageError(`unknown command "${opts.command}"\n\n${USAGE}`);
  }
}

/** The main job: build the demo workbook, recalculate it, print the sizing summary, write the audit. */
async function demo(out: string): Promise<number> {
  const book = await buildDemoWorkbook();
  const path = join(out, DEMO_FILE);
  await writeAtomically(path, Buffer.from(await book.xlsx.writeBuffer()));
  const wb = await readWorkbook(path);
  const result = run(wb, new Map());
  const summary = wb.sheets.find((s) => s.name === "Summary");
  console.log("Nappe demo: hillside orchard pumping station (invented scenario)\n");
  if (summary) {
    const rows = [...summary.cells.values()].filter((c) => c.col === 1 && c.row > 2).sort((a, b) => a.row - b.row);
    for (const label of rows) {
      const value = result.valueOf("Summary", `B${label.row}`);
      const unit = summary.cells.get(`${label.row}:3`)?.value ?? "";
      console.log(`  ${String(label.value).padEnd(34)} ${formatValue(value).padStart(12)} ${String(unit)}`);
    }
  }
  const flagged = result.cells.filter((c) => c.status !== "ok");
  const report = await writeAudit(wb, result, DEMO_FILE, join(out, "orchard-audit.html"), join(out, "orchard-audit.xlsx"), "Nappe audit: hillside orchard pumping station (invented demo)");
  const unitFindings = report.entries.flatMap((e) => e.messages.filter((m) => m.includes("unit check")).map((m) => `${e.sheet}!${e.address}: ${m}`));
  console.log(`\nWarnings and checks (${flagged.length + unitFindings.length}):`);
  for (const c of flagged) for (const m of c.messages) console.log(`  ${c.sheet}!${c.address}: ${m}`);
  for (const m of unitFindings) console.log(`  ${m}`);
  console.log(`\n${summaryLine(result)}`);
  console.log(`Workbook: ${path}\nAudit report: ${join(out, "orchard-audit.html")}\nAudit sheet:  ${join(out, "orchard-audit.xlsx")}`);
  console.log("\nA design aid for preliminary sizing: confirm with the pump maker's certified data, local codes and a licensed engineer.");
  return report.counts.error ? 1 : 0;
}

main(process.argv.slice(2)).then(
  (code) => process.exit(code),
  (e) => {
    if (e instanceof UsageError) {
      console.error(e.message);
      process.exit(2);
    }
    if (e instanceof WorkbookError) {
      console.error(`nappe: ${e.message}`);
      process.exit(2);
    }
    console.error(`nappe: unexpected failure: ${e instanceof Error ? e.message : String(e)}`);
    process.exit(2);
  },
);

/**
 * nappe: recalculate, audit, show and compare NAPPE workbooks outside Excel, and write hand-off
 * copies. `nappe help` lists the verbs; `nappe help VERB` (or VERB --help) gives each one's
 * options. Several workbooks (or folders) are checked in parallel, each in a child process
 * with its own budget. Output is a table for people fitted to the terminal, or JSON / JUnit XML
 * for machines (headless/machine.ts). Exit statuses are the same for every verb (EXIT_TEXT).
 */
import { spawn } from "node:child_process";
import { readdir, stat } from "node:fs/promises";
import { availableParallelism } from "node:os";
import { readFileSync } from "node:fs";
import { basename, dirname, extname, join, resolve } from "node:path";
import { parseArgs as parseCommandLine } from "node:util";
import { buildAudit, GENERAL_CAUTIONS } from "../workbook/audit";
import { demoSummaryLines, slipsOf } from "./demoSummary";
import { setSignificantFigures } from "../workbook/format";
import { checkWritable, UnwritableError, writeAtomically } from "./atomic";
import { JSON_VERSION, jsonReport, junitCases, junitXml, type WorkbookRecord, workbookRecord } from "./machine";
import { outputWidth, wrapText } from "./terminal";
import { plural } from "../workbook/format";

/** The package's version, read beside the command (dist-cli/ and headless/ both sit one level below it). */
function version(): string {
  for (const base of [process.argv[1] ? dirname(process.argv[1]) : "", __dirname]) {
    try {
      return (JSON.parse(readFileSync(join(base, "..", "package.json"), "utf8")) as { version: string }).version;
    } catch {
      // try the next
    }
  }
  return "(version unknown)";
}
import { Budget, DEFAULT_LIMITS, type Limits } from "./package";
import { recalculate, type RecalcResult, savedWithoutAddinNotice, summaryLine } from "../workbook/recalc";
import { hasNappeCall } from "../workbook/storedForm";
import { diagnoseKeptCheck } from "../workbook/crossCheck";
import { addAuditSheet, renderTable, renderText } from "./render";
import { BudgetError, labelSource, readWorkbook, type WorkbookModel, WorkbookError } from "./readXlsx";

class UsageError extends Error {}

/** Exit statuses, the same for every verb. */
const EXIT = { ok: 0, findings: 1, usage: 2, empty: 3 } as const;
/** The workbook holds no NAPPE formula. */
export const EXIT_EMPTY = EXIT.empty;

const EXIT_TEXT = `Exit status: 0 every NAPPE formula ok or only warning (diff: nothing moved or got worse);
1 an error, a value that differs from the file's cache (diff: a NAPPE result moved beyond
--tolerance, or a status got worse); 2 a usage error, a file that cannot be read or written, or
a run over its time or memory budget; 3 no NAPPE formula found (0 with --allow-empty). With
several workbooks, the worst of theirs (2, then 1, then 3, then 0).`;

const COMMON = `  --format table|json|junit  output: the table for people (default, also when piped), JSON
                      (docs/nappe-json.schema.json) or JUnit XML for CI services
  --wide              no fitting to the terminal: every column and line in full
                      (otherwise the terminal's width, COLUMNS, or 80 when not a terminal)
  --digits 4          significant figures shown (2 to 15)
  --tolerance 1e-6    relative tolerance against the values cached in the file
  --max-seconds 60    time budget per workbook (reading, recalculating, writing reports)
  --max-memory 1024   memory budget per workbook, MB
  --allow-empty       a workbook with no NAPPE formula is not exit 3
  -h, --help          this help`;

const HELP: Record<string, string> = {
  recalc: `nappe recalc WORKBOOK|FOLDER ... [options]

Recalculates every NAPPE formula (and the formulas they read) and compares each with the value
cached in the file. Several workbooks or folders (searched for *.xlsx) are checked in parallel,
one per core, with a line per workbook and totals.

  --all               every formula, not only those calling NAPPE
  --spills 5|all      rows of each spilled result shown under it
  --jobs N            workbooks checked at once (default: one per core)
${COMMON}`,
  audit: `nappe audit WORKBOOK|FOLDER ... [options]

Writes the audit of each workbook beside it (NAME.audit.html, .audit.xlsx, .audit.txt): key
results, inputs, and every NAPPE formula with its equation, inputs as written and as read,
intermediate values, result, warnings, sources and a kept cross-check's diagnosis.

  --html PATH --xlsx PATH --text PATH   where to write them (one workbook only)
  --jobs N            workbooks audited at once (default: one per core)
${COMMON}`,
  handoff: `nappe handoff WORKBOOK [--out COPY.xlsx] [options]

Writes a copy for colleagues without the add-in: every NAPPE formula frozen to its value, the
formula in the cell's note, and the audit sheet added. The original is never modified.

${COMMON}`,
  show: `nappe show WORKBOOK [--format table|json] [--digits 6]

Prints the workbook as stable text, a line per cell: sheet!cell | label | formula | value with
unit | status. For git: a textconv filter that makes \`git diff\` read workbooks:

  echo '*.xlsx diff=nappe' >> .gitattributes
  git config diff.nappe.textconv 'npx nappe show'
`,
  diff: `nappe diff OLD.xlsx NEW.xlsx [options]

What changed between two revisions: sheets added, removed or renamed; rows and columns inserted
or deleted (followed by their labels); inputs and formulas that changed; NAPPE results that
moved (old → new, relative change, unit); statuses and warnings that appeared or cleared.

  --tolerance 1e-9    relative change of a NAPPE result that counts as moved
${COMMON.split("\n").filter((l) => !/--tolerance|--allow-empty/.test(l)).join("\n")}`,
  demo: `nappe demo [--out FOLDER]

Builds the invented demo workbook, recalculates it, prints the sizing summary and writes its
audit and hand-off copy into FOLDER (demo-output).`,
};

const USAGE = `Usage: nappe VERB [options]   (nappe help VERB, or nappe VERB --help, for each)

  nappe recalc  WORKBOOK|FOLDER ...   recalculate and compare with the file's cached values
  nappe audit   WORKBOOK|FOLDER ...   write the audit reports (HTML, .xlsx, text)
  nappe handoff WORKBOOK              write a copy with values, for colleagues without the add-in
  nappe show    WORKBOOK              the workbook as text, a line per cell (a git textconv filter)
  nappe diff    OLD.xlsx NEW.xlsx     what changed between two revisions
  nappe demo                          the invented demo, end to end
  nappe --version

${EXIT_TEXT}`;

type Format = "table" | "json" | "junit";

interface Options {
  command: string;
  files: string[];
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
    format?: string;
    wide?: boolean;
    jobs?: string;
    help?: boolean;
  };
}

const STRING = { type: "string" } as const;
const BOOLEAN = { type: "boolean" } as const;
const SHARED = { tolerance: STRING, "max-seconds": STRING, "max-memory": STRING, digits: STRING, format: STRING, wide: BOOLEAN, "allow-empty": BOOLEAN, help: { type: "boolean", short: "h" } } as const;
/** The options each verb takes. */
const VERB_OPTIONS: Record<string, Record<string, { type: "string" | "boolean"; short?: string }>> = {
  recalc: { ...SHARED, all: BOOLEAN, spills: STRING, jobs: STRING },
  audit: { ...SHARED, html: STRING, xlsx: STRING, text: STRING, jobs: STRING, all: BOOLEAN },
  handoff: { ...SHARED, out: STRING },
  show: { ...SHARED },
  diff: { ...SHARED },
  demo: { out: STRING, help: { type: "boolean", short: "h" } },
};

/** Thrown to print text and end with a status (help: 0). */
class Done extends Error {
  constructor(
    readonly text: string,
    readonly code: number,
  ) {
    super(text);
  }
}

function parseArgs(argv: string[]): Options {
  const [command, ...rest] = argv;
  if (!command) throw new UsageError(USAGE);
  if (command === "--help" || command === "-h") throw new Done(USAGE, EXIT.ok);
  if (command === "--version" || command === "-V" || command === "version") throw new Done(`nappe ${version()}`, EXIT.ok);
  if (command === "help") {
    const verb = rest[0];
    if (!verb) throw new Done(USAGE, EXIT.ok);
    if (!HELP[verb]) throw new UsageError(`nappe help: no verb "${verb}"; the verbs are ${Object.keys(HELP).join(", ")}`);
    throw new Done(HELP[verb], EXIT.ok);
  }
  const options = VERB_OPTIONS[command];
  if (!options) throw new UsageError(`nappe: unknown verb "${command}"\n\n${USAGE}`);
  let parsed;
  try {
    parsed = parseCommandLine({ args: rest, allowPositionals: true, strict: true, options });
  } catch (e) {
    // Node's own text quotes the option oddly ("Unknown option '--x'. To specify a positional argument starting with a '-', place it at the end of the command after '--', as in '-- \"--x\""): say it plainly.
    const m = /option '(-[^' ]+)/i.exec(e instanceof Error ? e.message : "");
    const what = e instanceof Error && /argument missing|requires an argument|value/i.test(e.message) ? `option ${m?.[1] ?? ""} needs a value` : `unknown option ${m?.[1] ?? rest.find((a) => a.startsWith("-")) ?? ""}`;
    throw new UsageError(`nappe ${command}: ${what.trim()}; see nappe help ${command}`);
  }
  const flags = parsed.values as Options["flags"];
  if (flags.help) throw new Done(HELP[command], EXIT.ok);
  return { command, files: parsed.positionals, flags };
}

function formatOf(flags: Options["flags"], allowed: Format[]): Format {
  const f = (flags.format ?? "table") as Format;
  if (!allowed.includes(f)) throw new UsageError(`--format takes ${allowed.join(", ")}; got ${flags.format}`);
  return f;
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

/** Formulas above this count get a progress bar on a terminal. */
const PROGRESS_FROM = 300;

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

async function writeAudit(wb: WorkbookModel, result: RecalcResult, source: string, htmlPath: string, xlsxPath: string, textPath: string, title: string, width = 80) {
  const report = buildAudit(result.cells, { title, source, found: found(result), notice: savedWithoutAddinNotice(result.counts), workbook: wb }, labelSource(wb));
  const { renderHtml } = await import("./renderHtml");
  await writeAtomically(htmlPath, renderHtml(report));
  await writeAtomically(textPath, renderText(report, width));
  // exceljs and the demo load only when a command writes a workbook: recalc starts without them.
  const { default: ExcelJS } = await import("exceljs");
  const book = new ExcelJS.Workbook();
  addAuditSheet(book, report);
  await writeAtomically(xlsxPath, Buffer.from(await book.xlsx.writeBuffer()));
  return report;
}

/** The summary line, or where it does not fit, what was found and, indented below it, the statuses. */
function fitted(line: string, width: number): string {
  if ([...line].length <= width) return line;
  const [what, tally] = line.split(/(?<=\)): /);
  return tally ? `${what}:\n  ${tally}` : wrapText(line, width, "", "  ").join("\n");
}

/** Our own outputs and Excel's lock files are not workbooks to check. */
const NOT_A_WORKBOOK = /(^~\$)|\.(audit|handoff)\.xlsx$/i;

/** The workbooks named: files as given, folders searched (recursively) for *.xlsx, in a stable order. */
async function workbooksIn(paths: readonly string[]): Promise<string[]> {
  const out: string[] = [];
  for (const p of paths) {
    let info;
    try {
      info = await stat(p);
    } catch {
      out.push(p); // reported as unreadable by the check itself
      continue;
    }
    if (!info.isDirectory()) {
      out.push(p);
      continue;
    }
    const entries = (await readdir(p, { recursive: true, withFileTypes: true })).filter((e) => e.isFile() && /\.xlsx$/i.test(e.name) && !NOT_A_WORKBOOK.test(e.name) && !/(^|[\\/])(node_modules|\.git)([\\/]|$)/.test(join(e.parentPath ?? p, e.name)));
    out.push(...entries.map((e) => join(e.parentPath ?? p, e.name)).sort());
  }
  return out;
}

/** The worst of several exit statuses: 2, then 1, then 3, then 0. */
function worst(codes: readonly number[]): number {
  for (const c of [EXIT.usage, EXIT.findings, EXIT.empty]) if (codes.includes(c)) return c;
  return EXIT.ok;
}

/** Exit status of one checked workbook. */
function exitOf(result: RecalcResult, flags: Options["flags"], cells = result.cells): number {
  if (result.counts.nappe === 0 && !flags["allow-empty"]) return EXIT.empty;
  return cells.some((c) => c.status === "error") ? EXIT.findings : EXIT.ok;
}

/** The check's output for one workbook, in the format asked. */
function machineOutput(command: "recalc" | "audit", records: WorkbookRecord[], format: Format, exit: number): string {
  if (format === "json") return jsonReport(command, records, exit);
  return junitXml(records.map((r) => ({ name: r.file, cases: junitCases(r), error: r.error })));
}

async function recalcOne(file: string, flags: Options["flags"], format: Format): Promise<number> {
  const spills = flags.spills === undefined ? 5 : flags.spills === "all" ? Infinity : Number(flags.spills);
  if (!(spills >= 0) || (Number.isFinite(spills) && !Number.isInteger(spills))) throw new UsageError(`--spills takes a number of rows or "all"; got ${flags.spills}`);
  const width = outputWidth(flags.wide);
  const { result } = await load(file, flags);
  const exit = exitOf(result, flags);
  const notice = savedWithoutAddinNotice(result.counts);
  if (format !== "table") {
    process.stdout.write(machineOutput("recalc", [workbookRecord(file, result, result.cells, found(result, flags.all), exit, { notice })], format, exit));
    return exit;
  }
  if (exit === EXIT.empty) {
    if (flags.all && result.cells.length) console.log(renderTable(result.cells, { spills, width }));
    console.error(wrapText(emptyNotice(file, result), width).join("\n"));
    return exit;
  }
  if (notice) console.log(`${wrapText(notice, width).join("\n")}\n`);
  console.log(renderTable(result.cells, { spills, width }));
  console.log(`\n${fitted(found(result, flags.all), width)}`);
  if (result.counts.otherAddins.length) console.log(`Not recalculated, another add-in's functions: ${result.counts.otherAddins.join(", ")}`);
  return exit;
}

async function auditOne(file: string, flags: Options["flags"], format: Format): Promise<number> {
  const stem = file.slice(0, file.length - extname(file).length);
  const html = resolve(flags.html ?? `${stem}.audit.html`);
  const xlsx = resolve(flags.xlsx ?? `${stem}.audit.xlsx`);
  const text = resolve(flags.text ?? `${stem}.audit.txt`);
  if ([html, xlsx, text].includes(resolve(file))) throw new UsageError("the report would overwrite the workbook; choose another --html, --xlsx or --text path");
  for (const p of [html, xlsx, text]) await checkWritable(p);
  const { wb, result } = await load(file, flags);
  const exit = exitOf(result, flags);
  const width = outputWidth(flags.wide);
  if (exit === EXIT.empty) {
    if (format !== "table") process.stdout.write(machineOutput("audit", [workbookRecord(file, result, result.cells, found(result), exit)], format, exit));
    else console.error(`${emptyNotice(file, result)}\nNo audit written (--allow-empty writes one that says so).`);
    return exit;
  }
  const report = await writeAudit(wb, result, basename(file), html, xlsx, text, `Nappe audit of ${basename(file)}`, flags.wide ? Infinity : 80);
  if (format !== "table") {
    process.stdout.write(machineOutput("audit", [workbookRecord(file, result, result.cells, found(result), exit, { notice: report.notice, written: [html, xlsx, text] })], format, exit));
    return exit;
  }
  console.log(`${report.notice ? `${wrapText(report.notice, width).join("\n")}\n` : ""}${fitted(found(result), width)}\nAudit written:\n  ${html}\n  ${xlsx}\n  ${text}`);
  return exit;
}

/**
 * Several workbooks: each checked by a child process of its own (its own heap limit and time
 * budget; one that fails or runs over is reported and the others still checked), as many at
 * once as there are cores; a line per workbook and the totals, or the JSON / JUnit of all.
 */
async function many(command: "recalc" | "audit", files: string[], flags: Options["flags"], format: Format): Promise<number> {
  const jobs = flags.jobs === undefined ? Math.max(1, availableParallelism()) : Math.floor(positiveNumber("jobs", flags.jobs, 1));
  const limits = limitsOf(flags);
  // The child's own options, from the parsed flags: all but the job count and the format (its output is JSON).
  const passed = Object.entries(flags).flatMap(([name, value]) => (name === "jobs" || name === "format" || value === undefined || value === false ? [] : value === true ? [`--${name}`] : [`--${name}`, String(value)]));
  const records: WorkbookRecord[] = new Array(files.length);
  const started = Date.now();
  let done = 0;
  const progress = () => {
    if (!process.stderr.isTTY || Date.now() - started < 1000) return;
    const width = Math.max(10, Math.min(40, (process.stderr.columns ?? 80) - 40));
    const filled = Math.round((width * done) / files.length);
    process.stderr.write(`\r[${"#".repeat(filled)}${".".repeat(width - filled)}] ${done}/${files.length} workbooks`);
  };
  const ticker = setInterval(progress, 250);
  let next = 0;
  const worker = async () => {
    while (next < files.length) {
      const i = next++;
      records[i] = await child(command, files[i], passed, limits);
      done++;
      progress();
    }
  };
  try {
    await Promise.all(Array.from({ length: Math.min(jobs, files.length) }, worker));
  } finally {
    clearInterval(ticker);
    if (process.stderr.isTTY && Date.now() - started >= 1000) process.stderr.write("\r\x1b[K");
  }
  const exit = worst(records.map((r) => r.exit));
  if (format !== "table") {
    process.stdout.write(machineOutput(command, records, format, exit));
    return exit;
  }
  const width = outputWidth(flags.wide);
  console.log(manyTable(records, width));
  return exit;
}

/** Runs one workbook's check in a child process and reads its JSON record. */
function child(command: string, file: string, options: string[], limits: Limits): Promise<WorkbookRecord> {
  return new Promise((done) => {
    const args = [`--max-old-space-size=${Math.ceil(limits.megabytes)}`, process.argv[1], command, file, ...options, "--format", "json"];
    const proc = spawn(process.execPath, args, { stdio: ["ignore", "pipe", "pipe"] });
    let out = "";
    let err = "";
    proc.stdout.on("data", (d: Buffer) => (out += d));
    proc.stderr.on("data", (d: Buffer) => (err += d));
    // The child keeps its own budget; this is the backstop when it cannot (a hung write).
    const timer = setTimeout(() => proc.kill("SIGKILL"), (limits.seconds + 30) * 1000);
    proc.on("close", (code, signal) => {
      clearTimeout(timer);
      try {
        const report = JSON.parse(out) as { workbooks: WorkbookRecord[] };
        done({ ...report.workbooks[0], file });
      } catch {
        const why = signal ? `stopped (${signal}) over the budget of ${limits.seconds} s or ${limits.megabytes} MB` : err.trim().replace(/^nappe: /, "") || `ended with status ${code}`;
        done({ file, exit: EXIT.usage, error: why });
      }
    });
  });
}

/** A line per workbook, then the totals. */
function manyTable(records: readonly WorkbookRecord[], width: number): string {
  const head = ["workbook", "NAPPE", "ok", "warning", "error", "exit"];
  const rows = records.map((r) => [r.file, String(r.counts?.nappe ?? ""), String(r.counts?.ok ?? ""), String(r.counts?.warning ?? ""), String(r.counts?.error ?? ""), String(r.exit)]);
  const numbers = head.slice(1).map((h, j) => Math.max(h.length, ...rows.map((r) => r[j + 1].length)));
  const room = Math.max(12, Math.min(Math.max(8, ...rows.map((r) => r[0].length)), width - numbers.reduce((n, w) => n + w + 2, 0)));
  const cut = (t: string) => (t.length <= room ? t : `…${t.slice(t.length - room + 1)}`);
  const line = (r: string[]) => [cut(r[0]).padEnd(room), ...r.slice(1).map((x, j) => x.padStart(numbers[j]))].join("  ").trimEnd();
  const out = [line(head), [room, ...numbers].map((w) => "-".repeat(w)).join("  ")];
  for (const [i, r] of rows.entries()) {
    out.push(line(r));
    if (records[i].error) out.push(...wrapText(records[i].error!, width, "    ! ", "      "));
  }
  const sum = (f: (r: WorkbookRecord) => number | undefined) => records.reduce((n, r) => n + (f(r) ?? 0), 0);
  const unreadable = records.filter((r) => r.error).length;
  out.push("", ...wrapText(`${plural(records.length, "workbook")}${unreadable ? ` (${unreadable} could not be checked)` : ""}: ${plural(sum((r) => r.counts?.nappe), "NAPPE formula")}, ${sum((r) => r.counts?.ok)} ok, ${sum((r) => r.counts?.warning)} warning, ${sum((r) => r.counts?.error)} error; exit ${worst(records.map((r) => r.exit))}`, width, "", "  "));
  return out.join("\n");
}

async function diffVerb(opts: Options, format: Format): Promise<number> {
  if (opts.files.length !== 2) throw new UsageError(`nappe diff takes two workbooks, the old and the new; got ${opts.files.length}\n\n${HELP.diff}`);
  const tolerance = opts.flags.tolerance === undefined ? 1e-9 : Number(opts.flags.tolerance);
  if (!(tolerance >= 0)) throw new UsageError(`--tolerance must be a number of zero or more; got ${opts.flags.tolerance}`);
  const flags = { ...opts.flags, tolerance: undefined };
  const [a, b] = opts.files;
  const before = await load(a, flags);
  const after = await load(b, flags);
  const { diffWorkbooks, diffLines, diffExit } = await import("./diff");
  const d = diffWorkbooks(before, after, tolerance);
  const exit = diffExit(d);
  if (format === "json") process.stdout.write(`${JSON.stringify({ format: "nappe-diff", version: JSON_VERSION, old: a, new: b, exit, ...d }, null, 2)}\n`);
  else if (format === "junit") {
    const cases = [
      ...d.results.map((r) => ({ classname: `${b}.${r.sheet}`, name: `${r.sheet}!${r.cell} moved`, ...(r.beyond ? { failure: { message: `${r.old} → ${r.new}${r.unit ? ` ${r.unit}` : ""}`, text: `${r.sheet}!${r.cell}${r.label ? ` "${r.label}"` : ""}: ${r.old} → ${r.new}${r.unit ? ` ${r.unit}` : ""} (relative ${r.relative})` } } : {}) })),
      ...d.statuses.map((x) => ({ classname: `${b}.${x.sheet}`, name: `${x.sheet}!${x.cell} status`, ...(x.worse ? { failure: { message: `${x.old} → ${x.new}`, text: x.appeared.join("\n") } } : {}) })),
    ];
    process.stdout.write(junitXml([{ name: `diff ${a} → ${b}`, cases }]));
  } else {
    const width = outputWidth(opts.flags.wide);
    for (const l of diffLines(d, { old: a, new: b })) console.log(wrapText(l.trimStart(), width, /^\s*/.exec(l)![0], `${/^\s*/.exec(l)![0]}    `).join("\n"));
  }
  return exit;
}

async function showVerb(opts: Options, format: Format): Promise<number> {
  if (opts.files.length !== 1) throw new UsageError(`nappe show takes one workbook; got ${opts.files.length}\n\n${HELP.show}`);
  const { wb, result } = await load(opts.files[0], opts.flags);
  const { showCells, showText } = await import("./show");
  const digits = opts.flags.digits === undefined ? 6 : Number(opts.flags.digits);
  const cells = showCells(wb, result, digits);
  process.stdout.write(format === "json" ? `${JSON.stringify({ format: "nappe-show", version: JSON_VERSION, file: opts.files[0], cells }, null, 2)}\n` : showText(cells));
  return EXIT.ok;
}

async function main(argv: string[]): Promise<number> {
  const opts = parseArgs(argv);
  const { flags } = opts;
  if (flags.digits !== undefined) {
    const n = Number(flags.digits);
    if (!(Number.isInteger(n) && n >= 2 && n <= 15)) throw new UsageError(`--digits must be a whole number from 2 to 15; got ${flags.digits}`);
    setSignificantFigures(n);
  }
  // The time budget bounds a workbook's whole run, writing reports too: a backstop for what no
  // check inside can stop. Several workbooks: each child process has its own.
  const limits = limitsOf(flags);
  const watchdog = (files: number) =>
    setTimeout(() => {
      console.error(`nappe: stopped after ${files * limits.seconds + 15} s, over the time budget of ${limits.seconds} s per workbook (raise it with --max-seconds)`);
      process.exit(EXIT.usage);
    }, (files * limits.seconds + 15) * 1000).unref();
  switch (opts.command) {
    case "recalc":
    case "audit": {
      const format = formatOf(flags, ["table", "json", "junit"]);
      if (!opts.files.length) throw new UsageError(`${opts.command} needs a workbook or a folder\n\n${HELP[opts.command]}`);
      const files = await workbooksIn(opts.files);
      const single = files.length === 1 && opts.files.length === 1 && files[0] === opts.files[0];
      if (!single && opts.command === "audit" && (flags.html || flags.xlsx || flags.text)) throw new UsageError("--html, --xlsx and --text name one workbook's reports: with several, each is written beside its workbook");
      if (!files.length) throw new UsageError(`no .xlsx workbook in ${opts.files.join(", ")}`);
      if (single) {
        watchdog(1);
        return opts.command === "recalc" ? recalcOne(files[0], flags, format) : auditOne(files[0], flags, format);
      }
      return many(opts.command, files, flags, format);
    }
    case "handoff": {
      formatOf(flags, ["table"]);
      if (opts.files.length !== 1) throw new UsageError(`handoff takes one workbook; got ${opts.files.length}\n\n${HELP.handoff}`);
      const file = opts.files[0];
      const stem = file.slice(0, file.length - extname(file).length);
      const out = resolve(flags.out ?? `${stem}.handoff.xlsx`);
      if (out === resolve(file)) throw new UsageError("the copy would overwrite the workbook; choose another --out path");
      await checkWritable(out);
      watchdog(1);
      const { wb, result } = await load(file, flags);
      const exit = exitOf(result, flags);
      if (exit === EXIT.empty) {
        console.error(`${emptyNotice(file, result)}\nNo copy written.`);
        return exit;
      }
      const report = buildAudit(result.cells, { title: `Nappe audit of ${basename(file)}`, source: basename(file), found: found(result), notice: savedWithoutAddinNotice(result.counts), workbook: wb }, labelSource(wb));
      const { writeHandoff } = await import("./handoff");
      const frozen = await writeHandoff(file, out, result, report, limitsOf(flags));
      console.log(`${fitted(found(result), outputWidth(flags.wide))}\nHand-off copy written: ${out}\n  ${plural(frozen.nappe, "NAPPE formula")} frozen to their values${frozen.other ? `, ${plural(frozen.other, "formula")} of another add-in frozen to their cached values` : ""}; the original is untouched.`);
      return exit;
    }
    case "show":
      watchdog(1);
      return showVerb(opts, formatOf(flags, ["table", "json"]));
    case "diff":
      watchdog(2);
      return diffVerb(opts, formatOf(flags, ["table", "json", "junit"]));
    case "demo": {
      const out = resolve(flags.out ?? "demo-output");
      await checkWritable(join(out, "x"));
      return demo(out);
    }
    default:
      throw new UsageError(`nappe: unknown verb "${opts.command}"\n\n${USAGE}`);
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
  for (const { c, m } of flagged) for (const line of wrapText(m, 80, `  ${c.sheet}!${c.address}: `, "      ")) console.log(line);
  const { writeHandoff } = await import("./handoff");
  await writeHandoff(path, join(out, "orchard-handoff.xlsx"), result, report, DEFAULT_LIMITS);
  console.log("");
  const [what, tally] = found(result).split(/(?<=\)): /);
  console.log(tally ? `${what}:\n  ${tally}` : what);
  console.log(`Workbook: ${path}\nAudit report: ${join(out, "orchard-audit.html")}\nAudit sheet:  ${join(out, "orchard-audit.xlsx")}\nAudit text:   ${join(out, "orchard-audit.txt")}\nHand-off copy (values, no add-in needed): ${join(out, "orchard-handoff.xlsx")}`);
  console.log("");
  for (const line of wrapText(GENERAL_CAUTIONS.join(" "), 80)) console.log(line);
  return report.counts.error ? 1 : 0;
}

// process.exitCode, never process.exit(): the process ends once stdout has drained, so output
// piped into another program (nappe recalc … | less) is never cut short.
main(process.argv.slice(2)).then(
  (code) => {
    process.exitCode = code;
  },
  (e) => {
    if (e instanceof Done) {
      (e.code === EXIT.ok ? process.stdout : process.stderr).write(`${e.text}\n`);
      process.exitCode = e.code;
      return;
    }
    process.exitCode = 2;
    if (e instanceof UsageError) console.error(e.message);
    else if (e instanceof UnwritableError) console.error(`nappe: ${e.message}`);
    else if (e instanceof BudgetError || e instanceof WorkbookError) console.error(`nappe: ${e.message}`);
    else console.error(`nappe: unexpected failure: ${e instanceof Error ? e.message : String(e)}`);
  },
);

/**
 * The nappe command under review and in CI: every verb's help, the version, clear messages for
 * bad options and unwritable paths; output fitted to the terminal; JSON validated against its
 * schema (docs/nappe-json.schema.json, with Ajv) and JUnit XML parsed back (fast-xml-parser);
 * `nappe diff` on pairs of invented workbooks; `nappe show` as a git textconv filter in a real
 * temporary repository; many workbooks in one call with a corrupt one among them; the CI recipe
 * (docs/ci) run as written on a temporary repository.
 */
import { execFile, execFileSync } from "node:child_process";
import { chmodSync, copyFileSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { promisify } from "node:util";
import Ajv from "ajv";
import { XMLParser } from "fast-xml-parser";
import ExcelJS from "exceljs";
import yaml from "js-yaml";
import { beforeAll, describe, expect, it } from "vitest";
import packageJson from "../package.json";
import schema from "../docs/nappe-json.schema.json";
import { HAND_BOOKS, type HandBook, handBookBytes } from "./fixtures/handSheets";
import { tempDir } from "./helpers";

const root = join(__dirname, "..");
const bin = join(root, "bin/nappe.mjs");
const run = promisify(execFile);

/** Runs nappe with the environment given (COLUMNS), never throwing on a non-zero exit. */
async function nappe(args: string[], env: Record<string, string> = {}, cwd = root): Promise<{ code: number; stdout: string; stderr: string }> {
  try {
    const { stdout, stderr } = await run(process.execPath, [bin, ...args], { cwd, env: { ...process.env, COLUMNS: "", ...env }, maxBuffer: 1 << 26, timeout: 120_000 });
    return { code: 0, stdout, stderr };
  } catch (e) {
    const err = e as { code: number; stdout: string; stderr: string };
    return { code: err.code, stdout: err.stdout, stderr: err.stderr };
  }
}

const ajv = new Ajv({ allErrors: true, allowUnionTypes: true });
const validate = ajv.compile(schema);
function expectSchema(text: string): Record<string, unknown> {
  const data = JSON.parse(text);
  expect(validate(data), JSON.stringify(validate.errors, null, 1)).toBe(true);
  return data;
}

const xml = new XMLParser({ ignoreAttributes: false, attributeNamePrefix: "", isArray: (name) => ["testsuite", "testcase"].includes(name) });

const dir = tempDir();
const book = (id: string) => HAND_BOOKS.find((b) => b.id === id)!;

/** A hand book with its rows edited, written to `name`. */
async function variant(name: string, base: HandBook, edit: (sheets: HandBook["sheets"]) => HandBook["sheets"]): Promise<string> {
  const path = join(dir, name);
  writeFileSync(path, await handBookBytes({ ...base, sheets: edit(base.sheets.map((s) => ({ name: s.name, rows: s.rows.map((r) => [...r] as [string, string | number]) }))) }));
  return path;
}

/** Formulas of a sheet with every reference to its own rows at or below `from` moved down one (a row inserted above them). */
function shiftRows(rows: [string, string | number][], from: number): [string, string | number][] {
  return rows.map(([l, v]) => [l, typeof v === "string" ? v.replace(/(?<![A-Za-z!$])(\$?[A-Z]\$?)(\d+)/g, (m, c: string, n: string) => (Number(n) >= from ? `${c}${Number(n) + 1}` : m)) : v]);
}

let clean: string;
beforeAll(async () => {
  clean = join(dir, "clean.xlsx");
  writeFileSync(clean, await handBookBytes(book("clean-si")));
  writeFileSync(join(dir, "g981.xlsx"), await handBookBytes(book("g981-si")));
});

describe("command-line conventions", () => {
  it("--help and -h on every verb exit 0, as does nappe help VERB; --version gives the package's", async () => {
    for (const verb of ["recalc", "audit", "handoff", "show", "diff", "demo"]) {
      for (const args of [[verb, "--help"], [verb, "-h"], ["help", verb]]) {
        const r = await nappe(args);
        expect(r.code, args.join(" ")).toBe(0);
        expect(r.stdout, args.join(" ")).toMatch(new RegExp(`^nappe ${verb} `));
      }
    }
    const top = await nappe(["--help"]);
    expect(top.code).toBe(0);
    expect(top.stdout).toMatch(/Exit status: 0 .* 3 no NAPPE formula found/s);
    expect((await nappe(["--version"])).stdout.trim()).toBe(`nappe ${packageJson.version}`);
  });

  it("says plainly what is wrong with an option or an output path, with exit 2", async () => {
    const unknown = await nappe(["recalc", clean, "--frobnicate"]);
    expect(unknown).toMatchObject({ code: 2, stderr: "nappe recalc: unknown option --frobnicate; see nappe help recalc\n" });
    const missing = await nappe(["recalc", clean, "--format"]);
    expect(missing.stderr).toBe("nappe recalc: option --format needs a value; see nappe help recalc\n");
    const file = join(dir, "a-file");
    writeFileSync(file, "x");
    const under = await nappe(["audit", clean, "--html", join(file, "r.html")]);
    expect(under).toMatchObject({ code: 2, stderr: `nappe: cannot write ${join(file, "r.html")}: ${file} is a file, not a folder\n` });
    // Under /proc a folder cannot be made: said at once, never a minutes-long spin.
    const started = Date.now();
    const proc = await nappe(["audit", clean, "--html", "/proc/nope/r.html", "--xlsx", join(dir, "p.xlsx"), "--text", join(dir, "p.txt")]);
    expect(proc.code).toBe(2);
    expect(proc.stderr).toMatch(/^nappe: cannot write \/proc\/nope\/r\.html: cannot make the folder \/proc\/nope/);
    expect(Date.now() - started).toBeLessThan(30_000);
  }, 60_000);

  it("counts with their grammar, and a formula returning an Excel error counts as recalculated", async () => {
    const r = await nappe(["recalc", clean]);
    expect(r.stdout).toContain("1 NAPPE formula found in 18 formulas (1 recalculated): 1 ok, 0 warning, 0 error");
    const errors = await variant("errors.xlsx", book("clean-si"), (s) => {
      s[1].rows.push(["Lookup", "=NAPPE.CONVERT(1, \"ft\", \"m\")*NA()"]);
      return s;
    });
    const e = await nappe(["recalc", errors]);
    expect(e.stdout).toContain("2 NAPPE formulas found in 19 formulas (2 recalculated): 1 ok, 0 warning, 1 error");
  });
});

describe("a terminal a person can read", () => {
  it("fits 80 columns when not a terminal, COLUMNS when set; --wide gives everything; long formulas shortened with … and given in full below", async () => {
    const demo = join(root, "demo", "orchard-pumping-station.xlsx");
    const width = (text: string) => Math.max(...text.split("\n").map((l) => [...l].length));
    const eighty = await nappe(["recalc", demo]);
    expect(width(eighty.stdout)).toBeLessThanOrEqual(80);
    expect(eighty.stdout).toMatch(/=NAPPE\.SYSTEM\.CURVE\(B24, E3:H5,…/);
    expect(eighty.stdout).toContain('    formula: =NAPPE.SYSTEM.CURVE(B24, E3:H5, "150 m^3/h", 11, B6, "m^3/h", "m")');
    const hundred = await nappe(["recalc", demo], { COLUMNS: "100" });
    expect(width(hundred.stdout)).toBeLessThanOrEqual(100);
    expect(width(hundred.stdout)).toBeGreaterThan(80);
    const wide = await nappe(["recalc", demo, "--wide"]);
    expect(width(wide.stdout)).toBeGreaterThan(100);
    expect(wide.stdout).not.toContain("    formula: ");
    // Warnings wrap with a hanging indent under their "-".
    expect(eighty.stdout).toMatch(/\n {4}- NAPPE\.SYSTEM\.CURVE: unit check: .*\n {6}\S/);
  });
});

describe("output for machines", () => {
  it("recalc, audit, diff and show give JSON that validates against the documented schema", async () => {
    const slipped = join(dir, "g981.xlsx");
    const recalc = expectSchema((await nappe(["recalc", slipped, "--format", "json"])).stdout);
    const formula = (recalc.workbooks as { formulas: { diagnosis?: { verdict: string; firstDeparture: { symbol: string } } }[] }[])[0].formulas[0];
    expect(formula.diagnosis).toMatchObject({ verdict: "differs", firstDeparture: { symbol: "V²/2g" } });
    // The cautions travel with the machine output too.
    expect((recalc.cautions as string[]).join(" ")).toMatch(/licensed engineer.*can hurt people/);
    const audit = await nappe(["audit", slipped, "--format", "json", "--html", join(dir, "g.html"), "--xlsx", join(dir, "g.xlsx"), "--text", join(dir, "g.txt")]);
    expect(expectSchema(audit.stdout)).toMatchObject({ command: "audit", exit: 0 });
    expectSchema((await nappe(["diff", clean, slipped, "--format", "json"])).stdout);
    expectSchema((await nappe(["show", slipped, "--format", "json"])).stdout);
    // The table stays the default, also when piped.
    expect((await nappe(["recalc", slipped])).stdout).toMatch(/^sheet\s+cell\s+formula/);
  });

  it("JUnit XML: a test suite per workbook, a test case per NAPPE formula, a failure per error", async () => {
    const differs = await variant("stale.xlsx", book("clean-si"), (s) => s);
    // A cached value that differs: an error the JUnit report must carry as a failure.
    const stale = join(dir, "stale-cached.xlsx");
    writeFileSync(stale, await handBookBytes(book("clean-si"), { cached: (sheet, address) => (sheet === "Calc" && address === "B18" ? 0.5 : undefined) }));
    const r = await nappe(["recalc", differs, stale, "--format", "junit"]);
    expect(r.code).toBe(1);
    const doc = xml.parse(r.stdout);
    const suites = doc.testsuites.testsuite as { name: string; tests: string; failures: string; testcase: { name: string; failure?: { message: string } }[] }[];
    expect(suites.map((s) => s.name)).toEqual([differs, stale]);
    expect(suites[0]).toMatchObject({ tests: "1", failures: "0" });
    expect(suites[1]).toMatchObject({ tests: "1", failures: "1" });
    expect(suites[1].testcase[0].name).toMatch(/^Calc!B18 =NAPPE\.CROSSCHECK/);
    expect(suites[1].testcase[0].failure!.message).toMatch(/differs from the value cached in the file \(0\.5\)/);
    expect(doc.testsuites).toMatchObject({ tests: "2", failures: "1", errors: "0" });
    expect(r.stdout).toContain('<property name="caution" value="Pressurised systems, surge, cavitation, motors and public water features can hurt people."/>');
  });
});

describe("nappe diff", () => {
  it("nothing changed: exit 0", async () => {
    const copy = join(dir, "copy.xlsx");
    copyFileSync(clean, copy);
    const r = await nappe(["diff", clean, copy]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/No change\.\n$/);
  });

  it("an input changed: the input, and the NAPPE results that moved, exit 1", async () => {
    // The demo with the site 50 m higher: the atmosphere, and all that depends on it, move.
    const demo = join(root, "demo", "orchard-pumping-station.xlsx");
    const copy = new ExcelJS.Workbook();
    await copy.xlsx.readFile(demo);
    copy.getWorksheet("Inputs")!.getCell("B4").value = 1900;
    const higher = join(dir, "higher.xlsx");
    await copy.xlsx.writeFile(higher);
    const r = await nappe(["diff", demo, higher, "--wide"]);
    expect(r.code).toBe(1);
    expect(r.stdout).toMatch(/Inputs changed \(1\):\n {2}Inputs!B4 "Site elevation above sea level": 1850 → 1900 m\n/);
    expect(r.stdout).toContain('Calc!B4 "Atmospheric pressure": 80.992 → 80.493 kPa (-0.617 %)');
    // Figures enough for a small change to show.
    expect(r.stdout).toMatch(/Calc!B25 "Head the pump must add at duty": 100\.7998\d{4,} → 100\.7998\d{4,} m \(\+2\.29×10⁻⁷ %\)/);
    expect(r.stdout).not.toMatch(/Formulas changed \(/);
    // exceljs saved the copy without recalculating it: its cached values are stale, which the statuses say.
    expect(r.stdout).toMatch(/1 input and 0 formulas changed; 15 NAPPE results moved; 3 statuses worse\./);
    expect(r.stdout).toContain("+ differs from the value cached in the file (80.99235941407201) by 0.617 %");
    // The kept check of a hand sheet whose relative difference barely moves stays within the tolerance: exit 0.
    const changed = await variant("flow75.xlsx", book("g981-si"), (s) => {
      s[0].rows[0][1] = 75;
      return s;
    });
    const small = await nappe(["diff", join(dir, "g981.xlsx"), changed]);
    expect(small.code).toBe(0);
    expect(small.stdout).toContain('Inputs!B1 "Flow (m³/h)": 70 → 75 m³/h');
    expect(small.stdout).toContain("(within the tolerance)");
  });

  it("a row inserted above the NAPPE calls is one inserted row, not every cell below it changing", async () => {
    const inserted = await variant("inserted.xlsx", book("clean-si"), (s) => {
      s[1].rows = [["Revision B: bend added", ""], ...shiftRows(s[1].rows, 1)];
      return s;
    });
    const r = await nappe(["diff", clean, inserted]);
    expect(r.stdout).toContain('Calc: row 1 inserted ("Revision B: bend added")');
    expect(r.stdout).not.toMatch(/Formulas changed \(|Inputs changed \(|NAPPE results moved \(/);
    expect(r.code).toBe(0);
  });

  it("a formula edited: old and new text, and the result that moved", async () => {
    const edited = await variant("edited.xlsx", book("clean-si"), (s) => {
      s[1].rows[15] = ["Velocity head (m)", "=B4^2/(2*9.81)"];
      return s;
    });
    const r = await nappe(["diff", clean, edited, "--wide"]);
    expect(r.code).toBe(1);
    expect(r.stdout).toContain('Calc!B16 "Velocity head (m)":\n    was =B4^2/(2*Inputs!B7)\n    now =B4^2/(2*9.81)');
    expect(r.stdout).toContain('Calc!B18 "Cross-check": 2.148×10⁻¹³ → -3.415×10⁻⁴ (from about zero)');
  });

  it("a sheet renamed: said once, and formulas reading it are not changes", async () => {
    const renamed = await variant("renamed.xlsx", book("clean-si"), (s) => {
      s[0].name = "Design inputs";
      s[1].rows = s[1].rows.map(([l, v]) => [l, typeof v === "string" ? v.replace(/Inputs!/g, "'Design inputs'!") : v]);
      return s;
    });
    const r = await nappe(["diff", clean, renamed]);
    expect(r.stdout).toContain('renamed "Inputs" → "Design inputs"');
    expect(r.stdout).not.toMatch(/Formulas changed \(|NAPPE results moved \(/);
    expect(r.code).toBe(0);
  });
});

describe("git diff that reads workbooks", () => {
  it("nappe show as a textconv: a changed input shows as its line and the moved results' lines", async () => {
    await variant("flow75.xlsx", book("g981-si"), (s) => {
      s[0].rows[0][1] = 75;
      return s;
    });
    const repo = join(dir, "repo");
    mkdirSync(repo);
    const git = (...args: string[]) => execFileSync("git", args, { cwd: repo, encoding: "utf8", env: { ...process.env, GIT_CONFIG_NOSYSTEM: "1", HOME: repo } });
    git("init", "-q");
    git("config", "user.email", "reviewer@example.invalid");
    git("config", "user.name", "Reviewer");
    // The two lines README gives, with the command as this checkout runs it.
    writeFileSync(join(repo, ".gitattributes"), "*.xlsx diff=nappe\n");
    git("config", "diff.nappe.textconv", `"${process.execPath}" "${bin}" show`);
    copyFileSync(join(dir, "g981.xlsx"), join(repo, "pipe.xlsx"));
    git("add", ".");
    git("commit", "-qm", "rev A");
    copyFileSync(join(dir, "flow75.xlsx"), join(repo, "pipe.xlsx"));
    const out = git("diff");
    expect(out).not.toMatch(/Binary files differ/);
    expect(out).toContain("-Inputs!B1 | Flow (m³/h) |  | 70");
    expect(out).toContain("+Inputs!B1 | Flow (m³/h) |  | 75");
    expect(out).toMatch(/^-Calc!B17 \| Head loss h_f \(m\) \| =B15\*Inputs!B3\/B2\*B16 \| 12\.3\d*$/m);
    expect(out).toMatch(/^\+Calc!B17 \| Head loss h_f \(m\) \| =B15\*Inputs!B3\/B2\*B16 \| 14\.\d*$/m);
    // Unchanged cells are not in the diff.
    expect(out).not.toMatch(/^[-+]Inputs!B2 /m);
  });
});

describe("many workbooks in one call", () => {
  it("a folder with a corrupt file among good ones: the corrupt one is reported, the others checked, the worst exit", async () => {
    const folder = join(dir, "many");
    mkdirSync(join(folder, "sub"), { recursive: true });
    copyFileSync(clean, join(folder, "a.xlsx"));
    copyFileSync(join(dir, "g981.xlsx"), join(folder, "sub", "b.xlsx"));
    writeFileSync(join(folder, "broken.xlsx"), Buffer.concat([Buffer.from("PK\x03\x04"), Buffer.alloc(64, 7)]));
    copyFileSync(clean, join(folder, "a.audit.xlsx")); // our own output: not a workbook to check
    const narrow = await nappe(["recalc", folder]);
    expect(Math.max(...narrow.stdout.split("\n").map((l) => [...l].length))).toBeLessThanOrEqual(80);
    const r = await nappe(["recalc", folder, "--wide"]);
    expect(r.code).toBe(2);
    const lines = r.stdout.split("\n");
    expect(lines[0]).toMatch(/^workbook\s+NAPPE\s+ok\s+warning\s+error\s+exit$/);
    expect(r.stdout).toMatch(/a\.xlsx\s+1\s+1\s+0\s+0\s+0/);
    expect(r.stdout).toMatch(/broken\.xlsx\s+2\n\s+! .*could not be read as an \.xlsx workbook/);
    expect(r.stdout).toMatch(/sub\/b\.xlsx\s+1\s+0\s+1\s+0\s+0/);
    expect(r.stdout).not.toContain("a.audit.xlsx");
    expect(r.stdout).toMatch(/3 workbooks \(1 could not be checked\): 2 NAPPE formulas, 1 ok, 1 warning, 0 error; exit 2/);
    const json = expectSchema((await nappe(["recalc", folder, "--format", "json"])).stdout);
    expect(json).toMatchObject({ exit: 2, totals: { workbooks: 3, unreadable: 1, nappe: 2 } });
  }, 120_000);
});

describe("the CI recipe", () => {
  it("the workflow and the pre-commit hook run as written on a temporary repository", async () => {
    const repo = join(dir, "ci-repo");
    mkdirSync(join(repo, "calcs"), { recursive: true });
    copyFileSync(clean, join(repo, "calcs", "pipe.xlsx"));
    const stale = join(repo, "calcs", "stale.xlsx");
    // The workbook on the PATH: the "Install Nappe" step is the one this test does itself, by a shim to this checkout.
    const shims = join(dir, "shims");
    mkdirSync(shims, { recursive: true });
    writeFileSync(join(shims, "nappe"), `#!/bin/sh\nexec "${process.execPath}" "${bin}" "$@"\n`);
    chmodSync(join(shims, "nappe"), 0o755);
    const env = { ...process.env, PATH: `${shims}:${process.env.PATH}`, COLUMNS: "" };
    const workflow = yaml.load(readFileSync(join(root, "docs/ci/workflow.yml"), "utf8")) as { jobs: Record<string, { steps: { name?: string; run?: string; uses?: string }[] }> };
    const steps = Object.values(workflow.jobs)[0].steps;
    const commands = steps.filter((s) => s.run && s.name !== "Install Nappe").map((s) => s.run!);
    expect(commands).toEqual(["nappe recalc . --allow-empty --format junit > nappe-junit.xml"]);
    const sh = (command: string, files: string[] = []) => {
      try {
        execFileSync("bash", ["-e", "-c", `${command} "$@"`, "bash", ...files], { cwd: repo, env, encoding: "utf8" });
        return 0;
      } catch (e) {
        return (e as { status: number }).status;
      }
    };
    expect(sh(commands[0])).toBe(0);
    let report = xml.parse(readFileSync(join(repo, "nappe-junit.xml"), "utf8"));
    expect(report.testsuites).toMatchObject({ tests: "1", failures: "0" });
    writeFileSync(stale, await handBookBytes(book("clean-si"), { cached: (sheet, address) => (sheet === "Calc" && address === "B18" ? 0.5 : undefined) }));
    expect(sh(commands[0])).toBe(1);
    report = xml.parse(readFileSync(join(repo, "nappe-junit.xml"), "utf8"));
    expect(report.testsuites).toMatchObject({ tests: "2", failures: "1" });

    const hooks = yaml.load(readFileSync(join(root, "docs/ci/pre-commit-hooks.yaml"), "utf8")) as { id: string; entry: string; files: string; exclude: string }[];
    const hook = hooks[0];
    expect(hook.entry).toBe("nappe recalc --allow-empty --format junit");
    // As the framework runs it: the entry with the staged files its patterns select.
    const staged = ["calcs/pipe.xlsx", "calcs/stale.xlsx", "calcs/pipe.audit.xlsx", "notes.txt"].filter((f) => new RegExp(hook.files).test(f) && !new RegExp(hook.exclude).test(f));
    expect(staged).toEqual(["calcs/pipe.xlsx", "calcs/stale.xlsx"]);
    expect(sh(hook.entry, ["calcs/pipe.xlsx"])).toBe(0);
    expect(sh(hook.entry, staged)).toBe(1);
  }, 120_000);
});

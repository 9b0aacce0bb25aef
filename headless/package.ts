/**
 * The .xlsx package: checks that it is a workbook at all, keeps its size within the memory
 * budget, reads its defined names and external links, and finds its worksheets' parts in the
 * workbook's order (headless/sheetXml.ts reads their cells). For the hand-off copy, which exceljs
 * writes, `trimPackage` takes out the parts that exceljs expands cell by cell but the copy never
 * needs (data validations, conditional formats, very large merges), so that a whole-sheet rule
 * costs nothing. The original bytes are never changed on disk.
 */
import { ZipReader } from "./zip";
import type { DefinedName } from "../workbook/model";
import { unescapeXml } from "../workbook/xml";

/** A problem with the file itself, reported without a stack trace. */
export class WorkbookError extends Error {}

/** Time and memory a run may use on one file. */
export interface Limits {
  /** Seconds for reading and recalculating (default 60). */
  seconds: number;
  /** Megabytes of memory (default 1024). */
  megabytes: number;
}

export const DEFAULT_LIMITS: Limits = { seconds: 60, megabytes: 1024 };

/** Thrown when a run goes over its time or memory budget. */
export class BudgetError extends WorkbookError {}

/** Checks elapsed time and heap use against the limits; call it often in long loops. */
export class Budget {
  private readonly started = Date.now();
  /** When memory was last read: reading it costs far more than reading the clock, so at most every 200 ms. */
  private memoryReadAt = -Infinity;
  constructor(
    readonly limits: Limits = DEFAULT_LIMITS,
    private readonly file = "the workbook",
  ) {}

  check(stage: string): void {
    const seconds = (Date.now() - this.started) / 1000;
    if (seconds > this.limits.seconds) {
      throw new BudgetError(`${this.file}: stopped while ${stage} after ${seconds.toFixed(0)} s, over the time budget of ${this.limits.seconds} s (raise it with --max-seconds)`);
    }
    const now = Date.now();
    if (now - this.memoryReadAt < 200) return;
    this.memoryReadAt = now;
    const mb = process.memoryUsage.rss() / 2 ** 20;
    if (mb > this.limits.megabytes) {
      throw new BudgetError(`${this.file}: stopped while ${stage}: ${mb.toFixed(0)} MB in use, over the memory budget of ${this.limits.megabytes} MB (raise it with --max-memory)`);
    }
  }
}

/**
 * Reading and recalculating an .xlsx takes at most about this many bytes of memory per byte of
 * sheet XML (a safe upper figure: the 40 000-formula workbook of the bench, 2.5 MB of sheet XML,
 * peaks near 170 MB with Node itself included).
 */
const MEMORY_PER_XML_BYTE = 12;

interface PackageContents {
  /** The package's bytes as read. */
  bytes: Buffer;
  zip: ZipReader;
  /** xl/workbook.xml as stored. */
  workbookXml: string;
  definedNames: DefinedName[];
  /** External workbooks by their index in formulas ([1] → "prices.xlsx"). */
  externalLinks: Map<number, string>;
  /** Worksheets in the workbook's order, with their parts ("xl/worksheets/sheet1.xml"). */
  sheets: { name: string; path: string }[];
  /** The shared-strings and styles parts, where the package has them. */
  sharedStringsPath?: string;
  stylesPath?: string;
}

function attr(tag: string, name: string): string | undefined {
  const m = new RegExp(`\\s${name}="([^"]*)"`).exec(tag);
  return m ? unescapeXml(m[1]) : undefined;
}


/** Elements of the main namespace, with or without a prefix (`<dataValidations>`, `<x:dataValidations>`). */
function element(name: string): RegExp {
  return new RegExp(`<(?:\\w+:)?${name}\\b[^>]*?(?:/>|>[\\s\\S]*?</(?:\\w+:)?${name}>)`, "g");
}

/** A range above this many cells is not expanded cell by cell. */
const LARGE_RANGE = 100_000;

function cellsIn(ref: string): number {
  const m = /^\$?([A-Z]{1,3})\$?(\d+)(?::\$?([A-Z]{1,3})\$?(\d+))?$/i.exec(ref);
  if (!m) return 1;
  const col = (s: string) => [...s.toUpperCase()].reduce((n, ch) => n * 26 + ch.charCodeAt(0) - 64, 0);
  const rows = m[4] ? Math.abs(Number(m[4]) - Number(m[2])) + 1 : 1;
  const cols = m[3] ? Math.abs(col(m[3]) - col(m[1])) + 1 : 1;
  return rows * cols;
}

/** The largest area one of the space-separated ranges of a sqref covers. */
function largestIn(sqref: string): { ref: string; cells: number } {
  return sqref
    .split(/\s+/)
    .filter(Boolean)
    .map((ref) => ({ ref, cells: cellsIn(ref) }))
    .reduce((a, b) => (b.cells > a.cells ? b : a), { ref: "", cells: 0 });
}

/**
 * Takes out what exceljs would expand cell by cell and the recalculation never reads. Adds to
 * `large` a description of each thing taken out that covered a large range.
 */
function trimSheetXml(xml: string, large: string[] = []): string {
  const note = (what: string) => (tag: string) => {
    for (const m of tag.matchAll(/\ssqref="([^"]*)"|<(?:\w+:)?sqref>([^<]*)</g)) {
      const big = largestIn(m[1] ?? m[2] ?? "");
      if (big.cells > LARGE_RANGE) large.push(`${what} over ${big.ref}`);
    }
    return "";
  };
  let out = xml.replace(element("dataValidations"), note("data validation")).replace(element("conditionalFormatting"), note("conditional format"));
  out = out.replace(/<(?:\w+:)?mergeCell\b[^>]*\/>/g, (tag) => {
    const ref = attr(tag, "ref") ?? "";
    if (cellsIn(ref) <= LARGE_RANGE) return tag;
    large.push(`merged cells ${ref}`);
    return "";
  });
  // The sheet's extension list (x14 validations and formats) is always its last child.
  const ext = out.search(/<(?:\w+:)?extLst\b/);
  const endData = out.search(/<\/(?:\w+:)?sheetData>/);
  const end = out.search(/<\/(?:\w+:)?worksheet>\s*$/);
  if (ext > endData && endData >= 0 && end > ext) {
    note("data validation or conditional format")(out.slice(ext, end));
    out = out.slice(0, ext) + out.slice(end);
  }
  return out;
}

/** Relationship id → target and type, from a .rels part. */
function relationships(zip: ZipReader, path: string): Map<string, { target: string; type: string }> {
  const xml = zip.text(path);
  const out = new Map<string, { target: string; type: string }>();
  for (const tag of xml?.match(/<Relationship\b[^>]*>/g) ?? []) {
    const id = attr(tag, "Id");
    const target = attr(tag, "Target");
    if (id && target) out.set(id, { target, type: attr(tag, "Type") ?? "" });
  }
  return out;
}

function resolvePart(base: string, target: string): string {
  if (target.startsWith("/")) return target.slice(1);
  const parts = base.split("/").slice(0, -1);
  for (const p of target.split("/")) {
    if (p === "..") parts.pop();
    else if (p !== ".") parts.push(p);
  }
  return parts.join("/");
}

/** Opens an .xlsx package (a zip with xl/workbook.xml). Throws WorkbookError for anything else. */
export async function openPackage(bytes: Buffer, file: string, limits: Limits = DEFAULT_LIMITS): Promise<PackageContents> {
  try {
    return readPackage(bytes, file, limits);
  } catch (e) {
    if (e instanceof WorkbookError) throw e;
    throw new WorkbookError(`${file} could not be read as an .xlsx workbook; it may be corrupt (${e instanceof Error ? e.message.split("\n")[0] : String(e)})`);
  }
}

function readPackage(bytes: Buffer, file: string, limits: Limits): PackageContents {
  const zip = new ZipReader(bytes);
  if (!zip.entries.has("xl/workbook.xml")) throw new WorkbookError(`${file} is a zip package but not an .xlsx workbook: it has no xl/workbook.xml`);
  let xmlBytes = 0;
  for (const e of zip.entries.values()) if (/\.xml$/i.test(e.name)) xmlBytes += e.uncompressedSize;
  const needed = (xmlBytes * MEMORY_PER_XML_BYTE) / 2 ** 20;
  if (needed > limits.megabytes) {
    throw new BudgetError(`${file}: its ${(xmlBytes / 2 ** 20).toFixed(0)} MB of XML would need about ${needed.toFixed(0)} MB of memory to read, over the memory budget of ${limits.megabytes} MB (raise it with --max-memory)`);
  }

  const workbookXml = zip.text("xl/workbook.xml") ?? "";
  const sheetTags = workbookXml.match(/<(?:\w+:)?sheet\b[^>]*>/g) ?? [];
  const sheetNames = sheetTags.map((t) => attr(t, "name") ?? "");
  const definedNames: DefinedName[] = [];
  for (const m of workbookXml.matchAll(/<(?:\w+:)?definedName\b([^>]*)>([\s\S]*?)<\/(?:\w+:)?definedName>/g)) {
    const name = attr(m[1], "name");
    if (!name || name.startsWith("_xlnm.")) continue;
    const local = attr(m[1], "localSheetId");
    definedNames.push({ name, refersTo: unescapeXml(m[2]).trim(), sheet: local === undefined ? undefined : sheetNames[Number(local)] });
  }

  const externalLinks = new Map<number, string>();
  const rels = relationships(zip, "xl/_rels/workbook.xml.rels");
  const refs = workbookXml.match(/<(?:\w+:)?externalReference\b[^>]*>/g) ?? [];
  for (const [i, tag] of refs.entries()) {
    const part = rels.get(attr(tag, "r:id") ?? "");
    if (!part) continue;
    const path = resolvePart("xl/workbook.xml", part.target);
    const linkRels = relationships(zip, path.replace(/([^/]+)$/, "_rels/$1.rels"));
    externalLinks.set(i + 1, [...linkRels.values()][0]?.target ?? path);
  }

  const sheets: { name: string; path: string }[] = [];
  sheetTags.forEach((tag, i) => {
    const rel = rels.get(attr(tag, "r:id") ?? "");
    // Chart sheets and dialog sheets hold no cells.
    if (rel && /\/worksheet$/.test(rel.type)) sheets.push({ name: sheetNames[i], path: resolvePart("xl/workbook.xml", rel.target) });
  });
  const partOf = (type: string) => {
    const rel = [...rels.values()].find((r) => r.type.endsWith(`/${type}`));
    return rel ? resolvePart("xl/workbook.xml", rel.target) : undefined;
  };
  return { bytes, zip, workbookXml, definedNames, externalLinks, sheets, sharedStringsPath: partOf("sharedStrings"), stylesPath: partOf("styles") };
}

/**
 * The package as exceljs should load it for the hand-off copy, with what exceljs would expand
 * cell by cell taken out (defined names among them), and a description of each large thing taken
 * out ("Sheet2: data validation over A1:XFD1048576").
 */
export async function trimPackage(pkg: PackageContents): Promise<{ bytes: Buffer; trimmed: string[] }> {
  const { default: JSZip } = await import("jszip");
  const zip = await JSZip.loadAsync(pkg.bytes);
  zip.file("xl/workbook.xml", pkg.workbookXml.replace(element("definedNames"), ""));
  const trimmed: string[] = [];
  for (const { name, path } of pkg.sheets) {
    const xml = await zip.file(path)?.async("string");
    if (xml === undefined) continue;
    const large: string[] = [];
    const out = trimSheetXml(xml, large);
    if (out !== xml) zip.file(path, out);
    trimmed.push(...large.map((l) => `${name}: ${l}`));
  }
  const bytes = await zip.generateAsync({ type: "nodebuffer", compression: "STORE" });
  return { bytes, trimmed };
}

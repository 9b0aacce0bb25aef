/**
 * The workbook model read straight from a package's XML parts (ECMA-376 Part 1, §18.3 sheet
 * data, §18.4 shared strings, §18.8 styles): values, formulas with their cached results, number
 * formats, array ranges and merged cells. One pass over each sheet's text with no XML tree, so a
 * sheet of 40 000 formulas reads in a small fraction of the time a general-purpose reader takes.
 *
 * It reads what exceljs reads and gives the same model (test/sheetXml.test.ts compares the two
 * on every workbook the tests have, including files saved by LibreOffice and XML written by hand
 * in Excel's stored form): numbers under a date or time format become ISO dates, a merged area's
 * other cells show its first cell's value, a shared formula is written out at every cell that
 * shares it. One deliberate difference: a reference inside a string of a shared formula
 * ("A1" in `IF(A2>0,"A1","")`) is text, and stays as written.
 */
import type { CellModel, CellValue, SheetModel, WorkbookModel } from "../workbook/model";
import { addressOf, cellKey, parseAddress } from "../workbook/address";
import { unescapeXml } from "../workbook/xml";
import { shiftFormula } from "../workbook/storedForm";

/** Built-in number formats by id (ECMA-376 Part 1, §18.8.30); ids not listed depend on the locale. */
const BUILT_IN_FORMATS: Record<number, string> = {
  0: "General", 1: "0", 2: "0.00", 3: "#,##0", 4: "#,##0.00", 9: "0%", 10: "0.00%", 11: "0.00E+00", 12: "# ?/?", 13: "# ??/??",
  14: "mm-dd-yy", 15: "d-mmm-yy", 16: "d-mmm", 17: "mmm-yy", 18: "h:mm AM/PM", 19: "h:mm:ss AM/PM", 20: "h:mm", 21: "h:mm:ss", 22: "m/d/yy h:mm",
  37: "#,##0 ;(#,##0)", 38: "#,##0 ;[Red](#,##0)", 39: "#,##0.00 ;(#,##0.00)", 40: "#,##0.00 ;[Red](#,##0.00)",
  45: "mm:ss", 46: "[h]:mm:ss", 47: "mmss.0", 48: "##0.0E+0", 49: "@",
};

/** The parts the model is read from, as text. */
interface WorkbookParts {
  workbookXml: string;
  /** Worksheets in the workbook's order (chart sheets and dialog sheets left out). */
  sheets: { name: string; xml: string }[];
  sharedStringsXml?: string;
  stylesXml?: string;
}

/** ' name="' for each attribute name asked for, made once (readSheet asks several times per cell). */
const NEEDLES: Record<string, string> = {};

function attr(tag: string, name: string): string | undefined {
  const at = tag.indexOf((NEEDLES[name] ??= ` ${name}="`));
  if (at < 0) return undefined;
  const start = at + name.length + 3;
  return tag.slice(start, tag.indexOf('"', start));
}

/** Text of every <t> element in a stretch of XML (a string item or an inline string), rich runs joined, phonetic runs left out. */
function textOf(xml: string): string {
  const plain = xml.replace(/<(?:\w+:)?rPh\b[\s\S]*?<\/(?:\w+:)?rPh>/g, "");
  let out = "";
  for (const m of plain.matchAll(/<(?:\w+:)?t(?:\s[^>]*)?>([\s\S]*?)<\/(?:\w+:)?t>/g)) out += m[1];
  return unescapeXml(out);
}

function sharedStrings(xml: string | undefined): string[] {
  if (!xml) return [];
  return [...xml.matchAll(/<(?:\w+:)?si\b[^>]*?(?:\/>|>([\s\S]*?)<\/(?:\w+:)?si>)/g)].map((m) => textOf(m[1] ?? ""));
}

/** The number format of each cell style (the `s` index), "General" where none is set. */
function styleFormats(xml: string | undefined): string[] {
  if (!xml) return [];
  const custom = new Map<number, string>();
  for (const m of xml.matchAll(/<(?:\w+:)?numFmt\b[^>]*>/g)) {
    const id = attr(m[0], "numFmtId");
    const code = attr(m[0], "formatCode");
    if (id !== undefined && code !== undefined) custom.set(Number(id), unescapeXml(code));
  }
  const xfs = /<(?:\w+:)?cellXfs\b[^>]*>([\s\S]*?)<\/(?:\w+:)?cellXfs>/.exec(xml)?.[1] ?? "";
  return [...xfs.matchAll(/<(?:\w+:)?xf\b[^>]*>/g)].map((m) => {
    const id = Number(attr(m[0], "numFmtId") ?? 0);
    return custom.get(id) ?? BUILT_IN_FORMATS[id] ?? "General";
  });
}

/** True for a date or time format: d, m, y, h, s or b outside quoted text and [...] (the rule exceljs applies). */
function isDateFormat(format: string): boolean {
  return /[ymdhMsb]/.test(format.replace(/\[[^\]]*]/g, "").replace(/"[^"]*"/g, ""));
}

/** An Excel serial date as an ISO date (1900 system, or 1904 when the workbook says so). */
function serialToIso(serial: number, date1904: boolean): string {
  return new Date(Math.round((serial - 25569 + (date1904 ? 1462 : 0)) * 86400000)).toISOString();
}

function cachedValue(type: string | undefined, text: string | undefined, strings: readonly string[]): CellValue {
  if (text === undefined) return null;
  // An empty <v></v> (as openpyxl writes after a formula) is no cached value, not a cached 0; only text may be empty.
  if (text === "" && type !== "str" && type !== "inlineStr") return null;
  switch (type) {
    case "s":
      return strings[Number(text)] ?? null;
    case "str":
    case "inlineStr":
      return unescapeXml(text);
    case "b":
      return Number(text) !== 0;
    case "e":
      return unescapeXml(text);
    case "d":
      return unescapeXml(text);
    default: {
      const n = Number(text);
      return Number.isFinite(n) ? n : null;
    }
  }
}

/** Where a tag's name that starts at `from` ends: at white space, "/" or ">". */
function nameEnd(s: string, from: number): number {
  let i = from;
  for (; i < s.length; i++) {
    const c = s.charCodeAt(i);
    if (c === 62 || c === 47 || c <= 32) break;
  }
  return i;
}

/** True when the tag name s[from, to) is `local`, with or without a namespace prefix (x:c). */
function named(s: string, from: number, to: number, local: string): boolean {
  const n = local.length;
  if (to - from < n || !s.startsWith(local, to - n)) return false;
  return to - from === n || s.charCodeAt(to - n - 1) === 58;
}

/** The start of the closing tag of `local` at or after `from`, and the index after it; undefined when there is none. */
function closingTag(s: string, from: number, local: string): { start: number; end: number } | undefined {
  for (let k = s.indexOf("</", from); k >= 0; k = s.indexOf("</", k + 2)) {
    const ne = nameEnd(s, k + 2);
    if (!named(s, k + 2, ne, local)) continue;
    const gt = s.indexOf(">", ne);
    return gt < 0 ? undefined : { start: k, end: gt + 1 };
  }
  return undefined;
}

/** A cell's child element: its attribute text and its content (undefined when it closes itself). */
interface Child {
  attrs: string;
  content: string | undefined;
}

/** True for a plain address (A1, not $A$1 or a1): the stored reference is then the cell's address as it stands. */
function plainAddress(ref: string): boolean {
  let i = 0;
  while (i < ref.length && ref.charCodeAt(i) >= 65 && ref.charCodeAt(i) <= 90) i++;
  if (i === 0 || i === ref.length) return false;
  for (; i < ref.length; i++) if (ref.charCodeAt(i) < 48 || ref.charCodeAt(i) > 57) return false;
  return true;
}

/** Where the sheet's </sheetData> (any prefix) starts, -1 for none: found from the end, not by a pattern run over the whole sheet. */
function sheetDataEnd(xml: string): number {
  const name = xml.lastIndexOf("sheetData>");
  if (name < 0) return -1;
  const lt = xml.lastIndexOf("</", name);
  if (lt >= 0 && /^(\w+:)?$/.test(xml.slice(lt + 2, name))) return lt;
  return xml.search(/<\/(?:\w+:)?sheetData>/);
}

/**
 * One sheet's cells from its XML, read with a scanner of tags (indexOf, no pattern per cell): a
 * large sheet has tens of thousands of cells. Elements may carry a namespace prefix (x:c).
 */
function readSheet(name: string, xml: string, strings: readonly string[], formats: readonly string[], date1904: boolean): SheetModel {
  const cells = new Map<string, CellModel>();
  const shared = new Map<string, { formula: string; row: number; col: number }>();
  const start = xml.search(/<(?:\w+:)?sheetData\b/);
  const end = sheetDataEnd(xml);
  const data = start >= 0 ? xml.slice(start, end >= 0 ? end : xml.length) : "";
  let row = 0;
  let col = 0;
  let at = 0;
  for (;;) {
    const lt = data.indexOf("<", at);
    if (lt < 0) break;
    const ne = nameEnd(data, lt + 1);
    const gt = data.indexOf(">", ne);
    if (gt < 0) break;
    at = gt + 1;
    const selfClosing = data.charCodeAt(gt - 1) === 47;
    if (named(data, lt + 1, ne, "row")) {
      const r = attr(data.slice(ne, gt), "r");
      row = r ? Number(r) : row + 1;
      col = 0;
      continue;
    }
    if (!named(data, lt + 1, ne, "c")) continue;
    const tag = data.slice(ne, selfClosing ? gt - 1 : gt);
    const ref = attr(tag, "r");
    if (ref) {
      // The reference's column letters and row digits ($ signs passed over, either case).
      col = 0;
      row = 0;
      for (let i = 0; i < ref.length; i++) {
        const c = ref.charCodeAt(i);
        if (c >= 48 && c <= 57) row = row * 10 + (c - 48);
        else if (c !== 36) col = col * 26 + ((c | 32) - 96);
      }
    } else col++;
    const address = ref && plainAddress(ref) ? ref : addressOf(row, col);
    // The cell's children up to its closing tag: the first f, v and is of each.
    let f: Child | undefined;
    let v: string | undefined;
    let is: string | undefined;
    while (!selfClosing) {
      const lt2 = data.indexOf("<", at);
      if (lt2 < 0) {
        at = data.length;
        break;
      }
      if (data.charCodeAt(lt2 + 1) === 47) {
        const ne2 = nameEnd(data, lt2 + 2);
        const gt2 = data.indexOf(">", ne2);
        at = gt2 < 0 ? data.length : gt2 + 1;
        if (named(data, lt2 + 2, ne2, "c")) break;
        continue;
      }
      const ne2 = nameEnd(data, lt2 + 1);
      const gt2 = data.indexOf(">", ne2);
      if (gt2 < 0) {
        at = data.length;
        break;
      }
      at = gt2 + 1;
      const which = named(data, lt2 + 1, ne2, "f") ? "f" : named(data, lt2 + 1, ne2, "v") ? "v" : named(data, lt2 + 1, ne2, "is") ? "is" : undefined;
      if (!which) continue;
      const closes = data.charCodeAt(gt2 - 1) === 47;
      let content: string | undefined;
      if (!closes) {
        const close = closingTag(data, at, which);
        if (!close) continue;
        content = data.slice(at, close.start);
        at = close.end;
      }
      if (which === "f") f ??= { attrs: data.slice(ne2, closes ? gt2 - 1 : gt2), content };
      else if (which === "v") v ??= content;
      else is ??= content;
    }
    const type = attr(tag, "t");
    const styleIndex = attr(tag, "s");
    const format = styleIndex === undefined ? undefined : formats[Number(styleIndex)];
    let value: CellValue;
    if (type === "inlineStr") value = is === undefined ? cachedValue(type, v, strings) : textOf(is);
    else value = cachedValue(type, v, strings);
    if (typeof value === "number" && format && (type === undefined || type === "n") && isDateFormat(format)) value = serialToIso(value, date1904);
    const model: CellModel = { sheet: name, address, row, col, value };
    if (f) {
      const fTag = f.attrs;
      let formula = f.content === undefined ? "" : unescapeXml(f.content);
      const fType = attr(fTag, "t");
      if (fType === "shared") {
        const si = attr(fTag, "si") ?? "";
        if (formula.trim()) shared.set(si, { formula, row, col });
        else {
          const master = shared.get(si);
          if (master) formula = shiftFormula(master.formula, row - master.row, col - master.col);
        }
      }
      if (formula.trim()) model.formula = formula.charCodeAt(0) === 61 ? formula.slice(1) : formula;
      const range = fType === "array" ? attr(fTag, "ref") : undefined;
      if (range) model.arrayRef = range;
    }
    if (format && format !== "General") model.numFmt = format;
    if (value === null && !model.formula) continue;
    cells.set(cellKey(row, col), model);
  }
  // Merged areas come after the cells in a worksheet (the element order of ECMA-376 Part 1's CT_Worksheet): only that part is searched.
  mergedCells(name, end >= 0 ? xml.slice(end) : xml, cells);
  return { name, cells };
}

/** A merged area larger than this is left as it is, not written into every cell (as before with exceljs, which read the package with such merges taken out). */
const LARGE_MERGE = 100_000;

/** A merged area's other cells show its first cell's value, as Excel displays them. */
function mergedCells(name: string, xml: string, cells: Map<string, CellModel>): void {
  for (const m of xml.matchAll(/<(?:\w+:)?mergeCell\b[^>]*>/g)) {
    const ref = attr(m[0], "ref");
    if (!ref?.includes(":")) continue;
    const [a, b] = ref.split(":");
    const from = parseAddress(a);
    const to = parseAddress(b);
    if ((to.row - from.row + 1) * (to.col - from.col + 1) > LARGE_MERGE) continue;
    const master = cells.get(cellKey(from.row, from.col));
    if (!master || master.value === null) continue;
    for (let r = from.row; r <= to.row; r++) {
      for (let c = from.col; c <= to.col; c++) {
        if (r === from.row && c === from.col) continue;
        const key = cellKey(r, c);
        const own = cells.get(key);
        cells.set(key, { sheet: name, address: addressOf(r, c), row: r, col: c, value: master.value, ...(own?.numFmt ? { numFmt: own.numFmt } : {}) });
      }
    }
  }
}

/** The workbook model from its parts. */
export function modelFromParts(parts: WorkbookParts): WorkbookModel {
  const strings = sharedStrings(parts.sharedStringsXml);
  const formats = styleFormats(parts.stylesXml);
  const pr = /<(?:\w+:)?workbookPr\b[^>]*>/.exec(parts.workbookXml)?.[0] ?? "";
  const date1904 = /^(1|true)$/i.test(attr(pr, "date1904") ?? "");
  return { sheets: parts.sheets.map((s) => readSheet(s.name, s.xml, strings, formats, date1904)) };
}

/**
 * The forms a formula takes in a saved workbook, and the form people read.
 *
 * Excel stores a call of an add-in's custom function as `_xldudf_NAPPE_PUMP_HEAD(...)` (prefix,
 * dots turned into underscores), newer built-ins as `_xlfn.XLOOKUP(...)`, a spill reference
 * `B5#` as `_xlfn.ANCHORARRAY(B5)`, the implicit intersection `@x` as `_xlfn.SINGLE(x)` and
 * LET's names as `_xlpm.name`. LibreOffice keeps the case it was typed in (`nappe.head(`).
 * People read, and the reports show, the dotted form `NAPPE.PUMP.HEAD(...)`.
 *
 * Pure text work, no dependencies beyond the catalogue's ids: used by the headless engine, the
 * pane and the writers alike. Text inside "strings" and 'quoted sheet names' is never touched.
 */
import { CATALOG } from "../functions/catalog";
import type { DefinedName } from "./model";
import { columnLetters, columnNumber } from "./address";

/** The stored prefix of a custom function of an add-in. */
const UDF_PREFIX = "_xldudf_";

/** Upper-case underscore form ("PUMP_HEAD") → catalogue id ("PUMP.HEAD"). */
const ID_BY_STORED = new Map(CATALOG.map((s) => [s.id.replace(/\./g, "_"), s.id]));
const IDS = new Set(CATALOG.map((s) => s.id));

interface NameToken {
  /** The function name as written, without "(". */
  name: string;
  start: number;
  end: number;
}

const NAME_START = /[A-Za-z_]/;
const NAME_BEFORE = /[A-Za-z0-9_.!$]/;
const NONE: readonly NameToken[] = Object.freeze([]);

/**
 * The function names of formulas seen lately: a recalculation asks about each formula several
 * times (is it NAPPE, another add-in's, unknown; its stored and displayed forms). Bounded.
 */
const scanned = new Map<string, readonly NameToken[]>();

/** Splits a formula into the parts outside strings and quoted sheet names, and finds function names. */
function functionNames(formula: string): readonly NameToken[] {
  if (!formula.includes("(")) return NONE; // no call at all: most plain formulas
  const hit = scanned.get(formula);
  if (hit) return hit;
  const out: NameToken[] = [];
  const re = /[A-Za-z_][A-Za-z0-9_.]*(?=\s*\()/y;
  const word = /[A-Za-z0-9_.]+/y;
  for (let i = 0; i < formula.length; ) {
    const ch = formula[i];
    if (ch === '"' || ch === "'") {
      // Skip a string or quoted sheet name; a doubled quote is an escaped one.
      let j = i + 1;
      while (j < formula.length && !(formula[j] === ch && formula[j + 1] !== ch)) j += formula[j] === ch ? 2 : 1;
      i = j + 1;
      continue;
    }
    if (NAME_START.test(ch) && !(i > 0 && NAME_BEFORE.test(formula[i - 1]))) {
      re.lastIndex = i;
      const m = re.exec(formula);
      if (m) {
        out.push({ name: m[0], start: i, end: i + m[0].length });
        i += m[0].length;
        continue;
      }
      word.lastIndex = i;
      i += word.exec(formula)?.[0].length ?? 1;
      continue;
    }
    i++;
  }
  if (scanned.size >= 20000) scanned.clear();
  scanned.set(formula, out);
  return out;
}

/** What a function name as written means for Nappe. */
type NameKind = { kind: "nappe"; id: string } | { kind: "unknown-nappe"; written: string } | { kind: "other-addin"; written: string } | { kind: "other" };

/** Classifies a function name: a NAPPE call in either form, another add-in's function, or anything else. */
function classifyName(name: string): NameKind {
  const upper = name.toUpperCase();
  if (upper.startsWith("_XLDUDF_")) {
    const rest = upper.slice(UDF_PREFIX.length);
    if (!rest.startsWith("NAPPE_")) return { kind: "other-addin", written: name };
    const id = ID_BY_STORED.get(rest.slice("NAPPE_".length));
    return id ? { kind: "nappe", id } : { kind: "unknown-nappe", written: name };
  }
  if (upper.startsWith("NAPPE.")) {
    const id = upper.slice("NAPPE.".length);
    return IDS.has(id) ? { kind: "nappe", id } : { kind: "unknown-nappe", written: name };
  }
  return { kind: "other" };
}

/** The dotted name people read ("NAPPE.PUMP.HEAD") for either form, or undefined when not a NAPPE call. */
export function dottedName(name: string): string | undefined {
  const c = classifyName(name);
  if (c.kind === "nappe") return `NAPPE.${c.id}`;
  if (c.kind === "unknown-nappe") {
    const upper = c.written.toUpperCase();
    return upper.startsWith("_XLDUDF_") ? `NAPPE.${upper.slice("_XLDUDF_NAPPE_".length).replace(/_/g, ".")}` : upper;
  }
  return undefined;
}

/**
 * False when no name in the formula can be a NAPPE call or another add-in's (neither "NAPPE." nor
 * "_xldudf_" appears, in any case): most plain formulas, answered without scanning their names.
 */
function mayCallAddin(formula: string): boolean {
  return /nappe\.|_xldudf_/i.test(formula);
}

/** True when the formula calls a NAPPE function, in either form and any case. */
export function hasNappeCall(formula: string): boolean {
  if (!mayCallAddin(formula)) return false;
  return functionNames(formula).some((t) => classifyName(t.name).kind.endsWith("nappe"));
}

/** The names of other add-ins' custom functions the formula calls (as people read them). */
export function otherAddinFunctions(formula: string): string[] {
  if (!mayCallAddin(formula)) return [];
  return functionNames(formula)
    .map((t) => classifyName(t.name))
    .flatMap((c) => (c.kind === "other-addin" ? [c.written.slice(UDF_PREFIX.length)] : []));
}

/** The NAPPE names the formula uses that the catalogue does not know, as written. */
export function unknownNappeFunctions(formula: string): string[] {
  if (!mayCallAddin(formula)) return [];
  return functionNames(formula).flatMap((t) => {
    const c = classifyName(t.name);
    return c.kind === "unknown-nappe" ? [c.written] : [];
  });
}

function replaceNames(formula: string, rename: (t: NameToken) => string | undefined): string {
  let out = "";
  let at = 0;
  for (const t of functionNames(formula)) {
    const name = rename(t);
    if (name === undefined) continue;
    out += formula.slice(at, t.start) + name;
    at = t.end;
  }
  return out + formula.slice(at);
}

/** Index of the bracket closing the one opened just before `from`, outside strings. */
function closingBracket(formula: string, from: number): number {
  let depth = 1;
  for (let i = from; i < formula.length; i++) {
    const ch = formula[i];
    if (ch === '"' || ch === "'") {
      let j = i + 1;
      while (j < formula.length && !(formula[j] === ch && formula[j + 1] !== ch)) j += formula[j] === ch ? 2 : 1;
      i = j;
    } else if (ch === "(") depth++;
    else if (ch === ")" && --depth === 0) return i;
  }
  return -1;
}

/**
 * The formula as people read it: `NAPPE.X(...)` for either stored form, `_xlfn.` and `_xlpm.`
 * dropped, `_xlfn.ANCHORARRAY(B5)` as `B5#` and `_xlfn.SINGLE(x)` as `@x`.
 */
export function displayFormula(formula: string): string {
  // Nothing to rewrite without an add-in call or an _xlfn./_xlpm. prefix.
  if (!/nappe\.|_xl|anchorarray|single\s*\(/i.test(formula)) return formula;
  let text = replaceNames(formula, (t) => {
    const dotted = dottedName(t.name);
    if (dotted) return dotted;
    if (/^_xlfn\./i.test(t.name)) return t.name.slice(6);
    return undefined;
  });
  // Spill references and implicit intersection, innermost first.
  for (let guard = 0; guard < 1000; guard++) {
    const m = functionNames(text).find((t) => /^(ANCHORARRAY|SINGLE)$/i.test(t.name));
    if (!m) break;
    const open = text.indexOf("(", m.end);
    const close = closingBracket(text, open + 1);
    if (close < 0) break;
    const inner = text.slice(open + 1, close).trim();
    const simple = /^[A-Za-z0-9_$!.':]+$/.test(inner);
    const shown = /^ANCHORARRAY$/i.test(m.name) ? `${simple ? inner : `(${inner})`}#` : `@${simple ? inner : `(${inner})`}`;
    text = text.slice(0, m.start) + shown + text.slice(close + 1);
  }
  return text.replace(/(?<![A-Za-z0-9_])_xlpm\./gi, "");
}

/** The formula as Excel stores it: every NAPPE call as `_xldudf_NAPPE_X_Y(...)`. */
export function storedFormula(formula: string): string {
  return replaceNames(formula, (t) => {
    const c = classifyName(t.name);
    return c.kind === "nappe" ? `${UDF_PREFIX}NAPPE_${c.id.replace(/\./g, "_")}` : undefined;
  });
}

/** The stored ids (`_xldudf_NAPPE_HEADLOSS`, ...) of the NAPPE functions a formula calls, in order, once each. */
export function storedIds(formula: string): string[] {
  const ids = functionNames(formula).flatMap((t) => {
    const c = classifyName(t.name);
    return c.kind === "nappe" ? [`${UDF_PREFIX}NAPPE_${c.id.replace(/\./g, "_")}`] : [];
  });
  return [...new Set(ids)];
}

/** Splits the text between brackets into its top-level arguments (outside strings and nested brackets). */
function topLevelArgs(text: string): string[] {
  const args: string[] = [];
  let depth = 0;
  let start = 0;
  for (let i = 0; i < text.length; i++) {
    const ch = text[i];
    if (ch === '"' || ch === "'") {
      let j = i + 1;
      while (j < text.length && !(text[j] === ch && text[j + 1] !== ch)) j += text[j] === ch ? 2 : 1;
      i = j;
    } else if (ch === "(" || ch === "{") depth++;
    else if (ch === ")" || ch === "}") depth--;
    else if (ch === "," && depth === 0) {
      args.push(text.slice(start, i));
      start = i + 1;
    }
  }
  args.push(text.slice(start));
  return args;
}

/** Replaces a LET name (`_xlpm.x` or plain `x`) with `(expr)` outside strings. */
function substituteName(text: string, name: string, expr: string): string {
  const bare = name.replace(/^_xlpm\./i, "");
  const pattern = new RegExp(`(?<![A-Za-z0-9_.!$])(?:_xlpm\\.)?${bare.replace(/[.?]/g, "\\$&")}(?![A-Za-z0-9_.(!])`, "gi");
  let out = "";
  let at = 0;
  for (let i = 0; i < text.length; i++) {
    const ch = text[i];
    if (ch === '"' || ch === "'") {
      out += text.slice(at, i).replace(pattern, `(${expr})`);
      let j = i + 1;
      while (j < text.length && !(text[j] === ch && text[j + 1] !== ch)) j += text[j] === ch ? 2 : 1;
      out += text.slice(i, j + 1);
      at = j + 1;
      i = j;
    }
  }
  return out + text.slice(at).replace(pattern, `(${expr})`);
}

/**
 * LET written out: `LET(x, 2, y, x+1, x*y)` becomes `((2))*(((2)+1))`, each name replaced by its
 * bracketed expression (formulas have no side effects, so this computes the same value). Throws
 * an Error naming the problem when a LET is malformed.
 */
export function expandLet(formula: string): string {
  let text = formula;
  for (let guard = 0; guard < 1000; guard++) {
    const m = functionNames(text).find((t) => /^(_xlfn\.)?LET$/i.test(t.name));
    if (!m) return text;
    const open = text.indexOf("(", m.end);
    const close = closingBracket(text, open + 1);
    if (close < 0) throw new Error("LET has no closing bracket");
    const args = topLevelArgs(text.slice(open + 1, close));
    if (args.length < 3 || args.length % 2 === 0) throw new Error("LET needs name, value pairs and then a calculation");
    let body = args[args.length - 1];
    const pairs: [string, string][] = [];
    for (let i = 0; i < args.length - 1; i += 2) pairs.push([args[i].trim(), args[i + 1]]);
    // Later values may use earlier names: each name goes into the pairs after it and the body.
    for (let i = 0; i < pairs.length; i++) {
      const [name, expr] = pairs[i];
      if (!/^(_xlpm\.)?[A-Za-z_][A-Za-z0-9_.]*$/i.test(name)) throw new Error(`LET name "${name}" is not a name`);
      body = substituteName(body, name, expr.trim());
      for (let j = i + 1; j < pairs.length; j++) pairs[j][1] = substituteName(pairs[j][1], name, expr.trim());
    }
    text = `${text.slice(0, m.start)}(${body.trim()})${text.slice(close + 1)}`;
  }
  return text;
}

/** Calls `visit` on each stretch of the formula outside strings and quoted sheet names; joins what it returns. */
function mapOutsideQuotes(formula: string, visit: (text: string) => string): string {
  let out = "";
  let at = 0;
  for (let i = 0; i < formula.length; i++) {
    const ch = formula[i];
    if (ch === '"' || ch === "'") {
      out += visit(formula.slice(at, i));
      let j = i + 1;
      while (j < formula.length && !(formula[j] === ch && formula[j + 1] !== ch)) j += formula[j] === ch ? 2 : 1;
      // A quoted sheet name may carry an external link: '[1]Prices'!A1.
      out += formula.slice(i, j + 1);
      at = j + 1;
      i = j;
    }
  }
  return out + visit(formula.slice(at));
}

/**
 * A shared formula written out at another cell (ECMA-376 §18.3.1.40): each relative part of a
 * reference (A1, A:A, 1:1) moves by `rows` and `cols`, $-anchored parts stay; strings, quoted
 * sheet names and bracketed parts ([1], table columns) are left alone. A reference moved off the
 * sheet becomes #REF!.
 */
export function shiftFormula(formula: string, rows: number, cols: number): string {
  if (!rows && !cols) return formula;
  const row = (anchor: string, r: string) => {
    const n = anchor ? Number(r) : Number(r) + rows;
    return n >= 1 ? `${anchor}${n}` : undefined;
  };
  const col = (anchor: string, c: string) => {
    const n = anchor ? columnNumber(c) : columnNumber(c) + cols;
    return n >= 1 ? `${anchor}${columnLetters(n)}` : undefined;
  };
  const pattern =
    /(\[[^\]]*\])|(?<![A-Za-z0-9_.\\$])(\$?)([A-Za-z]{1,3})(\$?)([1-9]\d*)(?![A-Za-z0-9_.(!\[])|(?<![A-Za-z0-9_.\\$])(\$?)([A-Za-z]{1,3}):(\$?)([A-Za-z]{1,3})(?![A-Za-z0-9_.(!\[])|(?<![A-Za-z0-9_.\\$:])(\$?)(\d+):(\$?)(\d+)(?![A-Za-z0-9_.:])/g;
  return mapOutsideQuotes(formula, (part) =>
    part.replace(pattern, (whole, bracket, ca, cl, ra, rn, c1a, c1, c2a, c2, r1a, r1, r2a, r2) => {
      if (bracket) return whole;
      if (cl !== undefined) {
        const c = col(ca, cl);
        const r = row(ra, rn);
        return c && r ? `${c}${r}` : "#REF!";
      }
      if (c1 !== undefined) {
        const a = col(c1a, c1);
        const b = col(c2a, c2);
        return a && b ? `${a}:${b}` : "#REF!";
      }
      const a = row(r1a, r1);
      const b = row(r2a, r2);
      return a && b ? `${a}:${b}` : "#REF!";
    }),
  );
}

/**
 * Defined names written out: each name (not a function, sheet or cell) that `lookup` knows is
 * replaced by what it refers to, bracketed unless it is a plain reference.
 */
function substituteNames(formula: string, lookup: (name: string) => string | undefined): string {
  let text = formula;
  // Names may refer to other names: a few rounds, never a loop.
  for (let round = 0; round < 8; round++) {
    const next = mapOutsideQuotes(text, (part) =>
      part.replace(/(?<![A-Za-z0-9_.!$:\]\\])([A-Za-z_\\][A-Za-z0-9_.?\\]*)(?![A-Za-z0-9_.?\\(!])/g, (whole, name: string) => {
        if (/^(TRUE|FALSE)$/i.test(name) || /^\$?[A-Za-z]{1,3}\$?\d+$/.test(name)) return whole;
        const to = lookup(name);
        if (to === undefined) return whole;
        return /^('[^']+'|[A-Za-z0-9_.]+)?!?\$?[A-Za-z]{1,3}\$?\d+(:\$?[A-Za-z]{1,3}\$?\d+)?$/.test(to) ? to : `(${to})`;
      }),
    );
    if (next === text) return text;
    text = next;
  }
  return text;
}

/** The external workbooks a formula reads, by their index ([1]Sheet1!A1 → 1). */
export function externalLinkIndexes(formula: string): number[] {
  if (!formula.includes("[")) return [];
  const found = new Set<number>();
  let i = 0;
  while (i < formula.length) {
    const ch = formula[i];
    if (ch === '"') {
      let j = i + 1;
      while (j < formula.length && !(formula[j] === ch && formula[j + 1] !== ch)) j += formula[j] === ch ? 2 : 1;
      i = j + 1;
      continue;
    }
    const m = /^\[(\d+)\]/.exec(formula.slice(i, i + 12));
    if (m) found.add(Number(m[1]));
    i++;
  }
  return [...found];
}

/** The formula with the defined names it uses written out, a sheet's own name before the workbook's. */
export function resolveNames(formula: string, sheet: string, names: readonly DefinedName[]): string {
  if (!names.length) return formula;
  return substituteNames(formula, (name) => {
    const lower = name.toLowerCase();
    return (names.find((n) => n.name.toLowerCase() === lower && n.sheet === sheet) ?? names.find((n) => n.name.toLowerCase() === lower && !n.sheet))?.refersTo;
  });
}

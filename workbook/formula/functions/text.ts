/**
 * Text functions, each written from its page in Microsoft's Excel function reference ("Text
 * functions (reference)"). Positions count characters from 1; FIND is case-sensitive, SEARCH
 * is not and takes wildcards.
 */
import type { Ctx } from "../evaluate";
import { err, FormulaError, numberFromText, type Scalar, type Value } from "../values";
import { bool, def, type Defs, eachValue, num, optNum, text, wildcard } from "./_lib";
import { formatValue } from "./numberFormat";
import { roundDigits } from "./math";
import { dateSerialFromText } from "./date";

function position(v: Value, name: string, min = 1): number {
  const n = Math.trunc(num(v));
  if (n < min) throw err("#VALUE!", `${name}: a position or count below ${min}`);
  return n;
}

/** Text to a number as VALUE reads it: numbers with separators, %, a leading $, dates and times. */
function valueOfText(s: string): number | undefined {
  const t = s.trim();
  const plain = numberFromText(t.replace(/^\$/, "").replace(/^(-?)\$/, "$1"));
  if (plain !== undefined) return plain;
  const paren = /^\((.*)\)$/.exec(t);
  if (paren) {
    const inner = numberFromText(paren[1].replace(/^\$/, ""));
    if (inner !== undefined) return -inner;
  }
  return dateSerialFromText(t);
}

function fixed(x: number, decimals: number, commas: boolean): string {
  const d = Math.trunc(decimals);
  const r = roundDigits(x, d);
  const s = Math.abs(r).toFixed(Math.max(0, Math.min(d, 127)));
  const [i, f] = s.split(".");
  const int = commas ? i.replace(/\B(?=(\d{3})+(?!\d))/g, ",") : i;
  return `${r < 0 ? "-" : ""}${int}${f ? `.${f}` : ""}`;
}

function joinAll(args: Value[], c: Ctx): string[] {
  const parts: string[] = [];
  for (const a of args) {
    if (a === null) {
      parts.push("");
      continue;
    }
    eachValue(a, c, (x) => {
      if (x instanceof FormulaError) throw x;
      parts.push(text(x));
    });
  }
  return parts;
}

export const TEXT: Defs = {
  CHAR: def(1, 1, "s", ([n]) => {
    const k = Math.trunc(num(n));
    return k < 1 || k > 255 ? err("#VALUE!", "CHAR takes 1 to 255") : String.fromCharCode(k);
  }),
  CLEAN: def(1, 1, "s", ([t]) => text(t).replace(/[\x00-\x1f]/g, "")),
  CODE: def(1, 1, "s", ([t]) => {
    const s = text(t);
    return s.length ? s.charCodeAt(0) : err("#VALUE!", "CODE of an empty text");
  }),
  CONCAT: def(1, 253, "v", (args, c) => joinAll(args, c).join("")),
  CONCATENATE: def(1, 255, "s", (args) => args.map((a) => text(a)).join("")),
  DOLLAR: def(1, 2, "s", (args) => {
    const d = optNum(args, 1, 2);
    const s = fixed(num(args[0]), d, true);
    return s.startsWith("-") ? `-$${s.slice(1)}` : `$${s}`;
  }),
  EXACT: def(2, 2, "s", ([a, b]) => text(a) === text(b)),
  FIND: def(2, 3, "s", (args) => {
    const what = text(args[0]);
    const within = text(args[1]);
    const start = args.length > 2 && args[2] !== null ? position(args[2], "FIND") : 1;
    if (start > within.length + 1) return err("#VALUE!", "FIND: start_num is beyond the text");
    const i = within.indexOf(what, start - 1);
    return i < 0 ? err("#VALUE!", `FIND: "${what}" is not in the text`) : i + 1;
  }),
  FIXED: def(1, 3, "s", (args) => fixed(num(args[0]), optNum(args, 1, 2), !(args.length > 2 && args[2] !== null && bool(args[2])))),
  LEFT: def(1, 2, "s", (args) => text(args[0]).slice(0, args.length > 1 && args[1] !== null ? position(args[1], "LEFT", 0) : 1)),
  LEN: def(1, 1, "s", ([t]) => text(t).length),
  LOWER: def(1, 1, "s", ([t]) => text(t).toLowerCase()),
  MID: def(3, 3, "s", (args) => {
    const s = text(args[0]);
    const start = position(args[1], "MID");
    const n = position(args[2], "MID", 0);
    return s.slice(start - 1, start - 1 + n);
  }),
  NUMBERVALUE: def(1, 3, "s", (args) => {
    let s = text(args[0]).replace(/\s+/g, "");
    const dec = args.length > 1 && args[1] !== null ? text(args[1])[0] ?? "." : ".";
    const grp = args.length > 2 && args[2] !== null ? text(args[2])[0] ?? "," : ",";
    if (!s) return 0;
    const decAt = s.indexOf(dec);
    const intPart = (decAt < 0 ? s : s.slice(0, decAt)).split(grp).join("");
    const fracPart = decAt < 0 ? "" : s.slice(decAt + 1);
    if (fracPart.includes(grp) || fracPart.includes(dec)) return err("#VALUE!", "NUMBERVALUE: a separator after the decimal separator");
    s = fracPart ? `${intPart}.${fracPart}` : intPart;
    let pct = 0;
    while (s.endsWith("%")) {
      s = s.slice(0, -1);
      pct++;
    }
    const n = numberFromText(s);
    return n === undefined ? err("#VALUE!", `NUMBERVALUE: "${text(args[0])}" is not a number`) : n / 100 ** pct;
  }),
  PROPER: def(1, 1, "s", ([t]) => text(t).toLowerCase().replace(/(^|[^a-z\u00C0-\u024F])([a-z\u00C0-\u024F])/g, (_, a: string, b: string) => a + b.toUpperCase())),
  REPLACE: def(4, 4, "s", (args) => {
    const s = text(args[0]);
    const start = position(args[1], "REPLACE");
    const n = position(args[2], "REPLACE", 0);
    return s.slice(0, start - 1) + text(args[3]) + s.slice(start - 1 + n);
  }),
  REPT: def(2, 2, "s", (args) => {
    const n = Math.trunc(num(args[1]));
    const s = text(args[0]);
    if (n < 0 || s.length * n > 32767) return err("#VALUE!", "REPT: a count below 0 or a text longer than 32 767 characters");
    return s.repeat(n);
  }),
  RIGHT: def(1, 2, "s", (args) => {
    const s = text(args[0]);
    const n = args.length > 1 && args[1] !== null ? position(args[1], "RIGHT", 0) : 1;
    return n === 0 ? "" : s.slice(-n);
  }),
  SEARCH: def(2, 3, "s", (args) => {
    const what = text(args[0]);
    const within = text(args[1]);
    const start = args.length > 2 && args[2] !== null ? position(args[2], "SEARCH") : 1;
    if (start > within.length + 1) return err("#VALUE!", "SEARCH: start_num is beyond the text");
    const re = wildcard(what);
    const pattern = new RegExp(re.source.slice(1, -1), "i");
    const m = pattern.exec(within.slice(start - 1));
    return m ? m.index + start : err("#VALUE!", `SEARCH: "${what}" is not in the text`);
  }),
  SUBSTITUTE: def(3, 4, "s", (args) => {
    const s = text(args[0]);
    const from = text(args[1]);
    const to = text(args[2]);
    if (!from) return s;
    if (args.length < 4 || args[3] === null) return s.split(from).join(to);
    const k = position(args[3], "SUBSTITUTE");
    let at = -1;
    for (let i = 0; i < k; i++) {
      at = s.indexOf(from, at + 1);
      if (at < 0) return s;
    }
    return s.slice(0, at) + to + s.slice(at + from.length);
  }),
  T: def(1, 1, "S", ([v]) => (v instanceof FormulaError ? v : typeof v === "string" ? v : "")),
  TEXT: def(2, 2, "s", (args) => {
    const v = args[0] as Scalar;
    const format = text(args[1]);
    if (typeof v === "boolean") return v ? "TRUE" : "FALSE";
    let x: number | string = v === null ? 0 : (v as number | string);
    if (typeof x === "string") {
      const n = valueOfText(x);
      if (n !== undefined) x = n;
    }
    return formatValue(x, format);
  }),
  TEXTJOIN: def(3, 252, "vsv", (args, c) => {
    const delimiters: string[] = [];
    eachValue(args[0], c, (x) => {
      if (x instanceof FormulaError) throw x;
      delimiters.push(text(x));
    });
    const skipEmpty = bool(args[1]);
    const parts = joinAll(args.slice(2), c).filter((p) => !skipEmpty || p !== "");
    let out = "";
    parts.forEach((p, i) => {
      if (i) out += delimiters.length ? delimiters[(i - 1) % delimiters.length] : "";
      out += p;
    });
    return out.length > 32767 ? err("#VALUE!", "TEXTJOIN: the result is longer than 32 767 characters") : out;
  }),
  TRIM: def(1, 1, "s", ([t]) => text(t).replace(/ +/g, " ").trim().replace(/^ +| +$/g, "")),
  UNICHAR: def(1, 1, "s", ([n]) => {
    const k = Math.trunc(num(n));
    return k < 1 || k > 0x10ffff ? err("#VALUE!", "UNICHAR takes 1 to 1114111") : String.fromCodePoint(k);
  }),
  UNICODE: def(1, 1, "s", ([t]) => {
    const s = text(t);
    return s.length ? s.codePointAt(0)! : err("#VALUE!", "UNICODE of an empty text");
  }),
  UPPER: def(1, 1, "s", ([t]) => text(t).toUpperCase()),
  VALUE: def(1, 1, "s", ([v]) => {
    if (typeof v === "number") return v;
    if (typeof v === "boolean") return err("#VALUE!", "VALUE of a logical");
    const n = valueOfText(text(v));
    return n === undefined ? err("#VALUE!", `VALUE: "${text(v)}" is not a number`) : n;
  }),
};

/**
 * Excel's number format codes, for TEXT: written from Microsoft's "Number format codes" and
 * "Review guidelines for customizing a number format" pages and ECMA-376 Part 1 §18.8.31.
 * Sections (positive;negative;zero;text), conditions ([>=100]), colours (ignored), currency
 * blocks ([$€-407]), quoted and escaped literals, 0 # ? placeholders, the decimal point,
 * thousands separators and scaling commas, %, scientific E+/E-, @, General, and dates and times
 * (y m d h s, AM/PM, [h] [m] [s], fractions of seconds). Fraction formats (# ?/?) are refused.
 */
import { roundDigits } from "./math";
import { err, FormulaError, generalNumber } from "../values";
import { dateParts } from "../serial";

type Tok = { t: "lit"; s: string } | { t: "ph"; c: "0" | "#" | "?" } | { t: "dot" } | { t: "comma" } | { t: "pct" } | { t: "exp"; sign: "+" | "-" } | { t: "at" } | { t: "date"; s: string } | { t: "ampm"; s: string } | { t: "elapsed"; s: string };

function splitSections(format: string): string[] {
  const out: string[] = [];
  let cur = "";
  for (let i = 0; i < format.length; i++) {
    const ch = format[i];
    if (ch === '"') {
      const j = format.indexOf('"', i + 1);
      const end = j < 0 ? format.length : j;
      cur += format.slice(i, end + 1);
      i = end;
    } else if (ch === "\\") {
      cur += format.slice(i, i + 2);
      i++;
    } else if (ch === ";") {
      out.push(cur);
      cur = "";
    } else cur += ch;
  }
  out.push(cur);
  return out;
}

interface Section {
  toks: Tok[];
  condition?: { op: string; value: number };
  isDate: boolean;
  hasNumber: boolean;
}

function tokenizeSection(src: string): Section {
  const toks: Tok[] = [];
  let condition: Section["condition"];
  let i = 0;
  const lit = (s: string) => {
    const last = toks[toks.length - 1];
    if (last && last.t === "lit") last.s += s;
    else toks.push({ t: "lit", s });
  };
  while (i < src.length) {
    const ch = src[i];
    const rest = src.slice(i);
    if (ch === '"') {
      const j = src.indexOf('"', i + 1);
      lit(src.slice(i + 1, j < 0 ? src.length : j));
      i = j < 0 ? src.length : j + 1;
    } else if (ch === "\\") {
      lit(src[i + 1] ?? "");
      i += 2;
    } else if (ch === "_") {
      lit(" ");
      i += 2;
    } else if (ch === "*") {
      i += 2;
    } else if (ch === "[") {
      const j = src.indexOf("]", i);
      const inner = src.slice(i + 1, j < 0 ? src.length : j);
      i = j < 0 ? src.length : j + 1;
      const cond = /^(<=|>=|<>|<|>|=)\s*(-?[\d.]+(?:[eE][+-]?\d+)?)$/.exec(inner);
      if (cond) condition = { op: cond[1], value: Number(cond[2]) };
      else if (inner.startsWith("$")) lit(inner.slice(1).split("-")[0]);
      else if (/^(h+|m+|s+)$/i.test(inner)) toks.push({ t: "elapsed", s: inner.toLowerCase() });
      // colours and locale codes are not shown
    } else if (/^(AM\/PM|A\/P)/i.test(rest)) {
      const m = /^(AM\/PM|A\/P)/i.exec(rest)![0];
      toks.push({ t: "ampm", s: m });
      i += m.length;
    } else if (/^(general)/i.test(rest)) {
      toks.push({ t: "lit", s: "\u0000GENERAL" });
      i += 7;
    } else if (ch === "0" || ch === "#" || ch === "?") {
      toks.push({ t: "ph", c: ch });
      i++;
    } else if (ch === ".") {
      toks.push({ t: "dot" });
      i++;
    } else if (ch === ",") {
      toks.push({ t: "comma" });
      i++;
    } else if (ch === "%") {
      toks.push({ t: "pct" });
      i++;
    } else if ((ch === "E" || ch === "e") && (src[i + 1] === "+" || src[i + 1] === "-")) {
      toks.push({ t: "exp", sign: src[i + 1] as "+" | "-" });
      i += 2;
    } else if (ch === "@") {
      toks.push({ t: "at" });
      i++;
    } else if (/[ymdhsYMDHS]/.test(ch)) {
      let j = i;
      while (j < src.length && src[j].toLowerCase() === ch.toLowerCase()) j++;
      toks.push({ t: "date", s: src.slice(i, j).toLowerCase() });
      i = j;
    } else if (ch === "/" && toks.some((t) => t.t === "ph") && /[0-9#?]/.test(src[i + 1] ?? "")) {
      throw err("#VALUE!", "TEXT: fraction formats (# ?/?) are not supported");
    } else {
      lit(ch);
      i++;
    }
  }
  const isDate = toks.some((t) => t.t === "date" || t.t === "ampm" || t.t === "elapsed");
  return { toks, condition, isDate, hasNumber: toks.some((t) => t.t === "ph") };
}

function group(digits: string): string {
  return digits.replace(/\B(?=(\d{3})+(?!\d))/g, ",");
}

function formatNumberSection(x: number, s: Section, showMinus: boolean): string {
  const toks = s.toks;
  if (toks.some((t) => t.t === "lit" && t.s === "\u0000GENERAL")) {
    return toks.map((t) => (t.t === "lit" ? (t.s === "\u0000GENERAL" ? generalNumber(showMinus ? x : Math.abs(x)) : t.s) : "")).join("");
  }
  const dotAt = toks.findIndex((t) => t.t === "dot");
  const expAt = toks.findIndex((t) => t.t === "exp");
  const intEnd = dotAt >= 0 ? dotAt : expAt >= 0 ? expAt : toks.length;
  let lastIntPh = -1;
  for (let k = 0; k < intEnd; k++) if (toks[k].t === "ph") lastIntPh = k;
  let firstIntPh = toks.findIndex((t, k) => k < intEnd && t.t === "ph");
  // Commas right after the last integer placeholder scale by 1000 each; between placeholders they group.
  let scale = 0;
  let grouping = false;
  toks.forEach((t, k) => {
    if (t.t !== "comma") return;
    let j = k + 1;
    while (j < toks.length && toks[j].t === "comma") j++;
    const followedByPh = j < intEnd && toks.slice(j, intEnd).some((u) => u.t === "ph");
    if (k > firstIntPh && firstIntPh >= 0 && followedByPh && k < intEnd) grouping = true;
    else if (k > lastIntPh && lastIntPh >= 0 && (k < intEnd || dotAt < 0)) scale++;
  });
  let v = Math.abs(x);
  v /= 1000 ** scale;
  v *= 100 ** toks.filter((t) => t.t === "pct").length;
  const decEnd = expAt >= 0 ? expAt : toks.length;
  const decPh = dotAt >= 0 ? toks.slice(dotAt + 1, decEnd).filter((t) => t.t === "ph") as { t: "ph"; c: string }[] : [];
  let exponent = 0;
  if (expAt >= 0) {
    const intPhCount = toks.slice(0, intEnd).filter((t) => t.t === "ph").length || 1;
    if (v !== 0) {
      exponent = Math.floor(Math.log10(v));
      // Engineering style when the integer part has several placeholders (##0.0E+0): exponent a multiple of their count.
      if (intPhCount > 1 && toks.slice(0, intEnd).some((t) => t.t === "ph" && t.c === "#")) exponent = Math.floor(exponent / intPhCount) * intPhCount;
      else exponent -= intPhCount - 1;
      v /= 10 ** exponent;
      const r = roundDigits(v, decPh.length);
      if (r >= 10 ** (toks.slice(0, intEnd).filter((t) => t.t === "ph").length || 1)) {
        v = r / 10;
        exponent += 1;
      }
    }
  }
  const rounded = roundDigits(v, decPh.length);
  const fixed = rounded.toFixed(decPh.length);
  let [intDigits, decDigits = ""] = fixed.split(".");
  if (intDigits === "0") intDigits = "";
  // Decimal digits: trailing zeros under # dropped, under ? shown as spaces.
  let decOut = "";
  for (let k = 0; k < decPh.length; k++) decOut += decDigits[k];
  for (let k = decPh.length - 1; k >= 0 && decOut[k] === "0"; k--) {
    if (decPh[k].c === "0") break;
    decOut = decOut.slice(0, k) + (decPh[k].c === "?" ? " " : "") + decOut.slice(k + 1);
  }
  // Integer placeholders filled from the right; extra digits go before the first.
  const intToks = toks.slice(0, intEnd);
  const intPhs = intToks.filter((t) => t.t === "ph") as { t: "ph"; c: string }[];
  const digits = intDigits.split("");
  const filled: string[] = new Array(intPhs.length).fill("");
  for (let k = intPhs.length - 1, d = digits.length - 1; k >= 0; k--, d--) {
    if (d >= 0) filled[k] = digits[d];
    else filled[k] = intPhs[k].c === "0" ? "0" : intPhs[k].c === "?" ? " " : "";
  }
  const extra = digits.slice(0, Math.max(0, digits.length - intPhs.length)).join("");
  let intOut = "";
  let phIndex = 0;
  for (const t of intToks) {
    if (t.t === "ph") {
      if (phIndex === 0) intOut += extra;
      intOut += filled[phIndex++];
    } else if (t.t === "lit") intOut += t.s;
    else if (t.t === "pct") intOut += "%";
  }
  if (grouping) {
    // Group the digit run (placeholders), keeping literal text around it.
    intOut = intOut.replace(/\d+/, (d) => group(d));
  }
  let out = intOut;
  if (dotAt >= 0) {
    let decIndex = 0;
    out += ".";
    for (const t of toks.slice(dotAt + 1, decEnd)) {
      if (t.t === "ph") out += decOut[decIndex++] ?? "";
      else if (t.t === "lit") out += t.s;
      else if (t.t === "pct") out += "%";
    }
  }
  if (expAt >= 0) {
    const expToks = toks.slice(expAt + 1);
    const expPh = expToks.filter((t) => t.t === "ph").length;
    const sign = exponent < 0 ? "-" : (toks[expAt] as { sign: string }).sign === "+" ? "+" : "";
    out += `E${sign}${String(Math.abs(exponent)).padStart(expPh, "0")}`;
    for (const t of expToks) if (t.t === "lit") out += t.s;
  }
  const negative = x < 0 && rounded !== 0;
  return (showMinus && negative ? "-" : "") + out;
}

const MONTHS = ["January", "February", "March", "April", "May", "June", "July", "August", "September", "October", "November", "December"];
const DAYS = ["Sunday", "Monday", "Tuesday", "Wednesday", "Thursday", "Friday", "Saturday"];

function formatDateSection(x: number, s: Section): string {
  if (x < 0) throw err("#VALUE!", "TEXT: a negative number is not a date or time");
  const hasFraction = s.toks.find((t) => t.t === "lit" && /^\./.test(t.s));
  void hasFraction;
  const totalSeconds = Math.round(x * 86400 * 1000) / 1000;
  const wholeSeconds = Math.floor(totalSeconds + 1e-9);
  const { y, m, d, wd } = dateParts(Math.floor(wholeSeconds / 86400));
  const secOfDay = wholeSeconds % 86400;
  let h = Math.floor(secOfDay / 3600);
  const mi = Math.floor((secOfDay % 3600) / 60);
  const se = secOfDay % 60;
  const ampm = s.toks.some((t) => t.t === "ampm");
  let out = "";
  const toks = s.toks;
  for (let k = 0; k < toks.length; k++) {
    const t = toks[k];
    if (t.t === "lit") out += t.s;
    else if (t.t === "ph") out += t.c === "0" ? "0" : "";
    else if (t.t === "dot") {
      // Fractions of a second: .0, .00, .000
      let n = 0;
      while (toks[k + 1 + n]?.t === "ph") n++;
      const frac = totalSeconds - Math.floor(totalSeconds);
      out += "." + Math.round(frac * 10 ** n).toString().padStart(n, "0");
      k += n;
    } else if (t.t === "ampm") out += t.s.length > 3 ? (h < 12 ? "AM" : "PM") : h < 12 ? "A" : "P";
    else if (t.t === "elapsed") {
      const v = t.s[0] === "h" ? Math.floor(wholeSeconds / 3600) : t.s[0] === "m" ? Math.floor(wholeSeconds / 60) : wholeSeconds;
      out += String(v).padStart(t.s.length, "0");
    } else if (t.t === "date") {
      const c = t.s[0];
      const n = t.s.length;
      if (c === "y") out += n <= 2 ? String(y % 100).padStart(2, "0") : String(y);
      else if (c === "d") out += n === 1 ? String(d) : n === 2 ? String(d).padStart(2, "0") : n === 3 ? DAYS[wd].slice(0, 3) : DAYS[wd];
      else if (c === "h") {
        const hh = ampm ? ((h + 11) % 12) + 1 : h;
        out += n >= 2 ? String(hh).padStart(2, "0") : String(hh);
      } else if (c === "s") out += n >= 2 ? String(se).padStart(2, "0") : String(se);
      else if (c === "m") {
        // Minutes right after hours or right before seconds; months otherwise.
        const prev = toks.slice(0, k).reverse().find((u) => u.t === "date" || u.t === "elapsed");
        const next = toks.slice(k + 1).find((u) => u.t === "date" || u.t === "elapsed");
        const minutes = n <= 2 && ((prev && (prev.t === "elapsed" ? prev.s[0] === "h" : (prev as { s: string }).s[0] === "h")) || (next && (next as { s: string }).s[0] === "s"));
        if (minutes) out += n === 2 ? String(mi).padStart(2, "0") : String(mi);
        else out += n === 1 ? String(m) : n === 2 ? String(m).padStart(2, "0") : n === 3 ? MONTHS[m - 1].slice(0, 3) : n === 4 ? MONTHS[m - 1] : MONTHS[m - 1][0];
      }
    }
  }
  void h;
  h = 0;
  return out;
}

function meets(x: number, c: { op: string; value: number }): boolean {
  switch (c.op) {
    case "<":
      return x < c.value;
    case "<=":
      return x <= c.value;
    case ">":
      return x > c.value;
    case ">=":
      return x >= c.value;
    case "=":
      return x === c.value;
    default:
      return x !== c.value;
  }
}

/** A number or text shown in a number format, as TEXT gives it. */
export function formatValue(value: number | string, format: string): string | FormulaError {
  try {
    const sections = splitSections(format).map(tokenizeSection);
    if (typeof value === "string") {
      const textSection = sections[3] ?? (sections.length === 1 && sections[0].toks.some((t) => t.t === "at") ? sections[0] : undefined);
      if (!textSection) return value;
      return textSection.toks.map((t) => (t.t === "at" ? value : t.t === "lit" ? t.s : "")).join("");
    }
    let section = sections[0];
    let showMinus = true;
    if (sections.some((s) => s.condition)) {
      const hit = sections.find((s) => s.condition && meets(value, s.condition));
      section = hit ?? sections.find((s) => !s.condition) ?? sections[sections.length - 1];
      showMinus = !hit;
    } else if (value < 0 && sections.length >= 2 && sections[1].toks.length) {
      section = sections[1];
      showMinus = false;
    } else if (value === 0 && sections.length >= 3) section = sections[2];
    if (!section.toks.length) return "";
    if (section.isDate) return formatDateSection(value, section);
    if (!section.hasNumber && !section.toks.some((t) => t.t === "lit" && t.s === "\u0000GENERAL")) {
      return (showMinus && value < 0 ? "-" : "") + section.toks.map((t) => (t.t === "lit" ? t.s : t.t === "pct" ? "%" : "")).join("");
    }
    return formatNumberSection(value, section, showMinus);
  } catch (e) {
    if (e instanceof FormulaError) return e;
    throw e;
  }
}

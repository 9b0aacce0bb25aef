/**
 * Logical and information functions, written from their pages in Microsoft's Excel function
 * reference ("Logical functions (reference)", "Information functions (reference)"). IF, IFS,
 * IFERROR, IFNA, SWITCH, CHOOSE, LET and LAMBDA compute only the branch they take, so the
 * evaluator itself handles them (workbook/formula/evaluate.ts).
 */
import type { Ctx } from "../evaluate";
import { err, ERROR_CODES, FormulaError, Lambda, Ref, type Scalar, type Value, XArray } from "../values";
import { def, type Defs, eachValue, num } from "./_lib";

/** The logicals of AND, OR and XOR: numbers and logicals count; text in ranges is skipped, text typed in must read TRUE or FALSE. */
function logicals(args: Value[], c: Ctx, name: string): boolean[] {
  const out: boolean[] = [];
  for (const a of args) {
    if (a === null) continue;
    eachValue(a, c, (x, direct) => {
      if (x instanceof FormulaError) throw x;
      if (typeof x === "boolean") out.push(x);
      else if (typeof x === "number") out.push(x !== 0);
      else if (typeof x === "string" && direct) {
        const u = x.toUpperCase();
        if (u === "TRUE" || u === "FALSE") out.push(u === "TRUE");
        else throw err("#VALUE!", `${name}: "${x}" is not TRUE or FALSE`);
      }
    });
  }
  if (!out.length) throw err("#VALUE!", `${name}: no logical values`);
  return out;
}

const is = (test: (v: Scalar) => boolean) => def(1, 1, "S", ([v]) => test(v as Scalar));

export const LOGICAL: Defs = {
  AND: def(1, 255, "v", (args, c) => logicals(args, c, "AND").every(Boolean)),
  FALSE: def(0, 0, "s", () => false),
  NOT: def(1, 1, "s", ([v]) => {
    if (typeof v === "string") {
      const u = v.toUpperCase();
      if (u === "TRUE" || u === "FALSE") return u !== "TRUE";
      return err("#VALUE!", `NOT: "${v}" is not TRUE or FALSE`);
    }
    return !(num(v) !== 0);
  }),
  OR: def(1, 255, "v", (args, c) => logicals(args, c, "OR").some(Boolean)),
  TRUE: def(0, 0, "s", () => true),
  XOR: def(1, 254, "v", (args, c) => logicals(args, c, "XOR").filter(Boolean).length % 2 === 1),
};

export const INFO: Defs = {
  "ERROR.TYPE": def(1, 1, "S", ([v]) => {
    if (!(v instanceof FormulaError)) return err("#N/A", "ERROR.TYPE of a value that is not an error");
    const i = ["#NULL!", "#DIV/0!", "#VALUE!", "#REF!", "#NAME?", "#NUM!", "#N/A", "#GETTING_DATA"].indexOf(v.error);
    return i >= 0 ? i + 1 : v.error === "#SPILL!" ? 9 : v.error === "#CALC!" ? 14 : ERROR_CODES.indexOf(v.error) + 1;
  }),
  ISBLANK: is((v) => v === null),
  ISERR: is((v) => v instanceof FormulaError && v.error !== "#N/A"),
  ISERROR: is((v) => v instanceof FormulaError),
  ISEVEN: def(1, 1, "s", ([v]) => Math.trunc(num(v)) % 2 === 0),
  ISFORMULA: def(1, 1, "r", ([r], c) => {
    const ref = r as Ref;
    return c.host.formulaText?.(ref.sheet, ref.r1, ref.c1) !== undefined;
  }),
  ISLOGICAL: is((v) => typeof v === "boolean"),
  ISNA: is((v) => v instanceof FormulaError && v.error === "#N/A"),
  ISNONTEXT: is((v) => typeof v !== "string"),
  ISNUMBER: is((v) => typeof v === "number"),
  ISODD: def(1, 1, "s", ([v]) => Math.abs(Math.trunc(num(v)) % 2) === 1),
  ISREF: def(1, 1, "v", ([v]) => v instanceof Ref),
  ISTEXT: is((v) => typeof v === "string"),
  N: def(1, 1, "S", ([v]) => (v instanceof FormulaError ? v : typeof v === "number" ? v : v === true ? 1 : 0)),
  NA: def(0, 0, "s", () => err("#N/A", "NA() written in the formula")),
  TYPE: def(1, 1, "v", ([v], c) => {
    if (v instanceof Ref) v = v.single ? c.host.cell(v.sheet, v.r1, v.c1) : c.host.area(v);
    if (v instanceof XArray) return 64;
    if (v instanceof Lambda) return 128;
    if (typeof v === "number" || v === null) return 1;
    if (typeof v === "string") return 2;
    if (typeof v === "boolean") return 4;
    return 16;
  }),
};

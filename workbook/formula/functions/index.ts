/**
 * The function library: every built-in Excel function Nappe's evaluator computes, by name.
 * README's list of supported functions is generated from SUPPORTED (`npm run generate`); a name
 * not here is an "unsupported function" error in its cell, never a value.
 */
import type { FnDef, Library } from "../evaluate";
import { DATE } from "./date";
import { DISTRIBUTIONS } from "./distributions";
import { ENGINEERING } from "./engineering";
import { FINANCIAL } from "./financial";
import { INFO, LOGICAL } from "./logical";
import { LOOKUP } from "./lookup";
import { MATH } from "./math";
import { STATS } from "./stats";
import { TEXT } from "./text";

/** Functions the evaluator computes itself (they take their arguments unevaluated). */
const SPECIAL_FORMS = { logical: ["IF", "IFERROR", "IFNA", "IFS", "SWITCH", "LET", "LAMBDA"], lookup: ["CHOOSE"] };

/** Each group as Microsoft's function reference groups them. */
export const GROUPS: Record<string, Record<string, FnDef>> = {
  "Math and trigonometry": MATH,
  Statistical: { ...STATS, ...DISTRIBUTIONS },
  "Lookup and reference": LOOKUP,
  Logical: LOGICAL,
  Information: INFO,
  Text: TEXT,
  "Date and time": DATE,
  Engineering: ENGINEERING,
  Financial: FINANCIAL,
};

const ALL = new Map<string, FnDef>(Object.values(GROUPS).flatMap((g) => Object.entries(g)));

export const LIBRARY: Library = { get: (name) => ALL.get(name) };

/** Every supported name by group, sorted, special forms included. */
export function supportedFunctions(): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  for (const [group, defs] of Object.entries(GROUPS)) {
    const extra = group === "Logical" ? SPECIAL_FORMS.logical : group === "Lookup and reference" ? SPECIAL_FORMS.lookup : [];
    out[group] = [...Object.keys(defs), ...extra].sort();
  }
  return out;
}

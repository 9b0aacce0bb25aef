/**
 * Lookup and reference functions and the dynamic-array functions, each written from its page in
 * Microsoft's Excel function reference ("Lookup and reference functions (reference)"): text is
 * matched without regard to case; MATCH, VLOOKUP and HLOOKUP take wildcards in an exact match,
 * XLOOKUP and XMATCH only with match_mode 2; an approximate match expects sorted data and gives
 * what a binary search over sorted data gives.
 */
import type { Ctx } from "../evaluate";
import { intersect } from "../evaluate";
import { parse } from "../parser";
import { compileTree } from "../evaluate";
import { columnLetters } from "../../address";
import { compareScalars, err, FormulaError, MAX_COLUMN, MAX_ROW, Ref, type Scalar, toNumber, type Value, XArray } from "../values";
import { array, bool, def, type Defs, flat, num, optNum, text, wildcard } from "./_lib";

type Kind = "n" | "t" | "b" | "e" | "z";
function kindOf(v: Scalar): Kind {
  return typeof v === "number" ? "n" : typeof v === "string" ? "t" : typeof v === "boolean" ? "b" : v === null ? "z" : "e";
}

/** An exact-match test for a lookup value (wildcards where the function takes them). */
function equalTo(key: Scalar, wildcards: boolean): (v: Scalar) => boolean {
  if (typeof key === "string" && wildcards && /[*?~]/.test(key)) {
    const re = wildcard(key);
    return (v) => typeof v === "string" && re.test(v);
  }
  const k = kindOf(key);
  return (v) => kindOf(v) === k && k !== "e" && k !== "z" && compareScalars(v as Exclude<Scalar, FormulaError>, key as Exclude<Scalar, FormulaError>) === 0;
}

/**
 * Approximate match over sorted values: the last position whose value (of the key's kind) is at
 * most the key (descending: at least), stopping at the first that passes it, as a binary search
 * over sorted data finds.
 */
function approximate(values: Scalar[], key: Scalar, descending: boolean): number {
  const k = kindOf(key);
  let found = -1;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (kindOf(v) !== k) continue;
    const d = compareScalars(v as Exclude<Scalar, FormulaError>, key as Exclude<Scalar, FormulaError>);
    if (descending ? d >= 0 : d <= 0) found = i;
    else break;
  }
  return found;
}

function lookupKey(v: Value): Scalar {
  if (v instanceof FormulaError) throw v;
  return v as Scalar;
}

/** A range or array as one row or column of values. */
function vector(v: Value, c: Ctx, name: string): Scalar[] {
  const a = array(v, c);
  if (a.rows > 1 && a.cols > 1) throw err("#N/A", `${name} looks in one row or one column`);
  return flat(a);
}

/** A sub-rectangle of a reference (kept a reference) or of an array. */
function part(source: Value, c: Ctx, r1: number, c1: number, r2: number, c2: number): Value {
  if (source instanceof Ref) return new Ref(source.sheet, source.r1 + r1, source.c1 + c1, source.r1 + r2, source.c1 + c2);
  const a = array(source, c);
  const rows: Scalar[][] = [];
  for (let i = r1; i <= r2; i++) rows.push(a.data[i].slice(c1, c2 + 1));
  return rows.length === 1 && rows[0].length === 1 ? rows[0][0] : XArray.of(rows);
}

function dims(v: Value): { rows: number; cols: number } {
  if (v instanceof Ref) return { rows: v.rows, cols: v.cols };
  if (v instanceof XArray) return { rows: v.rows, cols: v.cols };
  return { rows: 1, cols: 1 };
}

function xmatch(key: Scalar, values: Scalar[], mode: number, search: number): number {
  if (![0, -1, 1, 2].includes(mode)) throw err("#VALUE!", "match_mode is 0, -1, 1 or 2");
  if (![1, -1, 2, -2].includes(search)) throw err("#VALUE!", "search_mode is 1, -1, 2 or -2");
  const order = values.map((_, i) => i);
  if (search === -1) order.reverse();
  const eq = equalTo(key, mode === 2);
  if (search === 2 || search === -2) {
    // Binary search over sorted values (ascending for 2, descending for -2).
    let lo = 0;
    let hi = values.length - 1;
    let below = -1;
    let above = -1;
    const k = kindOf(key);
    while (lo <= hi) {
      const mid = (lo + hi) >> 1;
      const v = values[mid];
      let d = kindOf(v) === k ? compareScalars(v as Exclude<Scalar, FormulaError>, key as Exclude<Scalar, FormulaError>) : kindOf(v) < k ? -1 : 1;
      if (search === -2) d = -d;
      if (d === 0) return mid;
      if (d < 0) {
        (search === 2 ? (below = mid) : (above = mid));
        lo = mid + 1;
      } else {
        (search === 2 ? (above = mid) : (below = mid));
        hi = mid - 1;
      }
    }
    if (mode === -1) return below;
    if (mode === 1) return above;
    return -1;
  }
  let best = -1;
  const k = kindOf(key);
  for (const i of order) {
    const v = values[i];
    if (eq(v)) return i;
    if ((mode === -1 || mode === 1) && kindOf(v) === k) {
      const d = compareScalars(v as Exclude<Scalar, FormulaError>, key as Exclude<Scalar, FormulaError>);
      if (mode === -1 && d < 0 && (best < 0 || compareScalars(v as never, values[best] as never) > 0)) best = i;
      if (mode === 1 && d > 0 && (best < 0 || compareScalars(v as never, values[best] as never) < 0)) best = i;
    }
  }
  return best;
}

/** Sort keys: numbers, then text (without regard to case), then logicals, then errors, blanks last. */
function sortCompare(a: Scalar, b: Scalar): number {
  const rank = (v: Scalar) => (v === null ? 4 : typeof v === "number" ? 0 : typeof v === "string" ? 1 : typeof v === "boolean" ? 2 : 3);
  const ra = rank(a);
  const rb = rank(b);
  if (ra !== rb || ra >= 3) return ra - rb;
  return compareScalars(a as never, b as never);
}

function sameRow(a: readonly Scalar[], b: readonly Scalar[]): boolean {
  return a.length === b.length && a.every((v, i) => {
    const w = b[i];
    if (v instanceof FormulaError || w instanceof FormulaError) return v instanceof FormulaError && w instanceof FormulaError && v.error === w.error;
    if (kindOf(v) !== kindOf(w)) return false;
    return compareScalars(v, w) === 0;
  });
}

function transpose(a: XArray): XArray {
  return XArray.of(Array.from({ length: a.cols }, (_, j) => a.data.map((row) => row[j])));
}

/**
 * A reference written as text (INDIRECT): A1 style (a cell, a range, whole columns or rows, with
 * or without a sheet), or R1C1 with absolute row and column numbers. The text is only ever read
 * as a reference: anything else in it (a function, an operator, a name) is #REF!, never evaluated.
 */
function referenceFromText(s: string, a1: boolean, c: Ctx): Value {
  let t = s.trim();
  const notRef = () => err("#REF!", `INDIRECT: "${s}" is not a reference`);
  if (!a1) {
    const m = /^(?:(.*)!)?R(\d+)C(\d+)(?::R(\d+)C(\d+))?$/i.exec(t);
    if (!m) return err("#REF!", `INDIRECT: "${s}" is not an R1C1 reference`);
    const sheet = m[1] ? m[1].replace(/^'(.*)'$/, "$1").replace(/''/g, "'") : c.sheet;
    const [r1, c1] = [Number(m[2]), Number(m[3])];
    const [r2, c2] = m[4] ? [Number(m[4]), Number(m[5])] : [r1, c1];
    if (Math.min(r1, r2, c1, c2) < 1 || Math.max(r1, r2) > MAX_ROW || Math.max(c1, c2) > MAX_COLUMN) return notRef();
    return new Ref(sheet, Math.min(r1, r2), Math.min(c1, c2), Math.max(r1, r2), Math.max(c1, c2));
  }
  if (t.startsWith("=")) t = t.slice(1);
  let tree;
  try {
    tree = parse(t);
  } catch {
    return notRef();
  }
  // Plain reference nodes only: compiling them builds a Ref and reads nothing else.
  if (!["cell", "area", "cols", "rows"].includes(tree.k)) return notRef();
  const v = compileTree(tree)(c);
  return v instanceof Ref ? v : notRef();
}

function lookupRows(table: XArray, byRow: boolean): { keys: Scalar[]; pick: (i: number, k: number) => Scalar; width: number } {
  if (!byRow) return { keys: table.data.map((r) => r[0]), pick: (i, k) => table.data[i][k], width: table.cols };
  return { keys: table.data[0].slice(), pick: (i, k) => table.data[k][i], width: table.rows };
}

function vhlookup(args: Value[], c: Ctx, name: string, byRow: boolean): Value {
  const key = lookupKey(args[0]);
  const table = array(args[1], c);
  const index = Math.trunc(num(args[2]));
  const approx = args.length < 4 || args[3] === null ? args.length < 4 : bool(args[3]);
  const { keys, pick, width } = lookupRows(table, byRow);
  if (index < 1) return err("#VALUE!", `${name}: the index must be 1 or more`);
  if (index > width) return err("#REF!", `${name}: the index ${index} is beyond the table's ${width} ${byRow ? "rows" : "columns"}`);
  const i = approx ? approximate(keys, key, false) : keys.findIndex(equalTo(key, true));
  if (i < 0) return err("#N/A", `${name} found no ${approx ? "value at or below" : "match for"} ${String(key)}`);
  const v = pick(i, index - 1);
  return v;
}

export const LOOKUP: Defs = {
  ADDRESS: def(2, 5, "s", (args) => {
    const row = Math.trunc(num(args[0]));
    const col = Math.trunc(num(args[1]));
    const abs = Math.trunc(optNum(args, 2, 1));
    const a1 = args.length < 4 || args[3] === null ? true : bool(args[3]);
    if (row < 1 || col < 1 || row > MAX_ROW || col > MAX_COLUMN || abs < 1 || abs > 4) return err("#VALUE!", "ADDRESS: row, column or abs_num out of range");
    let ref: string;
    if (a1) ref = `${abs === 1 || abs === 3 ? "$" : ""}${columnLetters(col)}${abs === 1 || abs === 2 ? "$" : ""}${row}`;
    else ref = `R${abs === 1 || abs === 2 ? row : `[${row}]`}C${abs === 1 || abs === 3 ? col : `[${col}]`}`;
    if (args.length > 4 && args[4] !== null) {
      const sheet = text(args[4]);
      ref = `${/^[A-Za-z_][A-Za-z0-9_.]*$/.test(sheet) ? sheet : `'${sheet.replace(/'/g, "''")}'`}!${ref}`;
    }
    return ref;
  }),
  AREAS: def(1, 1, "r", () => 1),
  COLUMN: def(0, 1, "r", (args, c) => {
    if (!args.length || args[0] === null) return c.col;
    const r = args[0] as Ref;
    if (r.cols === 1 || !c.array) return r.c1;
    return XArray.of([Array.from({ length: r.cols }, (_, j) => r.c1 + j)]);
  }),
  COLUMNS: def(1, 1, "a", ([v]) => dims(v).cols),
  FILTER: def(2, 3, "aav", (args, c) => {
    const a = array(args[0], c);
    const inc = array(args[1], c);
    const byRow = inc.cols === 1 && inc.rows === a.rows;
    const byCol = !byRow && inc.rows === 1 && inc.cols === a.cols;
    if (!byRow && !byCol) return err("#VALUE!", "FILTER: include must be one column as tall as the array, or one row as wide");
    const keep = flat(inc).map((v) => {
      if (v instanceof FormulaError) throw v;
      const n = toNumber(v);
      if (n instanceof FormulaError) throw n;
      return n !== 0;
    });
    const rows = byRow ? a.data.filter((_, i) => keep[i]) : a.data.map((row) => row.filter((_, j) => keep[j]));
    if (!rows.length || !rows[0].length) {
      if (args.length > 2 && args[2] !== null) return args[2];
      return err("#CALC!", "FILTER: nothing matched (an empty array)");
    }
    return XArray.of(rows.map((r) => r.slice()));
  }),
  HLOOKUP: def(3, 4, "sass", (args, c) => vhlookup(args, c, "HLOOKUP", true)),
  INDEX: def(2, 4, "ass", (args, c) => {
    const source = args[0];
    const { rows, cols } = dims(source);
    let r = Math.trunc(num(args[1]));
    let q = args.length > 2 && args[2] !== null ? Math.trunc(num(args[2])) : undefined;
    if (args.length > 3 && args[3] !== null && Math.trunc(num(args[3])) !== 1) return err("#REF!", "INDEX: area_num must be 1 (unions are not supported)");
    if (q === undefined) {
      // One row or column: the number picks along it.
      if (rows === 1 && cols > 1) [r, q] = [1, r];
      else q = cols === 1 ? 1 : 0;
    }
    if (r < 0 || q < 0 || r > rows || q > cols) return err("#REF!", `INDEX: row ${r}, column ${q} is outside the ${rows}×${cols} range`);
    const r1 = r === 0 ? 0 : r - 1;
    const r2 = r === 0 ? rows - 1 : r - 1;
    const c1 = q === 0 ? 0 : q - 1;
    const c2 = q === 0 ? cols - 1 : q - 1;
    return part(source instanceof Ref ? source : array(source, c), c, r1, c1, r2, c2);
  }),
  INDIRECT: def(1, 2, "ss", (args, c) => referenceFromText(text(args[0]), args.length < 2 || args[1] === null ? true : bool(args[1]), c)),
  LOOKUP: def(2, 3, "saa", (args, c) => {
    const key = lookupKey(args[0]);
    const a = array(args[1], c);
    let keys: Scalar[];
    let results: Scalar[];
    if (args.length > 2 && args[2] !== null) {
      keys = vector(args[1], c, "LOOKUP");
      results = vector(args[2], c, "LOOKUP");
    } else if (a.cols > a.rows) {
      keys = a.data[0].slice();
      results = a.data[a.rows - 1].slice();
    } else {
      keys = a.data.map((r) => r[0]);
      results = a.data.map((r) => r[a.cols - 1]);
    }
    const i = approximate(keys, key, false);
    if (i < 0) return err("#N/A", `LOOKUP found no value at or below ${String(key)}`);
    return i < results.length ? results[i] : err("#N/A", "LOOKUP: the result vector is shorter");
  }),
  MATCH: def(2, 3, "sas", (args, c) => {
    const key = lookupKey(args[0]);
    const values = vector(args[1], c, "MATCH");
    const type = Math.sign(Math.trunc(optNum(args, 2, 1)));
    const i = type === 0 ? values.findIndex(equalTo(key, true)) : approximate(values, key, type < 0);
    if (i < 0) return err("#N/A", `MATCH found no ${type === 0 ? "exact match for" : type > 0 ? "value at or below" : "value at or above"} ${String(key)}`);
    return i + 1;
  }),
  OFFSET: def(3, 5, "rsss", (args) => {
    const ref = args[0] as Ref;
    const dr = Math.trunc(num(args[1]));
    const dc = Math.trunc(num(args[2]));
    const h = args.length > 3 && args[3] !== null ? Math.trunc(num(args[3])) : ref.rows;
    const w = args.length > 4 && args[4] !== null ? Math.trunc(num(args[4])) : ref.cols;
    if (h === 0 || w === 0) return err("#REF!", "OFFSET: height and width cannot be 0");
    let r1 = ref.r1 + dr;
    let c1 = ref.c1 + dc;
    let r2 = r1 + h - (h > 0 ? 1 : -1);
    let c2 = c1 + w - (w > 0 ? 1 : -1);
    [r1, r2] = [Math.min(r1, r2), Math.max(r1, r2)];
    [c1, c2] = [Math.min(c1, c2), Math.max(c1, c2)];
    if (r1 < 1 || c1 < 1 || r2 > MAX_ROW || c2 > MAX_COLUMN) return err("#REF!", "OFFSET: the result is off the sheet");
    return new Ref(ref.sheet, r1, c1, r2, c2);
  }),
  ROW: def(0, 1, "r", (args, c) => {
    if (!args.length || args[0] === null) return c.row;
    const r = args[0] as Ref;
    if (r.rows === 1 || !c.array) return r.r1;
    return XArray.of(Array.from({ length: r.rows }, (_, i) => [r.r1 + i]));
  }),
  ROWS: def(1, 1, "a", ([v]) => dims(v).rows),
  SORT: def(1, 4, "aaas", (args, c) => {
    const a = array(args[0], c);
    const byCol = args.length > 3 && args[3] !== null ? bool(args[3]) : false;
    const m = byCol ? transpose(a) : a;
    const indexes = args.length > 1 && args[1] !== null ? flat(array(args[1], c)).map((v) => Math.trunc(toNumberOrThrow(v))) : [1];
    const orders = args.length > 2 && args[2] !== null ? flat(array(args[2], c)).map((v) => Math.trunc(toNumberOrThrow(v))) : [1];
    for (const i of indexes) if (i < 1 || i > m.cols) return err("#VALUE!", `SORT: sort_index ${i} is outside the array`);
    for (const o of orders) if (o !== 1 && o !== -1) return err("#VALUE!", "SORT: sort_order is 1 or -1");
    const rows = m.data.map((r) => r.slice());
    rows.sort((p, q) => {
      for (let k = 0; k < indexes.length; k++) {
        const d = sortCompare(p[indexes[k] - 1], q[indexes[k] - 1]);
        if (d) return d * (orders[Math.min(k, orders.length - 1)] ?? 1);
      }
      return 0;
    });
    const out = XArray.of(rows);
    return byCol ? transpose(out) : out;
  }),
  SORTBY: def(2, 255, "a", (args, c) => {
    const a = array(args[0], c);
    const keys: { values: Scalar[]; order: number; byCol: boolean }[] = [];
    for (let i = 1; i < args.length; i += 2) {
      const by = array(args[i], c);
      const order = i + 1 < args.length && args[i + 1] !== null ? Math.trunc(toNumberOrThrow(scalar(args[i + 1], c))) : 1;
      if (order !== 1 && order !== -1) return err("#VALUE!", "SORTBY: sort_order is 1 or -1");
      const byCol = by.rows === 1 && by.cols > 1;
      if ((byCol && by.cols !== a.cols) || (!byCol && (by.cols !== 1 || by.rows !== a.rows))) return err("#VALUE!", "SORTBY: each by_array must be one column as tall as the array or one row as wide");
      keys.push({ values: flat(by), order, byCol });
    }
    const byCol = keys[0].byCol;
    const m = byCol ? transpose(a) : a;
    const order = m.data.map((_, i) => i);
    order.sort((p, q) => {
      for (const k of keys) {
        const d = sortCompare(k.values[p], k.values[q]);
        if (d) return d * k.order;
      }
      return p - q;
    });
    const out = XArray.of(order.map((i) => m.data[i].slice()));
    return byCol ? transpose(out) : out;
  }),
  TRANSPOSE: def(1, 1, "a", ([v], c) => transpose(array(v, c))),
  UNIQUE: def(1, 3, "ass", (args, c) => {
    const a = array(args[0], c);
    const byCol = args.length > 1 && args[1] !== null ? bool(args[1]) : false;
    const once = args.length > 2 && args[2] !== null ? bool(args[2]) : false;
    const m = byCol ? transpose(a) : a;
    const groups: { row: readonly Scalar[]; n: number }[] = [];
    for (const row of m.data) {
      const g = groups.find((x) => sameRow(x.row, row));
      if (g) g.n++;
      else groups.push({ row, n: 1 });
    }
    const rows = groups.filter((g) => !once || g.n === 1).map((g) => g.row.slice());
    if (!rows.length) return err("#CALC!", "UNIQUE: no value occurs exactly once");
    const out = XArray.of(rows);
    return byCol ? transpose(out) : out;
  }),
  VLOOKUP: def(3, 4, "sass", (args, c) => vhlookup(args, c, "VLOOKUP", false)),
  XLOOKUP: def(3, 6, "saavss", (args, c) => {
    const key = lookupKey(args[0]);
    const where = array(args[1], c);
    if (where.rows > 1 && where.cols > 1) return err("#VALUE!", "XLOOKUP: lookup_array must be one row or one column");
    const byRow = where.rows === 1 && where.cols > 1;
    const ret = args[2];
    const size = dims(ret);
    if ((byRow && size.cols !== where.cols) || (!byRow && size.rows !== where.rows)) return err("#VALUE!", "XLOOKUP: return_array must match lookup_array in size");
    const mode = Math.trunc(optNum(args, 4, 0));
    const search = Math.trunc(optNum(args, 5, 1));
    const i = xmatch(key, flat(where), mode, search);
    if (i < 0) {
      if (args.length > 3 && args[3] !== null) return args[3];
      return err("#N/A", `XLOOKUP found no match for ${String(key)}`);
    }
    return byRow ? part(ret, c, 0, i, size.rows - 1, i) : part(ret, c, i, 0, i, size.cols - 1);
  }),
  XMATCH: def(2, 4, "sass", (args, c) => {
    const key = lookupKey(args[0]);
    const values = vector(args[1], c, "XMATCH");
    const i = xmatch(key, values, Math.trunc(optNum(args, 2, 0)), Math.trunc(optNum(args, 3, 1)));
    return i < 0 ? err("#N/A", `XMATCH found no match for ${String(key)}`) : i + 1;
  }),
};

function toNumberOrThrow(v: Scalar): number {
  const n = toNumber(v);
  if (n instanceof FormulaError) throw n;
  return n;
}

function scalar(v: Value, c: Ctx): Scalar {
  if (v instanceof Ref) return intersect(v, c);
  if (v instanceof XArray) return v.at(0, 0);
  return v as Scalar;
}


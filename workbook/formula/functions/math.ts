/**
 * Math and trigonometry functions, each written from its page in Microsoft's Excel function
 * reference ("Math and trigonometry functions (reference)").
 */
import type { Ctx } from "../evaluate";
import { asArray } from "../evaluate";
import { err, finite, FormulaError, type Scalar, toNumber, type Value, XArray, Ref } from "../values";
import { array, def, type Defs, eachValue, flat, matching, num, numbersOf, numeric, optNum, rangeOrArray, sameShape, criterion, text } from "./_lib";

/** Rounds half away from zero on the number's 15-figure decimal form, as Excel's ROUND does (ROUND(2.675, 2) = 2.68). */
export function roundDigits(x: number, digits: number, mode: "round" | "up" | "down" = "round"): number {
  const d = Math.trunc(digits);
  if (!Number.isFinite(x) || x === 0) return x;
  const sign = x < 0 ? -1 : 1;
  const a = Math.abs(x);
  const scaled = d >= 0 ? Number((a * 10 ** d).toPrecision(15)) : Number((a / 10 ** -d).toPrecision(15));
  const r = mode === "round" ? Math.floor(scaled + 0.5) : mode === "up" ? Math.ceil(scaled) : Math.floor(scaled);
  const back = d >= 0 ? r / 10 ** d : r * 10 ** -d;
  return sign * back + 0;
}

/** x rounded to a multiple of m (m > 0) in a direction, on the quotient's 15-figure form. */
function toMultiple(x: number, m: number, dir: "up" | "down"): number {
  const q = Number((x / m).toPrecision(15));
  const k = dir === "up" ? Math.ceil(q) : Math.floor(q);
  return finiteOrThrow(k * m);
}

function finiteOrThrow(n: number): number {
  const f = finite(n);
  if (f instanceof FormulaError) throw f;
  return f;
}

const F = (f: (x: number) => number, check?: (x: number) => string | undefined) =>
  numeric(1, 1, ([x]) => {
    const problem = check?.(x);
    if (problem) return err("#NUM!", problem);
    return finite(f(x));
  });

function factorial(n: number): number {
  let r = 1;
  for (let i = 2; i <= n; i++) r *= i;
  return r;
}

function combin(n: number, k: number): number {
  n = Math.trunc(n);
  k = Math.trunc(k);
  if (n < 0 || k < 0 || k > n) throw err("#NUM!", "COMBIN needs 0 ≤ number_chosen ≤ number");
  let r = 1;
  for (let i = 1; i <= k; i++) r = (r * (n - k + i)) / i;
  return Math.round(r);
}

function gcd2(a: number, b: number): number {
  while (b) [a, b] = [b, a % b];
  return a;
}

function integersOf(args: Value[], c: Ctx, name: string): number[] {
  return numbersOf(args, c).map((x) => {
    if (x < 0) throw err("#NUM!", `${name} takes numbers of 0 or more`);
    return Math.trunc(x);
  });
}

function sumOfPairs(args: Value[], c: Ctx, name: string, f: (x: number, y: number) => number): number {
  const a = array(args[0], c);
  const b = array(args[1], c);
  if (a.rows * a.cols !== b.rows * b.cols) throw err("#N/A", `${name}: the two arrays have different numbers of values`);
  const xs = flat(a);
  const ys = flat(b);
  let s = 0;
  for (let i = 0; i < xs.length; i++) {
    const x = xs[i];
    const y = ys[i];
    if (x instanceof FormulaError) throw x;
    if (y instanceof FormulaError) throw y;
    if (typeof x === "number" && typeof y === "number") s += f(x, y);
  }
  return s;
}

/** A square matrix of numbers from an argument (MDETERM, MINVERSE). */
function squareMatrix(v: Value, c: Ctx, name: string): number[][] {
  const a = array(v, c);
  if (a.rows !== a.cols) throw err("#VALUE!", `${name} needs a square array`);
  return a.data.map((row) =>
    row.map((x) => {
      if (x instanceof FormulaError) throw x;
      if (typeof x !== "number") throw err("#VALUE!", `${name}: every value must be a number`);
      return x;
    }),
  );
}

/** LU decomposition with partial pivoting: determinant and inverse. */
function luSolve(m: number[][]): { det: number; inverse?: number[][] } {
  const n = m.length;
  const a = m.map((r) => r.slice());
  const inv = m.map((_, i) => m.map((__, j) => (i === j ? 1 : 0)));
  let det = 1;
  for (let k = 0; k < n; k++) {
    let p = k;
    for (let i = k + 1; i < n; i++) if (Math.abs(a[i][k]) > Math.abs(a[p][k])) p = i;
    if (a[p][k] === 0) return { det: 0 };
    if (p !== k) {
      [a[p], a[k]] = [a[k], a[p]];
      [inv[p], inv[k]] = [inv[k], inv[p]];
      det = -det;
    }
    const pivot = a[k][k];
    det *= pivot;
    for (let j = 0; j < n; j++) {
      a[k][j] /= pivot;
      inv[k][j] /= pivot;
    }
    for (let i = 0; i < n; i++) {
      if (i === k) continue;
      const f = a[i][k];
      if (!f) continue;
      for (let j = 0; j < n; j++) {
        a[i][j] -= f * a[k][j];
        inv[i][j] -= f * inv[k][j];
      }
    }
  }
  return { det, inverse: inv };
}

const ROMAN: [number, string][] = [
  [1000, "M"],
  [900, "CM"],
  [500, "D"],
  [400, "CD"],
  [100, "C"],
  [90, "XC"],
  [50, "L"],
  [40, "XL"],
  [10, "X"],
  [9, "IX"],
  [5, "V"],
  [4, "IV"],
  [1, "I"],
];

/** SUBTOTAL's and AGGREGATE's functions by number. */
const SUBTOTAL_FUNCTIONS: Record<number, string> = { 1: "AVERAGE", 2: "COUNT", 3: "COUNTA", 4: "MAX", 5: "MIN", 6: "PRODUCT", 7: "STDEV.S", 8: "STDEV.P", 9: "SUM", 10: "VAR.S", 11: "VAR.P" };

export const MATH: Defs = {
  ABS: F(Math.abs),
  ACOS: F(Math.acos, (x) => (x < -1 || x > 1 ? "ACOS takes a number from -1 to 1" : undefined)),
  ACOSH: F(Math.acosh, (x) => (x < 1 ? "ACOSH takes a number of 1 or more" : undefined)),
  ACOT: F((x) => Math.PI / 2 - Math.atan(x)),
  ACOTH: F((x) => 0.5 * Math.log((x + 1) / (x - 1)), (x) => (Math.abs(x) <= 1 ? "ACOTH takes a number outside -1 to 1" : undefined)),
  ARABIC: def(1, 1, "s", ([t]) => {
    const s = text(t).trim().toUpperCase();
    const neg = s.startsWith("-");
    const body = neg ? s.slice(1) : s;
    if (!/^[MDCLXVI]*$/.test(body)) return err("#VALUE!", `ARABIC: "${s}" is not a Roman numeral`);
    const val: Record<string, number> = { M: 1000, D: 500, C: 100, L: 50, X: 10, V: 5, I: 1 };
    let n = 0;
    for (let i = 0; i < body.length; i++) {
      const v = val[body[i]];
      n += i + 1 < body.length && val[body[i + 1]] > v ? -v : v;
    }
    return neg ? -n : n;
  }),
  ASIN: F(Math.asin, (x) => (x < -1 || x > 1 ? "ASIN takes a number from -1 to 1" : undefined)),
  ASINH: F(Math.asinh),
  ATAN: F(Math.atan),
  ATAN2: numeric(2, 2, ([x, y]) => (x === 0 && y === 0 ? err("#DIV/0!", "ATAN2 of 0, 0") : Math.atan2(y, x))),
  ATANH: F(Math.atanh, (x) => (x <= -1 || x >= 1 ? "ATANH takes a number between -1 and 1" : undefined)),
  BASE: def(2, 3, "s", (args) => {
    const n = Math.trunc(num(args[0]));
    const radix = Math.trunc(num(args[1]));
    const min = Math.trunc(optNum(args, 2, 0));
    if (n < 0 || n >= 2 ** 53 || radix < 2 || radix > 36 || min < 0 || min > 255) return err("#NUM!", "BASE: number 0 to 2^53, radix 2 to 36, min_length 0 to 255");
    return n.toString(radix).toUpperCase().padStart(min, "0");
  }),
  CEILING: numeric(2, 2, ([x, s]) => {
    if (s === 0) return 0;
    if (x > 0 && s < 0) return err("#NUM!", "CEILING: a positive number with a negative significance");
    if (x < 0 && s < 0) return -toMultiple(-x, -s, "up");
    return x < 0 ? -toMultiple(-x, s, "down") : toMultiple(x, s, "up");
  }),
  "CEILING.MATH": numeric(1, 3, ([x, s, mode]) => {
    s = Math.abs(s);
    if (s === 0) return 0;
    if (x < 0 && mode) return -toMultiple(-x, s, "up");
    return x < 0 ? -toMultiple(-x, s, "down") : toMultiple(x, s, "up");
  }, [undefined, 1, 0]),
  "CEILING.PRECISE": numeric(1, 2, ([x, s]) => {
    s = Math.abs(s);
    if (s === 0) return 0;
    return x < 0 ? -toMultiple(-x, s, "down") : toMultiple(x, s, "up");
  }, [undefined, 1]),
  COMBIN: numeric(2, 2, ([n, k]) => combin(n, k)),
  COMBINA: numeric(2, 2, ([n, k]) => {
    n = Math.trunc(n);
    k = Math.trunc(k);
    if (n < 0 || k < 0 || (n === 0 && k > 0)) return err("#NUM!", "COMBINA needs numbers of 0 or more");
    return k === 0 ? 1 : combin(n + k - 1, k);
  }),
  COS: F(Math.cos),
  COSH: F(Math.cosh),
  COT: numeric(1, 1, ([x]) => (x === 0 ? err("#DIV/0!", "COT of 0") : finite(1 / Math.tan(x)))),
  COTH: numeric(1, 1, ([x]) => (x === 0 ? err("#DIV/0!", "COTH of 0") : finite(1 / Math.tanh(x)))),
  CSC: numeric(1, 1, ([x]) => (x === 0 ? err("#DIV/0!", "CSC of 0") : finite(1 / Math.sin(x)))),
  CSCH: numeric(1, 1, ([x]) => (x === 0 ? err("#DIV/0!", "CSCH of 0") : finite(1 / Math.sinh(x)))),
  DECIMAL: def(2, 2, "s", (args) => {
    const s = text(args[0]).trim();
    const radix = Math.trunc(num(args[1]));
    if (radix < 2 || radix > 36) return err("#NUM!", "DECIMAL: radix 2 to 36");
    let n = 0;
    for (const ch of s.toUpperCase()) {
      const d = parseInt(ch, 36);
      if (Number.isNaN(d) || d >= radix) return err("#NUM!", `DECIMAL: "${s}" is not a number in base ${radix}`);
      n = n * radix + d;
    }
    return n;
  }),
  DEGREES: F((x) => (x * 180) / Math.PI),
  EVEN: F((x) => {
    const a = Math.ceil(Math.abs(x) / 2) * 2;
    return x < 0 ? -a : a;
  }),
  EXP: F(Math.exp),
  FACT: F((x) => factorial(Math.trunc(x)), (x) => (x < 0 ? "FACT takes a number of 0 or more" : undefined)),
  FACTDOUBLE: F((x) => {
    let r = 1;
    for (let i = Math.trunc(x); i > 1; i -= 2) r *= i;
    return r;
  }, (x) => (x < -1 ? "FACTDOUBLE takes a number of -1 or more" : undefined)),
  FLOOR: numeric(2, 2, ([x, s]) => {
    if (s === 0) return x === 0 ? 0 : err("#DIV/0!", "FLOOR: significance 0");
    if (x > 0 && s < 0) return err("#NUM!", "FLOOR: a positive number with a negative significance");
    if (x < 0 && s < 0) return -toMultiple(-x, -s, "down");
    return x < 0 ? -toMultiple(-x, s, "up") : toMultiple(x, s, "down");
  }),
  "FLOOR.MATH": numeric(1, 3, ([x, s, mode]) => {
    s = Math.abs(s);
    if (s === 0) return 0;
    if (x < 0 && mode) return -toMultiple(-x, s, "down");
    return x < 0 ? -toMultiple(-x, s, "up") : toMultiple(x, s, "down");
  }, [undefined, 1, 0]),
  "FLOOR.PRECISE": numeric(1, 2, ([x, s]) => {
    s = Math.abs(s);
    if (s === 0) return 0;
    return x < 0 ? -toMultiple(-x, s, "up") : toMultiple(x, s, "down");
  }, [undefined, 1]),
  GCD: def(1, 255, "v", (args, c) => integersOf(args, c, "GCD").reduce(gcd2, 0)),
  INT: F(Math.floor),
  "ISO.CEILING": numeric(1, 2, ([x, s]) => {
    s = Math.abs(s);
    if (s === 0) return 0;
    return x < 0 ? -toMultiple(-x, s, "down") : toMultiple(x, s, "up");
  }, [undefined, 1]),
  LCM: def(1, 255, "v", (args, c) => {
    const xs = integersOf(args, c, "LCM");
    if (xs.some((x) => x === 0)) return 0;
    return xs.reduce((a, b) => (a / gcd2(a, b)) * b, 1);
  }),
  LN: F(Math.log, (x) => (x <= 0 ? "LN takes a number above 0" : undefined)),
  LOG: numeric(1, 2, ([x, b]) => {
    if (x <= 0 || b <= 0) return err("#NUM!", "LOG takes numbers above 0");
    if (b === 1) return err("#DIV/0!", "LOG to base 1");
    return b === 10 ? Math.log10(x) : Math.log(x) / Math.log(b);
  }, [undefined, 10]),
  LOG10: F(Math.log10, (x) => (x <= 0 ? "LOG10 takes a number above 0" : undefined)),
  MDETERM: def(1, 1, "a", ([m], c) => luSolve(squareMatrix(m, c, "MDETERM")).det),
  MINVERSE: def(1, 1, "a", ([m], c) => {
    const { inverse } = luSolve(squareMatrix(m, c, "MINVERSE"));
    return inverse ? XArray.of(inverse) : err("#NUM!", "MINVERSE: the matrix has no inverse");
  }),
  MMULT: def(2, 2, "a", ([p, q], c) => {
    const a = array(p, c);
    const b = array(q, c);
    if (a.cols !== b.rows) return err("#VALUE!", "MMULT: the first array's columns must equal the second's rows");
    const out: Scalar[][] = [];
    for (let i = 0; i < a.rows; i++) {
      const row: Scalar[] = [];
      for (let j = 0; j < b.cols; j++) {
        let s = 0;
        for (let k = 0; k < a.cols; k++) {
          const x = a.data[i][k];
          const y = b.data[k][j];
          if (x instanceof FormulaError) return x;
          if (y instanceof FormulaError) return y;
          if (typeof x !== "number" || typeof y !== "number") return err("#VALUE!", "MMULT: every value must be a number");
          s += x * y;
        }
        row.push(s);
      }
      out.push(row);
    }
    return XArray.of(out);
  }),
  MOD: numeric(2, 2, ([n, d]) => {
    if (d === 0) return err("#DIV/0!", "MOD by 0");
    const r = n - d * Math.floor(n / d);
    return Math.abs(r - d) < Math.abs(d) * 1e-15 ? 0 : r + 0;
  }),
  MROUND: numeric(2, 2, ([x, m]) => {
    if (m === 0) return 0;
    if (x * m < 0) return err("#NUM!", "MROUND: the number and the multiple must have the same sign");
    const q = Number((x / m).toPrecision(15));
    return Math.sign(q) * Math.floor(Math.abs(q) + 0.5) * m;
  }),
  MULTINOMIAL: def(1, 255, "v", (args, c) => {
    const xs = numbersOf(args, c).map((x) => {
      if (x < 0) throw err("#NUM!", "MULTINOMIAL takes numbers of 0 or more");
      return Math.trunc(x);
    });
    let r = 1;
    let total = 0;
    for (const x of xs) {
      total += x;
      r *= combin(total, x);
    }
    return finite(r);
  }),
  MUNIT: numeric(1, 1, ([n]) => {
    n = Math.trunc(n);
    if (n < 1) return err("#VALUE!", "MUNIT takes a size of 1 or more");
    return XArray.of(Array.from({ length: n }, (_, i) => Array.from({ length: n }, (__, j) => (i === j ? 1 : 0))));
  }),
  ODD: F((x) => {
    const a = Math.abs(x);
    let o = Math.ceil(a);
    if (o % 2 === 0) o += 1;
    return x < 0 ? -o : o;
  }),
  PI: def(0, 0, "s", () => Math.PI),
  POWER: numeric(2, 2, ([x, y]) => {
    if (x === 0 && y === 0) return err("#NUM!", "0^0 is not defined");
    if (x === 0 && y < 0) return err("#DIV/0!", "0 to a negative power");
    return finite(Math.pow(x, y));
  }),
  PRODUCT: def(1, 255, "v", (args, c) => {
    const xs = numbersOf(args, c);
    return xs.length ? finite(xs.reduce((a, b) => a * b, 1)) : 0;
  }),
  QUOTIENT: numeric(2, 2, ([n, d]) => (d === 0 ? err("#DIV/0!", "QUOTIENT by 0") : Math.trunc(n / d))),
  RADIANS: F((x) => (x * Math.PI) / 180),
  RAND: def(0, 0, "s", () => Math.random()),
  RANDBETWEEN: numeric(2, 2, ([lo, hi]) => {
    const a = Math.ceil(lo);
    const b = Math.floor(hi);
    if (a > b) return err("#NUM!", "RANDBETWEEN: bottom is above top");
    return a + Math.floor(Math.random() * (b - a + 1));
  }),
  ROMAN: numeric(1, 2, ([x, form]) => {
    const n = Math.trunc(x);
    if (n < 0 || n > 3999) return err("#VALUE!", "ROMAN takes 0 to 3999");
    if (form) return err("#VALUE!", "ROMAN: only the classic form (0) is supported");
    let s = "";
    let r = n;
    for (const [v, sym] of ROMAN) while (r >= v) {
      s += sym;
      r -= v;
    }
    return s;
  }),
  ROUND: numeric(2, 2, ([x, d]) => roundDigits(x, d)),
  ROUNDDOWN: numeric(2, 2, ([x, d]) => roundDigits(x, d, "down")),
  ROUNDUP: numeric(2, 2, ([x, d]) => roundDigits(x, d, "up")),
  SEC: F((x) => 1 / Math.cos(x)),
  SECH: F((x) => 1 / Math.cosh(x)),
  SEQUENCE: numeric(1, 4, ([rows, cols, start, step]) => {
    rows = Math.trunc(rows);
    cols = Math.trunc(cols);
    if (rows < 1 || cols < 1) return err("#CALC!", "SEQUENCE: rows and columns must be 1 or more");
    if (rows * cols > 1_048_576) return err("#NUM!", "SEQUENCE: too many values");
    return XArray.of(Array.from({ length: rows }, (_, i) => Array.from({ length: cols }, (__, j) => start + (i * cols + j) * step)));
  }, [undefined, 1, 1, 1]),
  SERIESSUM: def(4, 4, "sssa", (args, c) => {
    const x = num(args[0]);
    const n = num(args[1]);
    const m = num(args[2]);
    let s = 0;
    flat(array(args[3], c)).forEach((a, i) => {
      const k = toNumber(a);
      if (k instanceof FormulaError) throw k;
      s += k * Math.pow(x, n + i * m);
    });
    return finite(s);
  }),
  SIGN: F(Math.sign),
  SIN: F(Math.sin),
  SINH: F(Math.sinh),
  SQRT: F(Math.sqrt, (x) => (x < 0 ? "SQRT of a negative number" : undefined)),
  SQRTPI: F((x) => Math.sqrt(x * Math.PI), (x) => (x < 0 ? "SQRTPI of a negative number" : undefined)),
  SUBTOTAL: def(2, 255, "sr", (args, c) => {
    const code = Math.trunc(num(args[0]));
    const name = SUBTOTAL_FUNCTIONS[code > 100 ? code - 100 : code];
    if (!name) return err("#VALUE!", "SUBTOTAL: function_num is 1 to 11 or 101 to 111");
    const refs = args.slice(1) as Ref[];
    // Values of other SUBTOTAL formulas in the ranges are left out, so subtotals do not count twice.
    const values: Value[] = refs.map((r) => {
      const a = c.host.area(r);
      return XArray.of(a.data.map((row, i) => row.map((x, j) => (c.host.formulaText?.(r.sheet, r.r1 + i, r.c1 + j)?.toUpperCase().match(/\b(?:_XLFN\.)?(SUBTOTAL|AGGREGATE)\s*\(/) ? null : x))));
    });
    const fn = c.lib.get(name)!;
    return fn.fn(values, c);
  }),
  SUM: def(1, 255, "v", (args, c) => {
    let s = 0;
    for (const a of args) {
      if (typeof a === "number") {
        s += a;
        continue;
      }
      if (a === null) continue;
      eachValue(a, c, (x, direct) => {
        if (typeof x === "number") s += x;
        else if (x instanceof FormulaError) throw x;
        else if (direct && x !== null) {
          const n = toNumber(x);
          if (n instanceof FormulaError) throw n;
          s += n;
        }
      });
    }
    return finite(s);
  }),
  SUMIF: def(2, 3, "vsv", (args, c) => {
    const range = rangeOrArray(args[0]);
    const test = criterion(args[1] as Scalar);
    const cells = flat(array(range, c));
    const sums = args.length > 2 && args[2] !== null ? flat(sameShape(args[2], range, c)) : cells;
    let s = 0;
    for (let i = 0; i < cells.length; i++) {
      if (!test(cells[i])) continue;
      const v = sums[i];
      if (v instanceof FormulaError) throw v;
      if (typeof v === "number") s += v;
    }
    return finite(s);
  }),
  SUMIFS: def(3, 255, "v", (args, c) => {
    const sums = flat(array(args[0], c));
    const { hits } = matching(args.slice(1), c, "SUMIFS");
    if (hits.length !== sums.length) return err("#VALUE!", "SUMIFS: the sum range and criteria ranges must have the same size");
    let s = 0;
    for (let i = 0; i < sums.length; i++) {
      if (!hits[i]) continue;
      const v = sums[i];
      if (v instanceof FormulaError) throw v;
      if (typeof v === "number") s += v;
    }
    return finite(s);
  }),
  SUMPRODUCT: def(1, 255, "a", (args, c) => {
    const arrays = args.map((a) => {
      const x = asArray(a, c);
      if (x instanceof FormulaError) throw x;
      return x;
    });
    const { rows, cols } = arrays[0];
    if (arrays.some((a) => a.rows !== rows || a.cols !== cols)) return err("#VALUE!", "SUMPRODUCT: the arrays must have the same size");
    let s = 0;
    for (let i = 0; i < rows; i++)
      for (let j = 0; j < cols; j++) {
        let p = 1;
        for (const a of arrays) {
          const x = a.data[i][j];
          if (x instanceof FormulaError) throw x;
          p *= typeof x === "number" ? x : 0;
        }
        s += p;
      }
    return finite(s);
  }),
  SUMSQ: def(1, 255, "v", (args, c) => finite(numbersOf(args, c).reduce((s, x) => s + x * x, 0))),
  SUMX2MY2: def(2, 2, "a", (args, c) => sumOfPairs(args, c, "SUMX2MY2", (x, y) => x * x - y * y)),
  SUMX2PY2: def(2, 2, "a", (args, c) => sumOfPairs(args, c, "SUMX2PY2", (x, y) => x * x + y * y)),
  SUMXMY2: def(2, 2, "a", (args, c) => sumOfPairs(args, c, "SUMXMY2", (x, y) => (x - y) ** 2)),
  TAN: F(Math.tan),
  TANH: F(Math.tanh),
  TRUNC: numeric(1, 2, ([x, d]) => roundDigits(x, d, "down"), [undefined, 0]),
};


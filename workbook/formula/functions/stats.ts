/**
 * Statistical functions (averages, counts, spread, ranks, percentiles, conditional counts and
 * aggregates, correlation and regression), each written from its page in Microsoft's Excel
 * function reference ("Statistical functions (reference)"). Regression (LINEST, LOGEST, TREND,
 * GROWTH) is ordinary least squares by Householder QR, with LINEST's statistics as its page lays
 * them out.
 */
import type { Ctx } from "../evaluate";
import { leastSquares } from "../../../functions/calc/_lib/leastSquares";
import { err, finite, FormulaError, numberFromText, type Scalar, type Value, XArray } from "../values";
import { array, bool, def, type Defs, eachValue, flat, matching, num, numbersOf, numeric, optNum, pairs, rangeOrArray, sameShape, criterion } from "./_lib";

const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;

function need(xs: number[], n: number, name: string, code: "#DIV/0!" | "#NUM!" = "#DIV/0!"): number[] {
  if (xs.length < n) throw err(code, `${name} needs at least ${n} number${n === 1 ? "" : "s"}`);
  return xs;
}

function sumSquares(xs: number[]): number {
  const m = mean(xs);
  return xs.reduce((s, x) => s + (x - m) ** 2, 0);
}

const variance = (xs: number[], sample: boolean, name: string) => sumSquares(need(xs, sample ? 2 : 1, name)) / (xs.length - (sample ? 1 : 0));

function sorted(xs: number[]): number[] {
  return [...xs].sort((a, b) => a - b);
}

function percentileInc(xs: number[], k: number, name: string): number {
  need(xs, 1, name, "#NUM!");
  if (k < 0 || k > 1) throw err("#NUM!", `${name}: k must be from 0 to 1`);
  const s = sorted(xs);
  const h = k * (s.length - 1);
  const i = Math.floor(h);
  return i + 1 < s.length ? s[i] + (h - i) * (s[i + 1] - s[i]) : s[i];
}

function percentileExc(xs: number[], k: number, name: string): number {
  const n = xs.length;
  need(xs, 1, name, "#NUM!");
  const h = k * (n + 1) - 1;
  if (k <= 0 || k >= 1 || h < 0 || h > n - 1) throw err("#NUM!", `${name}: k must lie between 1/(n+1) and n/(n+1)`);
  const s = sorted(xs);
  const i = Math.floor(h);
  return i + 1 < n ? s[i] + (h - i) * (s[i + 1] - s[i]) : s[i];
}

function median(xs: number[]): number {
  need(xs, 1, "MEDIAN", "#NUM!");
  const s = sorted(xs);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

function mode(xs: number[]): number {
  const counts = new Map<number, number>();
  let best: number | undefined;
  let bestCount = 1;
  for (const x of xs) {
    const n = (counts.get(x) ?? 0) + 1;
    counts.set(x, n);
    if (n > bestCount) {
      bestCount = n;
      best = x;
    }
  }
  // Excel gives the value that repeats most, the first of them in the data when several tie.
  if (best === undefined) throw err("#N/A", "MODE: no value repeats");
  const top = [...counts].filter(([, n]) => n === bestCount).map(([x]) => x);
  return xs.find((x) => top.includes(x))!;
}

function kth(args: Value[], c: Ctx, name: string, largest: boolean): number {
  const xs = numbersOf([args[0]], c);
  const k = Math.ceil(num(args[1]));
  if (k < 1 || k > xs.length) throw err("#NUM!", `${name}: k must be from 1 to the number of values (${xs.length})`);
  const s = sorted(xs);
  return largest ? s[s.length - k] : s[k - 1];
}

function rank(args: Value[], c: Ctx, average: boolean): number {
  const x = num(args[0]);
  const xs = numbersOf([args[1]], c);
  const ascending = optNum(args, 2, 0) !== 0;
  const before = xs.filter((v) => (ascending ? v < x : v > x)).length;
  const ties = xs.filter((v) => v === x).length;
  if (!ties) throw err("#N/A", "RANK: the number is not in the list");
  return average ? before + (ties + 1) / 2 : before + 1;
}

/** What COUNT counts: numbers (and numbers typed as arguments, logicals and numeric text among them). */
function count(args: Value[], c: Ctx): number {
  let n = 0;
  for (const a of args) {
    if (a === null) continue;
    eachValue(a, c, (x, direct) => {
      if (typeof x === "number") n++;
      else if (direct && (typeof x === "boolean" || (typeof x === "string" && numberFromText(x) !== undefined))) n++;
    });
  }
  return n;
}

function counta(args: Value[], c: Ctx): number {
  let n = 0;
  for (const a of args) {
    if (a === null) continue;
    eachValue(a, c, (x) => {
      if (x !== null) n++;
    });
  }
  return n;
}

// ---------------------------------------------------------------------------------------------
// Least squares

interface Fit {
  /** Coefficients of each x column, then the constant (0 when it is forced to 0). */
  coef: number[];
  b: number;
  n: number;
  df: number;
  ssreg: number;
  ssresid: number;
  se: number[];
  seB: number | undefined;
}

/** Least squares of y on the columns of X (n × k), with a constant column when `constant` (Householder QR, functions/calc/_lib/leastSquares.ts). */
function fitLinear(y: number[], X: number[][], constant: boolean): Fit {
  const n = y.length;
  const k = X[0]?.length ?? 0;
  const p = k + (constant ? 1 : 0);
  if (n < p) throw err("#NUM!", "LINEST: too few points for the terms asked for");
  const columns = Array.from({ length: p }, (_, j) => (j < k ? X.map((row) => row[j]) : y.map(() => 1)));
  let solved: { coefficients: number[]; r: number[][] };
  try {
    solved = leastSquares(columns, y);
  } catch {
    throw err("#NUM!", "LINEST: the x values are collinear (a column is a combination of others)");
  }
  const { coefficients: beta, r: R } = solved;
  for (let j = 0; j < p; j++) if (Math.abs(R[j][j]) < 1e-13 * Math.abs(R[0][0])) throw err("#NUM!", "LINEST: the x values are collinear (a column is a combination of others)");
  const fitted = y.map((_, i) => columns.reduce((s, col, j) => s + col[i] * beta[j], 0));
  const ssresid = y.reduce((s, v, i) => s + (v - fitted[i]) ** 2, 0);
  const ym = mean(y);
  const ssreg = constant ? fitted.reduce((s, v) => s + (v - ym) ** 2, 0) : fitted.reduce((s, v) => s + v * v, 0);
  const df = n - p;
  // (RᵀR)⁻¹ = R⁻¹R⁻ᵀ for the standard errors.
  const Rinv: number[][] = Array.from({ length: p }, () => new Array(p).fill(0));
  for (let i = p - 1; i >= 0; i--) {
    Rinv[i][i] = 1 / R[i][i];
    for (let j = i + 1; j < p; j++) {
      let s = 0;
      for (let q = i + 1; q <= j; q++) s += R[i][q] * Rinv[q][j];
      Rinv[i][j] = -s / R[i][i];
    }
  }
  const s2 = df > 0 ? ssresid / df : NaN;
  const se = beta.map((_, j) => {
    let d = 0;
    for (let q = j; q < p; q++) d += Rinv[j][q] ** 2;
    return Math.sqrt(s2 * d);
  });
  return { coef: beta.slice(0, k), b: constant ? beta[k] : 0, n, df, ssreg, ssresid, se: se.slice(0, k), seB: constant ? se[k] : undefined };
}

/** LINEST's and TREND's known values: y as a list, x as rows of variables (a column of y takes x's columns as variables). */
function knowns(c: Ctx, ysArg: Value, xsArg: Value | undefined, name: string, logY = false): { y: number[]; X: number[][]; byRow: boolean } {
  const ya = array(ysArg, c);
  const y = flat(ya).map((v) => {
    if (v instanceof FormulaError) throw v;
    if (typeof v !== "number") throw err("#VALUE!", `${name}: known_y's must all be numbers`);
    if (logY && v <= 0) throw err("#NUM!", `${name}: known_y's must be above 0`);
    return logY ? Math.log(v) : v;
  });
  const n = y.length;
  const byRow = ya.rows === 1 && ya.cols > 1;
  if (xsArg === undefined || xsArg === null) return { y, X: y.map((_, i) => [i + 1]), byRow };
  const xa = array(xsArg, c);
  const cells = xa.data.map((row) =>
    row.map((v) => {
      if (v instanceof FormulaError) throw v;
      if (typeof v !== "number") throw err("#VALUE!", `${name}: known_x's must all be numbers`);
      return v;
    }),
  );
  if (ya.rows === 1 || ya.cols === 1) {
    if (xa.rows * xa.cols === n) return { y, X: cells.flat().map((x) => [x]), byRow };
    if (xa.rows === n && !byRow) return { y, X: cells, byRow };
    if (xa.cols === n && byRow) return { y, X: y.map((_, i) => cells.map((row) => row[i])), byRow };
  } else if (xa.rows === ya.rows && xa.cols === ya.cols) return { y, X: cells.flat().map((x) => [x]), byRow };
  throw err("#REF!", `${name}: known_x's do not match known_y's in size`);
}

function linest(c: Ctx, args: Value[], name: string, log: boolean): Value {
  const { y, X } = knowns(c, args[0], args[1] ?? undefined, name, log);
  const constant = args.length > 2 && args[2] !== null ? bool(args[2]) : true;
  const stats = args.length > 3 && args[3] !== null ? bool(args[3]) : false;
  const fit = fitLinear(y, X, constant);
  const ex = (v: number) => (log ? Math.exp(v) : v);
  const top = [...fit.coef.map(ex).reverse(), ex(fit.b)];
  if (!stats) return XArray.of([top]);
  const width = top.length;
  const NA = err("#N/A", "LINEST leaves this cell of its statistics empty");
  const row = (...vs: (number | FormulaError | undefined)[]) => Array.from({ length: width }, (_, i) => (i < vs.length && vs[i] !== undefined ? (vs[i] as number) : NA));
  const r2 = fit.ssreg / (fit.ssreg + fit.ssresid);
  const sey = Math.sqrt(fit.ssresid / fit.df);
  const F = fit.ssresid === 0 ? err("#NUM!", "LINEST: a perfect fit has no F statistic") : (fit.ssreg / X[0].length) / (fit.ssresid / fit.df);
  return XArray.of([top, row(...[...fit.se].reverse(), fit.seB ?? NA), row(r2, sey), row(F, fit.df), row(fit.ssreg, fit.ssresid)]);
}

function trend(c: Ctx, args: Value[], name: string, log: boolean): Value {
  const { X, y } = knowns(c, args[0], args[1] ?? undefined, name, log);
  const constant = args.length > 3 && args[3] !== null ? bool(args[3]) : true;
  const fit = fitLinear(y, X, constant);
  const k = X[0].length;
  let target: XArray;
  if (args.length > 2 && args[2] !== null) target = array(args[2], c);
  else if (args[1] !== undefined && args[1] !== null) target = array(args[1], c);
  else target = XArray.of(y.map((_, i) => [i + 1]));
  const values = target.data.map((row) =>
    row.map((v) => {
      if (v instanceof FormulaError) throw v;
      if (typeof v !== "number") throw err("#VALUE!", `${name}: new_x's must be numbers`);
      return v;
    }),
  );
  const predict = (xs: number[]) => {
    const v = xs.reduce((s, x, j) => s + x * fit.coef[j], fit.b);
    return log ? Math.exp(v) : v;
  };
  if (k === 1) return XArray.of(values.map((row) => row.map((x) => predict([x]))));
  // Several variables: each row (or column, matching the known x's) of new_x is one point.
  if (values[0].length === k) return XArray.of(values.map((row) => [predict(row)]));
  if (values.length === k) return XArray.of([values[0].map((_, i) => predict(values.map((row) => row[i])))]);
  throw err("#REF!", `${name}: new_x's must have ${k} variables`);
}

function linear(args: Value[], c: Ctx, name: string) {
  const { x, y } = pairs(args[0], args[1], c, name);
  if (!x.length) throw err("#DIV/0!", `${name}: no pairs of numbers`);
  const mx = mean(x);
  const my = mean(y);
  let sxy = 0;
  let sxx = 0;
  let syy = 0;
  for (let i = 0; i < x.length; i++) {
    sxy += (x[i] - mx) * (y[i] - my);
    sxx += (x[i] - mx) ** 2;
    syy += (y[i] - my) ** 2;
  }
  return { x, y, mx, my, sxy, sxx, syy, n: x.length };
}

function forecast(args: Value[], c: Ctx, name: string): number {
  const at = num(args[0]);
  const l = linear([args[1], args[2]], c, name);
  if (l.sxx === 0) throw err("#DIV/0!", `${name}: the known x's do not vary`);
  const slope = l.sxy / l.sxx;
  return l.my - slope * l.mx + slope * at;
}

function correl(args: Value[], c: Ctx, name: string): number {
  const l = linear(args, c, name);
  if (l.sxx === 0 || l.syy === 0) throw err("#DIV/0!", `${name}: a range does not vary`);
  return l.sxy / Math.sqrt(l.sxx * l.syy);
}

function covariance(args: Value[], c: Ctx, sample: boolean, name: string): number {
  const l = linear(args, c, name);
  if (sample && l.n < 2) throw err("#DIV/0!", `${name} needs at least two pairs`);
  return l.sxy / (l.n - (sample ? 1 : 0));
}

/**
 * ln Γ(x) for x > 0: the recurrence Γ(x) = Γ(x + n)/(x(x+1)…(x+n−1)) up to x + n ≥ 15, then
 * Stirling's series to the z⁻¹³ term (coefficients B₂ₖ/(2k(2k−1)) from the Bernoulli numbers);
 * below 0.5 the reflection formula. About 15 figures.
 */
export function logGamma(x: number): number {
  if (x < 0.5) return Math.log(Math.PI / Math.abs(Math.sin(Math.PI * x))) - logGamma(1 - x);
  let shift = 0;
  let z = x;
  let product = 1;
  while (z < 15) {
    product *= z;
    z += 1;
    if (product > 1e250) {
      shift += Math.log(product);
      product = 1;
    }
  }
  shift += Math.log(product);
  const z2 = z * z;
  const series = (1 / z) * (1 / 12 - (1 / z2) * (1 / 360 - (1 / z2) * (1 / 1260 - (1 / z2) * (1 / 1680 - (1 / z2) * (1 / 1188 - (1 / z2) * (691 / 360360 - (1 / z2) / 156))))));
  return (z - 0.5) * Math.log(z) - z + 0.5 * Math.log(2 * Math.PI) + series - shift;
}

function gamma(x: number): number {
  if (Number.isInteger(x) && x > 0 && x < 171) {
    let r = 1;
    for (let i = 2; i < x; i++) r *= i;
    return r;
  }
  if (x < 0.5) return Math.PI / (Math.sin(Math.PI * x) * gamma(1 - x));
  return Math.exp(logGamma(x));
}

const stat = (fn: (xs: number[]) => number, rules?: { countAll?: boolean }) => def(1, 255, "v", (args, c) => finite(fn(numbersOf(args, c, rules))));

function conditional(args: Value[], c: Ctx, name: string, from: 0 | 2): { values: Scalar[]; hits: boolean[] } {
  const target = from === 0 ? array(args[0], c) : undefined;
  const { shape, hits } = matching(args.slice(from === 0 ? 1 : 0), c, name);
  const values = target ? flat(target) : flat(shape);
  if (values.length !== hits.length) throw err("#VALUE!", `${name}: every range must have the same size`);
  return { values, hits };
}

function numbersWhere(values: Scalar[], hits: boolean[]): number[] {
  const out: number[] = [];
  for (let i = 0; i < values.length; i++) {
    if (!hits[i]) continue;
    const v = values[i];
    if (v instanceof FormulaError) throw v;
    if (typeof v === "number") out.push(v);
  }
  return out;
}

export const STATS: Defs = {
  AVEDEV: stat((xs) => {
    const m = mean(need(xs, 1, "AVEDEV", "#NUM!"));
    return xs.reduce((s, x) => s + Math.abs(x - m), 0) / xs.length;
  }),
  AVERAGE: stat((xs) => mean(need(xs, 1, "AVERAGE"))),
  AVERAGEA: stat((xs) => mean(need(xs, 1, "AVERAGEA")), { countAll: true }),
  AVERAGEIF: def(2, 3, "vsv", (args, c) => {
    const range = rangeOrArray(args[0]);
    const test = criterion(args[1] as Scalar);
    const cells = flat(array(range, c));
    const values = args.length > 2 && args[2] !== null ? flat(sameShape(args[2], range, c)) : cells;
    const xs = numbersWhere(values, cells.map(test));
    return xs.length ? mean(xs) : err("#DIV/0!", "AVERAGEIF: no cell meets the criterion");
  }),
  AVERAGEIFS: def(3, 255, "v", (args, c) => {
    const { values, hits } = conditional(args, c, "AVERAGEIFS", 0);
    const xs = numbersWhere(values, hits);
    return xs.length ? mean(xs) : err("#DIV/0!", "AVERAGEIFS: no cell meets every criterion");
  }),
  CORREL: def(2, 2, "a", (args, c) => correl(args, c, "CORREL")),
  COUNT: def(1, 255, "v", (args, c) => count(args, c)),
  COUNTA: def(1, 255, "v", (args, c) => counta(args, c)),
  COUNTBLANK: def(1, 1, "v", ([v], c) => {
    let n = 0;
    eachValue(v, c, (x) => {
      if (x === null || x === "") n++;
    });
    return n;
  }),
  COUNTIF: def(2, 2, "vs", (args, c) => {
    const test = criterion(args[1] as Scalar);
    return flat(array(rangeOrArray(args[0]), c)).filter(test).length;
  }),
  COUNTIFS: def(2, 255, "v", (args, c) => matching(args, c, "COUNTIFS").hits.filter(Boolean).length),
  "COVARIANCE.P": def(2, 2, "a", (args, c) => covariance(args, c, false, "COVARIANCE.P")),
  "COVARIANCE.S": def(2, 2, "a", (args, c) => covariance(args, c, true, "COVARIANCE.S")),
  COVAR: def(2, 2, "a", (args, c) => covariance(args, c, false, "COVAR")),
  DEVSQ: stat((xs) => sumSquares(need(xs, 1, "DEVSQ", "#NUM!"))),
  FISHER: numeric(1, 1, ([x]) => (x <= -1 || x >= 1 ? err("#NUM!", "FISHER takes a number between -1 and 1") : Math.atanh(x))),
  FISHERINV: numeric(1, 1, ([y]) => Math.tanh(y)),
  FORECAST: def(3, 3, "saa", (args, c) => forecast(args, c, "FORECAST")),
  "FORECAST.LINEAR": def(3, 3, "saa", (args, c) => forecast(args, c, "FORECAST.LINEAR")),
  FREQUENCY: def(2, 2, "a", ([data, bins], c) => {
    const xs = numbersOf([data], c);
    const order = numbersOf([bins], c);
    const ascending = order.map((b, k) => [b, k] as const).sort((p, q) => p[0] - q[0]);
    const counts = new Array(order.length + 1).fill(0);
    for (const x of xs) {
      const hit = ascending.find(([b]) => x <= b);
      counts[hit ? hit[1] : order.length]++;
    }
    return XArray.of(counts.map((n) => [n]));
  }),
  GAMMA: numeric(1, 1, ([x]) => (x <= 0 && Number.isInteger(x) ? err("#NUM!", "GAMMA of 0 or a negative integer") : finite(gamma(x)))),
  GAMMALN: numeric(1, 1, ([x]) => (x <= 0 ? err("#NUM!", "GAMMALN takes a number above 0") : logGamma(x))),
  "GAMMALN.PRECISE": numeric(1, 1, ([x]) => (x <= 0 ? err("#NUM!", "GAMMALN.PRECISE takes a number above 0") : logGamma(x))),
  GEOMEAN: stat((xs) => {
    need(xs, 1, "GEOMEAN", "#NUM!");
    if (xs.some((x) => x <= 0)) throw err("#NUM!", "GEOMEAN takes numbers above 0");
    return Math.exp(xs.reduce((s, x) => s + Math.log(x), 0) / xs.length);
  }),
  GROWTH: def(1, 4, "aaas", (args, c) => trend(c, args, "GROWTH", true)),
  HARMEAN: stat((xs) => {
    need(xs, 1, "HARMEAN", "#NUM!");
    if (xs.some((x) => x <= 0)) throw err("#NUM!", "HARMEAN takes numbers above 0");
    return xs.length / xs.reduce((s, x) => s + 1 / x, 0);
  }),
  INTERCEPT: def(2, 2, "a", (args, c) => {
    const l = linear(args, c, "INTERCEPT");
    if (l.sxx === 0) throw err("#DIV/0!", "INTERCEPT: the known x's do not vary");
    return l.my - (l.sxy / l.sxx) * l.mx;
  }),
  KURT: stat((xs) => {
    const n = need(xs, 4, "KURT").length;
    const m = mean(xs);
    const s = Math.sqrt(variance(xs, true, "KURT"));
    if (s === 0) throw err("#DIV/0!", "KURT: the values do not vary");
    const q = xs.reduce((a, x) => a + ((x - m) / s) ** 4, 0);
    return ((n * (n + 1)) / ((n - 1) * (n - 2) * (n - 3))) * q - (3 * (n - 1) ** 2) / ((n - 2) * (n - 3));
  }),
  LARGE: def(2, 2, "as", (args, c) => kth(args, c, "LARGE", true)),
  LINEST: def(1, 4, "aass", (args, c) => linest(c, args, "LINEST", false)),
  LOGEST: def(1, 4, "aass", (args, c) => linest(c, args, "LOGEST", true)),
  MAX: stat((xs) => (xs.length ? Math.max(...xs) : 0)),
  MAXA: stat((xs) => (xs.length ? Math.max(...xs) : 0), { countAll: true }),
  MAXIFS: def(3, 255, "v", (args, c) => {
    const { values, hits } = conditional(args, c, "MAXIFS", 0);
    const xs = numbersWhere(values, hits);
    return xs.length ? Math.max(...xs) : 0;
  }),
  MEDIAN: stat(median),
  MIN: stat((xs) => (xs.length ? Math.min(...xs) : 0)),
  MINA: stat((xs) => (xs.length ? Math.min(...xs) : 0), { countAll: true }),
  MINIFS: def(3, 255, "v", (args, c) => {
    const { values, hits } = conditional(args, c, "MINIFS", 0);
    const xs = numbersWhere(values, hits);
    return xs.length ? Math.min(...xs) : 0;
  }),
  MODE: stat(mode),
  "MODE.SNGL": stat(mode),
  PEARSON: def(2, 2, "a", (args, c) => correl(args, c, "PEARSON")),
  PERCENTILE: def(2, 2, "as", (args, c) => percentileInc(numbersOf([args[0]], c), num(args[1]), "PERCENTILE")),
  "PERCENTILE.INC": def(2, 2, "as", (args, c) => percentileInc(numbersOf([args[0]], c), num(args[1]), "PERCENTILE.INC")),
  "PERCENTILE.EXC": def(2, 2, "as", (args, c) => percentileExc(numbersOf([args[0]], c), num(args[1]), "PERCENTILE.EXC")),
  PERMUT: numeric(2, 2, ([n, k]) => {
    n = Math.trunc(n);
    k = Math.trunc(k);
    if (n < 0 || k < 0 || k > n) return err("#NUM!", "PERMUT needs 0 ≤ number_chosen ≤ number");
    let r = 1;
    for (let i = 0; i < k; i++) r *= n - i;
    return r;
  }),
  PERMUTATIONA: numeric(2, 2, ([n, k]) => {
    n = Math.trunc(n);
    k = Math.trunc(k);
    return n < 0 || k < 0 ? err("#NUM!", "PERMUTATIONA takes numbers of 0 or more") : n ** k;
  }),
  QUARTILE: def(2, 2, "as", (args, c) => {
    const q = Math.trunc(num(args[1]));
    if (q < 0 || q > 4) return err("#NUM!", "QUARTILE: quart is 0 to 4");
    return percentileInc(numbersOf([args[0]], c), q / 4, "QUARTILE");
  }),
  "QUARTILE.INC": def(2, 2, "as", (args, c) => {
    const q = Math.trunc(num(args[1]));
    if (q < 0 || q > 4) return err("#NUM!", "QUARTILE.INC: quart is 0 to 4");
    return percentileInc(numbersOf([args[0]], c), q / 4, "QUARTILE.INC");
  }),
  "QUARTILE.EXC": def(2, 2, "as", (args, c) => {
    const q = Math.trunc(num(args[1]));
    if (q < 1 || q > 3) return err("#NUM!", "QUARTILE.EXC: quart is 1 to 3");
    return percentileExc(numbersOf([args[0]], c), q / 4, "QUARTILE.EXC");
  }),
  RANK: def(2, 3, "sas", (args, c) => rank(args, c, false)),
  "RANK.EQ": def(2, 3, "sas", (args, c) => rank(args, c, false)),
  "RANK.AVG": def(2, 3, "sas", (args, c) => rank(args, c, true)),
  RSQ: def(2, 2, "a", (args, c) => correl(args, c, "RSQ") ** 2),
  SKEW: stat((xs) => {
    const n = need(xs, 3, "SKEW").length;
    const m = mean(xs);
    const s = Math.sqrt(variance(xs, true, "SKEW"));
    if (s === 0) throw err("#DIV/0!", "SKEW: the values do not vary");
    return (n / ((n - 1) * (n - 2))) * xs.reduce((a, x) => a + ((x - m) / s) ** 3, 0);
  }),
  "SKEW.P": stat((xs) => {
    const n = need(xs, 1, "SKEW.P").length;
    const m = mean(xs);
    const s = Math.sqrt(variance(xs, false, "SKEW.P"));
    if (s === 0) throw err("#DIV/0!", "SKEW.P: the values do not vary");
    return xs.reduce((a, x) => a + ((x - m) / s) ** 3, 0) / n;
  }),
  SLOPE: def(2, 2, "a", (args, c) => {
    const l = linear(args, c, "SLOPE");
    if (l.sxx === 0) throw err("#DIV/0!", "SLOPE: the known x's do not vary");
    return l.sxy / l.sxx;
  }),
  SMALL: def(2, 2, "as", (args, c) => kth(args, c, "SMALL", false)),
  STANDARDIZE: numeric(3, 3, ([x, m, s]) => (s <= 0 ? err("#NUM!", "STANDARDIZE: standard_dev must be above 0") : (x - m) / s)),
  STDEV: stat((xs) => Math.sqrt(variance(xs, true, "STDEV"))),
  "STDEV.S": stat((xs) => Math.sqrt(variance(xs, true, "STDEV.S"))),
  "STDEV.P": stat((xs) => Math.sqrt(variance(xs, false, "STDEV.P"))),
  STDEVP: stat((xs) => Math.sqrt(variance(xs, false, "STDEVP"))),
  STDEVA: stat((xs) => Math.sqrt(variance(xs, true, "STDEVA")), { countAll: true }),
  STDEVPA: stat((xs) => Math.sqrt(variance(xs, false, "STDEVPA")), { countAll: true }),
  STEYX: def(2, 2, "a", (args, c) => {
    const l = linear(args, c, "STEYX");
    if (l.n < 3) throw err("#DIV/0!", "STEYX needs at least three pairs");
    return Math.sqrt((l.syy - (l.sxy * l.sxy) / l.sxx) / (l.n - 2));
  }),
  TREND: def(1, 4, "aaas", (args, c) => trend(c, args, "TREND", false)),
  TRIMMEAN: def(2, 2, "as", (args, c) => {
    const xs = sorted(numbersOf([args[0]], c));
    const p = num(args[1]);
    if (p < 0 || p >= 1 || !xs.length) return err("#NUM!", "TRIMMEAN: percent is from 0 to below 1");
    const k = Math.floor((xs.length * p) / 2);
    return mean(xs.slice(k, xs.length - k));
  }),
  VAR: stat((xs) => variance(xs, true, "VAR")),
  "VAR.S": stat((xs) => variance(xs, true, "VAR.S")),
  "VAR.P": stat((xs) => variance(xs, false, "VAR.P")),
  VARP: stat((xs) => variance(xs, false, "VARP")),
  VARA: stat((xs) => variance(xs, true, "VARA"), { countAll: true }),
  VARPA: stat((xs) => variance(xs, false, "VARPA"), { countAll: true }),
};


/**
 * Statistical distributions and their inverses, written from their pages in Microsoft's Excel
 * function reference (argument checks as those pages give them; degrees of freedom truncated to
 * whole numbers where the page says so), computed with the special functions of special.ts.
 */
import { err, finite, type Value } from "../values";
import { bool, def, type Defs, num, optNum } from "./_lib";
import { invert, normalCdf, normalInv, normalPdf, regularizedBeta, regularizedGammaP, regularizedGammaQ } from "./special";
import { logGamma } from "./stats";

const fail = (name: string, what: string) => {
  throw err("#NUM!", `${name}: ${what}`);
};

function prob(p: number, name: string, open = true): number {
  if (open ? p <= 0 || p >= 1 : p < 0 || p > 1) fail(name, `probability must be ${open ? "between 0 and 1" : "from 0 to 1"}`);
  return p;
}

const cumulativeArg = (args: Value[], i: number) => bool(args[i]);

/** Numbers of the arguments, then the function; results checked finite. */
const dist = (min: number, max: number, f: (x: number[], args: Value[]) => number) =>
  def(min, max, "s", (args) => {
    const xs = args.map((a, i) => (a === null && i >= min ? NaN : a === null ? 0 : typeof a === "boolean" ? (a ? 1 : 0) : num(a)));
    return finite(f(xs, args));
  });

function gammaPdf(x: number, a: number, b: number): number {
  if (x === 0) return a === 1 ? 1 / b : a < 1 ? Infinity : 0;
  return Math.exp((a - 1) * Math.log(x) - x / b - a * Math.log(b) - logGamma(a));
}

function betaPdf(x: number, a: number, b: number): number {
  return Math.exp((a - 1) * Math.log(x) + (b - 1) * Math.log(1 - x) + logGamma(a + b) - logGamma(a) - logGamma(b));
}

function tCdf(t: number, df: number): number {
  const i = regularizedBeta(df / (df + t * t), df / 2, 0.5);
  return t > 0 ? 1 - i / 2 : i / 2;
}

function tPdf(t: number, df: number): number {
  return Math.exp(logGamma((df + 1) / 2) - logGamma(df / 2) - 0.5 * Math.log(df * Math.PI) - ((df + 1) / 2) * Math.log(1 + (t * t) / df));
}

function tInv(p: number, df: number): number {
  if (p === 0.5) return 0;
  if (p < 0.5) return -tInv(1 - p, df);
  return invert((t) => tCdf(t, df), p, 0, 10, (t) => tPdf(t, df));
}

function fCdf(x: number, d1: number, d2: number): number {
  return x <= 0 ? 0 : regularizedBeta((d1 * x) / (d1 * x + d2), d1 / 2, d2 / 2);
}

function fRight(x: number, d1: number, d2: number): number {
  return x <= 0 ? 1 : regularizedBeta(d2 / (d2 + d1 * x), d2 / 2, d1 / 2);
}

function fPdf(x: number, d1: number, d2: number): number {
  if (x === 0) return d1 < 2 ? Infinity : d1 === 2 ? 1 : 0;
  return Math.exp(0.5 * (d1 * Math.log(d1 * x) + d2 * Math.log(d2) - (d1 + d2) * Math.log(d1 * x + d2)) - Math.log(x) - (logGamma(d1 / 2) + logGamma(d2 / 2) - logGamma((d1 + d2) / 2)));
}

function chiCdf(x: number, df: number): number {
  return regularizedGammaP(df / 2, x / 2);
}

function dfOf(v: number, name: string, min = 1): number {
  const d = Math.trunc(v);
  if (d < min) fail(name, `degrees of freedom must be ${min} or more`);
  return d;
}

function lnChoose(n: number, k: number): number {
  return logGamma(n + 1) - logGamma(k + 1) - logGamma(n - k + 1);
}

function binomPmf(k: number, n: number, p: number): number {
  if (p === 0) return k === 0 ? 1 : 0;
  if (p === 1) return k === n ? 1 : 0;
  return Math.exp(lnChoose(n, k) + k * Math.log(p) + (n - k) * Math.log(1 - p));
}

function normDist(name: string, x: number, m: number, s: number, cumulative: boolean): number {
  if (s <= 0) fail(name, "standard_dev must be above 0");
  const z = (x - m) / s;
  return cumulative ? normalCdf(z) : normalPdf(z) / s;
}

function lognormDist(name: string, x: number, m: number, s: number, cumulative: boolean): number {
  if (x <= 0 || s <= 0) fail(name, "x and standard_dev must be above 0");
  const z = (Math.log(x) - m) / s;
  return cumulative ? normalCdf(z) : normalPdf(z) / (x * s);
}

function gammaDist(name: string, x: number, a: number, b: number, cumulative: boolean): number {
  if (x < 0 || a <= 0 || b <= 0) fail(name, "x of 0 or more, alpha and beta above 0");
  return cumulative ? regularizedGammaP(a, x / b) : gammaPdf(x, a, b);
}

function gammaInv(name: string, p: number, a: number, b: number): number {
  prob(p, name, false);
  if (a <= 0 || b <= 0) fail(name, "alpha and beta must be above 0");
  if (p === 0) return 0;
  if (p === 1) fail(name, "probability must be below 1");
  return invert((x) => regularizedGammaP(a, x / b), p, 0, a * b * 10 + 10, (x) => gammaPdf(x, a, b));
}

function betaDist(name: string, x: number, a: number, b: number, cumulative: boolean, lo: number, hi: number): number {
  if (a <= 0 || b <= 0 || x < lo || x > hi || lo === hi) fail(name, "alpha and beta above 0, A ≤ x ≤ B");
  const u = (x - lo) / (hi - lo);
  return cumulative ? regularizedBeta(u, a, b) : betaPdf(u, a, b) / (hi - lo);
}

function betaInv(name: string, p: number, a: number, b: number, lo: number, hi: number): number {
  prob(p, name, false);
  if (a <= 0 || b <= 0 || lo >= hi) fail(name, "alpha and beta above 0, A below B");
  if (p === 0) return lo;
  if (p === 1) return hi;
  const u = invert((x) => regularizedBeta(x, a, b), p, 0, 1, (x) => betaPdf(x, a, b));
  return lo + u * (hi - lo);
}

function expon(name: string, x: number, l: number, cumulative: boolean): number {
  if (x < 0 || l <= 0) fail(name, "x of 0 or more, lambda above 0");
  return cumulative ? -Math.expm1(-l * x) : l * Math.exp(-l * x);
}

function weibull(name: string, x: number, a: number, b: number, cumulative: boolean): number {
  if (x < 0 || a <= 0 || b <= 0) fail(name, "x of 0 or more, alpha and beta above 0");
  const r = Math.pow(x / b, a);
  return cumulative ? -Math.expm1(-r) : (a / Math.pow(b, a)) * Math.pow(x, a - 1) * Math.exp(-r);
}

function binom(name: string, k: number, n: number, p: number, cumulative: boolean): number {
  k = Math.trunc(k);
  n = Math.trunc(n);
  if (k < 0 || k > n || p < 0 || p > 1) fail(name, "0 ≤ number_s ≤ trials, 0 ≤ probability_s ≤ 1");
  if (!cumulative) return binomPmf(k, n, p);
  if (k === n) return 1;
  return regularizedBeta(1 - p, n - k, k + 1);
}

function poisson(name: string, k: number, m: number, cumulative: boolean): number {
  k = Math.trunc(k);
  if (k < 0 || m < 0) fail(name, "x and mean must be 0 or more");
  if (m === 0) return k === 0 || cumulative ? 1 : 0;
  return cumulative ? regularizedGammaQ(k + 1, m) : Math.exp(k * Math.log(m) - m - logGamma(k + 1));
}

function chisqDist(name: string, x: number, df: number, cumulative: boolean): number {
  df = dfOf(df, name);
  if (x < 0) fail(name, "x must be 0 or more");
  return cumulative ? chiCdf(x, df) : gammaPdf(x, df / 2, 2);
}

function chisqRight(name: string, x: number, df: number): number {
  df = dfOf(df, name);
  if (x < 0) fail(name, "x must be 0 or more");
  return regularizedGammaQ(df / 2, x / 2);
}

function chisqInv(name: string, p: number, df: number, right: boolean): number {
  prob(p, name, false);
  df = dfOf(df, name);
  if (right ? p === 0 : p === 1) fail(name, "probability at the end of the range");
  const q = right ? 1 - p : p;
  if (q === 0) return 0;
  if (right) return invert((x) => -regularizedGammaQ(df / 2, x / 2), -p, 0, df * 10 + 10, (x) => gammaPdf(x, df / 2, 2));
  return invert((x) => chiCdf(x, df), p, 0, df * 10 + 10, (x) => gammaPdf(x, df / 2, 2));
}

function fInv(name: string, p: number, d1: number, d2: number, right: boolean): number {
  prob(p, name, false);
  d1 = dfOf(d1, name);
  d2 = dfOf(d2, name);
  if (right ? p === 0 : p === 1) fail(name, "probability at the end of the range");
  if (right ? p === 1 : p === 0) return 0;
  if (right) return invert((x) => -fRight(x, d1, d2), -p, 0, 10, (x) => fPdf(x, d1, d2));
  return invert((x) => fCdf(x, d1, d2), p, 0, 10, (x) => fPdf(x, d1, d2));
}

function hypgeom(name: string, k: number, n: number, K: number, N: number, cumulative: boolean): number {
  [k, n, K, N] = [k, n, K, N].map(Math.trunc);
  if (k < 0 || k > n || k > K || n > N || K > N || n - k > N - K || N <= 0) fail(name, "the sample and population numbers are inconsistent");
  const pmf = (j: number) => Math.exp(lnChoose(K, j) + lnChoose(N - K, n - j) - lnChoose(N, n));
  if (!cumulative) return pmf(k);
  let s = 0;
  for (let j = Math.max(0, n - (N - K)); j <= k; j++) s += pmf(j);
  return Math.min(1, s);
}

function negbinom(name: string, f: number, s: number, p: number, cumulative: boolean): number {
  f = Math.trunc(f);
  s = Math.trunc(s);
  if (f < 0 || s < 1 || p <= 0 || p >= 1) fail(name, "number_f of 0 or more, number_s of 1 or more, probability between 0 and 1");
  if (cumulative) return regularizedBeta(p, s, f + 1);
  return Math.exp(lnChoose(f + s - 1, s - 1) + s * Math.log(p) + f * Math.log(1 - p));
}

export const DISTRIBUTIONS: Defs = {
  "BETA.DIST": dist(4, 6, ([x, a, b], args) => betaDist("BETA.DIST", x, a, b, cumulativeArg(args, 3), optNum(args, 4, 0), optNum(args, 5, 1))),
  BETADIST: dist(3, 5, ([x, a, b], args) => betaDist("BETADIST", x, a, b, true, optNum(args, 3, 0), optNum(args, 4, 1))),
  "BETA.INV": dist(3, 5, ([p, a, b], args) => betaInv("BETA.INV", p, a, b, optNum(args, 3, 0), optNum(args, 4, 1))),
  BETAINV: dist(3, 5, ([p, a, b], args) => betaInv("BETAINV", p, a, b, optNum(args, 3, 0), optNum(args, 4, 1))),
  "BINOM.DIST": dist(4, 4, ([k, n, p], args) => binom("BINOM.DIST", k, n, p, cumulativeArg(args, 3))),
  BINOMDIST: dist(4, 4, ([k, n, p], args) => binom("BINOMDIST", k, n, p, cumulativeArg(args, 3))),
  "CHISQ.DIST": dist(3, 3, ([x, df], args) => chisqDist("CHISQ.DIST", x, df, cumulativeArg(args, 2))),
  "CHISQ.DIST.RT": dist(2, 2, ([x, df]) => chisqRight("CHISQ.DIST.RT", x, df)),
  CHIDIST: dist(2, 2, ([x, df]) => chisqRight("CHIDIST", x, df)),
  "CHISQ.INV": dist(2, 2, ([p, df]) => chisqInv("CHISQ.INV", p, df, false)),
  "CHISQ.INV.RT": dist(2, 2, ([p, df]) => chisqInv("CHISQ.INV.RT", p, df, true)),
  CHIINV: dist(2, 2, ([p, df]) => chisqInv("CHIINV", p, df, true)),
  "CONFIDENCE.NORM": dist(3, 3, ([a, s, n]) => {
    n = Math.trunc(n);
    if (a <= 0 || a >= 1 || s <= 0 || n < 1) fail("CONFIDENCE.NORM", "alpha between 0 and 1, standard_dev above 0, size 1 or more");
    return (normalInv(1 - a / 2) * s) / Math.sqrt(n);
  }),
  CONFIDENCE: dist(3, 3, ([a, s, n]) => {
    n = Math.trunc(n);
    if (a <= 0 || a >= 1 || s <= 0 || n < 1) fail("CONFIDENCE", "alpha between 0 and 1, standard_dev above 0, size 1 or more");
    return (normalInv(1 - a / 2) * s) / Math.sqrt(n);
  }),
  "CONFIDENCE.T": dist(3, 3, ([a, s, n]) => {
    n = Math.trunc(n);
    if (a <= 0 || a >= 1 || s <= 0 || n < 1) fail("CONFIDENCE.T", "alpha between 0 and 1, standard_dev above 0, size 1 or more");
    if (n === 1) throw err("#DIV/0!", "CONFIDENCE.T needs a size of 2 or more");
    return (tInv(1 - a / 2, n - 1) * s) / Math.sqrt(n);
  }),
  "EXPON.DIST": dist(3, 3, ([x, l], args) => expon("EXPON.DIST", x, l, cumulativeArg(args, 2))),
  EXPONDIST: dist(3, 3, ([x, l], args) => expon("EXPONDIST", x, l, cumulativeArg(args, 2))),
  "F.DIST": dist(4, 4, ([x, d1, d2], args) => {
    d1 = dfOf(d1, "F.DIST");
    d2 = dfOf(d2, "F.DIST");
    if (x < 0) fail("F.DIST", "x must be 0 or more");
    return cumulativeArg(args, 3) ? fCdf(x, d1, d2) : fPdf(x, d1, d2);
  }),
  "F.DIST.RT": dist(3, 3, ([x, d1, d2]) => {
    if (x < 0) fail("F.DIST.RT", "x must be 0 or more");
    return fRight(x, dfOf(d1, "F.DIST.RT"), dfOf(d2, "F.DIST.RT"));
  }),
  FDIST: dist(3, 3, ([x, d1, d2]) => {
    if (x < 0) fail("FDIST", "x must be 0 or more");
    return fRight(x, dfOf(d1, "FDIST"), dfOf(d2, "FDIST"));
  }),
  "F.INV": dist(3, 3, ([p, d1, d2]) => fInv("F.INV", p, d1, d2, false)),
  "F.INV.RT": dist(3, 3, ([p, d1, d2]) => fInv("F.INV.RT", p, d1, d2, true)),
  FINV: dist(3, 3, ([p, d1, d2]) => fInv("FINV", p, d1, d2, true)),
  "GAMMA.DIST": dist(4, 4, ([x, a, b], args) => gammaDist("GAMMA.DIST", x, a, b, cumulativeArg(args, 3))),
  GAMMADIST: dist(4, 4, ([x, a, b], args) => gammaDist("GAMMADIST", x, a, b, cumulativeArg(args, 3))),
  "GAMMA.INV": dist(3, 3, ([p, a, b]) => gammaInv("GAMMA.INV", p, a, b)),
  GAMMAINV: dist(3, 3, ([p, a, b]) => gammaInv("GAMMAINV", p, a, b)),
  GAUSS: dist(1, 1, ([z]) => normalCdf(z) - 0.5),
  "HYPGEOM.DIST": dist(5, 5, ([k, n, K, N], args) => hypgeom("HYPGEOM.DIST", k, n, K, N, cumulativeArg(args, 4))),
  HYPGEOMDIST: dist(4, 4, ([k, n, K, N]) => hypgeom("HYPGEOMDIST", k, n, K, N, false)),
  "LOGNORM.DIST": dist(4, 4, ([x, m, s], args) => lognormDist("LOGNORM.DIST", x, m, s, cumulativeArg(args, 3))),
  LOGNORMDIST: dist(3, 3, ([x, m, s]) => lognormDist("LOGNORMDIST", x, m, s, true)),
  "LOGNORM.INV": dist(3, 3, ([p, m, s]) => {
    prob(p, "LOGNORM.INV");
    if (s <= 0) fail("LOGNORM.INV", "standard_dev must be above 0");
    return Math.exp(m + s * normalInv(p));
  }),
  LOGINV: dist(3, 3, ([p, m, s]) => {
    prob(p, "LOGINV");
    if (s <= 0) fail("LOGINV", "standard_dev must be above 0");
    return Math.exp(m + s * normalInv(p));
  }),
  "NEGBINOM.DIST": dist(4, 4, ([f, s, p], args) => negbinom("NEGBINOM.DIST", f, s, p, cumulativeArg(args, 3))),
  NEGBINOMDIST: dist(3, 3, ([f, s, p]) => negbinom("NEGBINOMDIST", f, s, p, false)),
  "NORM.DIST": dist(4, 4, ([x, m, s], args) => normDist("NORM.DIST", x, m, s, cumulativeArg(args, 3))),
  NORMDIST: dist(4, 4, ([x, m, s], args) => normDist("NORMDIST", x, m, s, cumulativeArg(args, 3))),
  "NORM.INV": dist(3, 3, ([p, m, s]) => {
    prob(p, "NORM.INV");
    if (s <= 0) fail("NORM.INV", "standard_dev must be above 0");
    return m + s * normalInv(p);
  }),
  NORMINV: dist(3, 3, ([p, m, s]) => {
    prob(p, "NORMINV");
    if (s <= 0) fail("NORMINV", "standard_dev must be above 0");
    return m + s * normalInv(p);
  }),
  "NORM.S.DIST": dist(2, 2, ([z], args) => (cumulativeArg(args, 1) ? normalCdf(z) : normalPdf(z))),
  NORMSDIST: dist(1, 1, ([z]) => normalCdf(z)),
  "NORM.S.INV": dist(1, 1, ([p]) => normalInv(prob(p, "NORM.S.INV"))),
  NORMSINV: dist(1, 1, ([p]) => normalInv(prob(p, "NORMSINV"))),
  PHI: dist(1, 1, ([z]) => normalPdf(z)),
  "POISSON.DIST": dist(3, 3, ([k, m], args) => poisson("POISSON.DIST", k, m, cumulativeArg(args, 2))),
  POISSON: dist(3, 3, ([k, m], args) => poisson("POISSON", k, m, cumulativeArg(args, 2))),
  "T.DIST": dist(3, 3, ([t, df], args) => {
    df = dfOf(df, "T.DIST");
    return cumulativeArg(args, 2) ? tCdf(t, df) : tPdf(t, df);
  }),
  "T.DIST.RT": dist(2, 2, ([t, df]) => {
    df = dfOf(df, "T.DIST.RT");
    const half = regularizedBeta(df / (df + t * t), df / 2, 0.5) / 2;
    return t > 0 ? half : 1 - half;
  }),
  "T.DIST.2T": dist(2, 2, ([t, df]) => {
    if (t < 0) fail("T.DIST.2T", "x must be 0 or more");
    df = dfOf(df, "T.DIST.2T");
    return regularizedBeta(df / (df + t * t), df / 2, 0.5);
  }),
  TDIST: dist(3, 3, ([t, df, tails]) => {
    if (t < 0) fail("TDIST", "x must be 0 or more");
    tails = Math.trunc(tails);
    if (tails !== 1 && tails !== 2) fail("TDIST", "tails is 1 or 2");
    df = dfOf(df, "TDIST");
    const two = regularizedBeta(df / (df + t * t), df / 2, 0.5);
    return tails === 2 ? two : two / 2;
  }),
  "T.INV": dist(2, 2, ([p, df]) => tInv(prob(p, "T.INV"), dfOf(df, "T.INV"))),
  "T.INV.2T": dist(2, 2, ([p, df]) => {
    if (p <= 0 || p > 1) fail("T.INV.2T", "probability must be above 0 and at most 1");
    return tInv(1 - p / 2, dfOf(df, "T.INV.2T"));
  }),
  TINV: dist(2, 2, ([p, df]) => {
    if (p <= 0 || p > 1) fail("TINV", "probability must be above 0 and at most 1");
    return tInv(1 - p / 2, dfOf(df, "TINV"));
  }),
  "WEIBULL.DIST": dist(4, 4, ([x, a, b], args) => weibull("WEIBULL.DIST", x, a, b, cumulativeArg(args, 3))),
  WEIBULL: dist(4, 4, ([x, a, b], args) => weibull("WEIBULL", x, a, b, cumulativeArg(args, 3))),
};

/**
 * Special functions for the statistical distributions and ERF, from their definitions
 * (Abramowitz & Stegun 6.5 and 26.5): the regularized incomplete gamma functions by their power
 * series and continued fraction (evaluated by the modified Lentz method), the regularized
 * incomplete beta function by its continued fraction, and inverses by bracketing and Newton
 * steps. Each converges to a relative step below 1e-15.
 */
import { logGamma } from "./stats";

const EPS = 1e-16;
const TINY = 1e-300;

/** Regularized lower incomplete gamma P(a, x). */
export function regularizedGammaP(a: number, x: number): number {
  if (x <= 0) return 0;
  if (x < a + 1) return gammaSeries(a, x);
  return 1 - gammaFraction(a, x);
}

/** Regularized upper incomplete gamma Q(a, x) = 1 - P(a, x). */
export function regularizedGammaQ(a: number, x: number): number {
  if (x <= 0) return 1;
  if (x < a + 1) return 1 - gammaSeries(a, x);
  return gammaFraction(a, x);
}

function gammaSeries(a: number, x: number): number {
  let term = 1 / a;
  let sum = term;
  for (let n = 1; n < 10000; n++) {
    term *= x / (a + n);
    sum += term;
    if (Math.abs(term) < Math.abs(sum) * EPS) break;
  }
  return sum * Math.exp(-x + a * Math.log(x) - logGamma(a));
}

function gammaFraction(a: number, x: number): number {
  let b = x + 1 - a;
  let c = 1 / TINY;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i < 10000; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < TINY) d = TINY;
    c = b + an / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) < EPS) break;
  }
  return Math.exp(-x + a * Math.log(x) - logGamma(a)) * h;
}

/** Regularized incomplete beta I_x(a, b). */
export function regularizedBeta(x: number, a: number, b: number): number {
  if (x <= 0) return 0;
  if (x >= 1) return 1;
  const front = Math.exp(logGamma(a + b) - logGamma(a) - logGamma(b) + a * Math.log(x) + b * Math.log(1 - x));
  if (x < (a + 1) / (a + b + 2)) return (front * betaFraction(x, a, b)) / a;
  return 1 - (front * betaFraction(1 - x, b, a)) / b;
}

function betaFraction(x: number, a: number, b: number): number {
  const qab = a + b;
  const qap = a + 1;
  const qam = a - 1;
  let c = 1;
  let d = 1 - (qab * x) / qap;
  if (Math.abs(d) < TINY) d = TINY;
  d = 1 / d;
  let h = d;
  for (let m = 1; m < 10000; m++) {
    const m2 = 2 * m;
    let aa = (m * (b - m) * x) / ((qam + m2) * (a + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + aa / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    h *= d * c;
    aa = (-(a + m) * (qab + m) * x) / ((a + m2) * (qap + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + aa / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) < EPS) break;
  }
  return h;
}

/** Standard normal distribution function Φ(z), from erfc: Φ(z) = erfc(-z/√2)/2. */
export function normalCdf(z: number): number {
  const x = -z / Math.SQRT2;
  const erfcx = x < 0 ? 2 - upperErfc(-x) : upperErfc(x);
  return erfcx / 2;
}

function upperErfc(x: number): number {
  // x ≥ 0
  if (x === 0) return 1;
  return x * x < 1.5 ? 1 - regularizedGammaP(0.5, x * x) : regularizedGammaQ(0.5, x * x);
}

export function normalPdf(z: number): number {
  return Math.exp(-0.5 * z * z) / Math.sqrt(2 * Math.PI);
}

/**
 * The x in [lo, hi] where an increasing function reaches p: bisection to a bracket, then
 * Newton's method (with the density) where it stays inside, to a relative step below 1e-15.
 */
export function invert(f: (x: number) => number, p: number, lo: number, hi: number, density?: (x: number) => number): number {
  // Widen the bracket where the upper end is open.
  for (let i = 0; i < 2000 && f(hi) < p; i++) {
    lo = hi;
    hi = hi * 2 + 1;
  }
  let x = (lo + hi) / 2;
  for (let i = 0; i < 400; i++) {
    const fx = f(x) - p;
    if (fx === 0) return x;
    if (fx < 0) lo = x;
    else hi = x;
    let next = (lo + hi) / 2;
    if (density) {
      const d = density(x);
      if (d > 0) {
        const newton = x - fx / d;
        if (newton > lo && newton < hi) next = newton;
      }
    }
    if (Math.abs(next - x) <= 1e-15 * Math.max(1, Math.abs(x)) || hi - lo <= 1e-15 * Math.max(1, Math.abs(x))) return next;
    x = next;
  }
  return x;
}

export function normalInv(p: number): number {
  return invert(normalCdf, p, -40, 40, normalPdf);
}

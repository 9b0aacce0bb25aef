/** Root finding on a bracket: Brent's method (Brent 1973, "Algorithms for Minimization without Derivatives", ch. 4). */

/** A root of f in [a, b] where f(a) and f(b) differ in sign, to about machine precision. */
function brentRoot(f: (x: number) => number, a: number, b: number, maxIterations = 200): number {
  let fa = f(a);
  let fb = f(b);
  if (fa === 0) return a;
  if (fb === 0) return b;
  if (fa * fb > 0) throw new RangeError("brentRoot: the bracket does not change sign");
  let c = a;
  let fc = fa;
  let d = b - a;
  let e = d;
  for (let i = 0; i < maxIterations; i++) {
    if (fb * fc > 0) {
      c = a;
      fc = fa;
      d = b - a;
      e = d;
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      a = b;
      b = c;
      c = a;
      fa = fb;
      fb = fc;
      fc = fa;
    }
    const tol = 2 * Number.EPSILON * Math.abs(b) + 1e-300;
    const m = 0.5 * (c - b);
    if (Math.abs(m) <= tol || fb === 0) return b;
    if (Math.abs(e) >= tol && Math.abs(fa) > Math.abs(fb)) {
      const s = fb / fa;
      let p: number;
      let q: number;
      if (a === c) {
        p = 2 * m * s;
        q = 1 - s;
      } else {
        const qq = fa / fc;
        const r = fb / fc;
        p = s * (2 * m * qq * (qq - r) - (b - a) * (r - 1));
        q = (qq - 1) * (r - 1) * (s - 1);
      }
      if (p > 0) q = -q;
      else p = -p;
      if (2 * p < Math.min(3 * m * q - Math.abs(tol * q), Math.abs(e * q))) {
        e = d;
        d = p / q;
      } else {
        d = m;
        e = m;
      }
    } else {
      d = m;
      e = m;
    }
    a = b;
    fa = fb;
    b += Math.abs(d) > tol ? d : m > 0 ? tol : -tol;
    fb = f(b);
  }
  return b;
}

/**
 * Every sign change of f on [a, b] found by sampling `samples` equal steps, each refined by
 * Brent's method. Returns the roots in increasing order.
 */
export function allRoots(f: (x: number) => number, a: number, b: number, samples = 200): number[] {
  return rootsOnGrid(f, Array.from({ length: samples + 1 }, (_, i) => a + ((b - a) * i) / samples));
}

/** Every sign change of f between consecutive points of an increasing grid, refined by Brent's method. */
export function rootsOnGrid(f: (x: number) => number, grid: readonly number[]): number[] {
  const roots: number[] = [];
  let x0 = grid[0];
  let f0 = f(x0);
  if (f0 === 0) roots.push(x0);
  for (let i = 1; i < grid.length; i++) {
    const x1 = grid[i];
    const f1 = f(x1);
    if (f1 === 0) roots.push(x1);
    else if (f0 !== 0 && f0 * f1 < 0) roots.push(brentRoot(f, x0, x1));
    x0 = x1;
    f0 = f1;
  }
  return roots;
}

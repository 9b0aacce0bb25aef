/**
 * Pump curves: a series of (flow, value) points evaluated between the points by
 *  - "pchip": the monotone piecewise cubic Hermite interpolant of Fritsch & Carlson (1980) with
 *    the weighted harmonic-mean slopes of Fritsch & Butland (1984) and the three-point end
 *    rule, as SLATEC PCHIM, MATLAB pchip and SciPy PchipInterpolator compute it; or
 *  - "quadratic" / "cubic": a least-squares polynomial through all the points.
 * Flows outside the points are an error, never an extrapolation.
 */
import { CalcError, quoted, step, type Step, type StepDimension } from "./_lib/result";
import { evaluatePolynomial, fitPolynomial } from "./_lib/leastSquares";

export const CURVE_FITS = ["pchip", "quadratic", "cubic"] as const;
type CurveFit = (typeof CURVE_FITS)[number];

/** Points of one quantity against flow. */
export interface Series {
  x: number[];
  y: number[];
}

/** A pump curve: head against flow, and optionally efficiency (fraction), NPSHr and power. */
export interface PumpCurve {
  head: Series;
  efficiency?: Series;
  npshr?: Series;
  power?: Series;
}


/** Derivatives at the points, as SciPy's PchipInterpolator._find_derivatives computes them. */
function pchipSlopes(x: readonly number[], y: readonly number[]): number[] {
  const n = x.length;
  const h: number[] = [];
  const m: number[] = [];
  for (let k = 0; k < n - 1; k++) {
    h.push(x[k + 1] - x[k]);
    m.push((y[k + 1] - y[k]) / h[k]);
  }
  if (n === 2) return [m[0], m[0]];
  const d = new Array<number>(n).fill(0);
  for (let k = 1; k < n - 1; k++) {
    if (Math.sign(m[k - 1]) !== Math.sign(m[k]) || m[k - 1] === 0 || m[k] === 0) {
      d[k] = 0;
    } else {
      const w1 = 2 * h[k] + h[k - 1];
      const w2 = h[k] + 2 * h[k - 1];
      d[k] = (w1 + w2) / (w1 / m[k - 1] + w2 / m[k]);
    }
  }
  d[0] = pchipEnd(h[0], h[1], m[0], m[1]);
  d[n - 1] = pchipEnd(h[n - 2], h[n - 3], m[n - 2], m[n - 3]);
  return d;
}

/** The three-point end slope, kept shape-preserving (SciPy's _edge_case; SLATEC PCHIM). */
function pchipEnd(h0: number, h1: number, m0: number, m1: number): number {
  let d = ((2 * h0 + h1) * m0 - h0 * m1) / (h0 + h1);
  if (Math.sign(d) !== Math.sign(m0)) d = 0;
  else if (Math.sign(m0) !== Math.sign(m1) && Math.abs(d) > 3 * Math.abs(m0)) d = 3 * m0;
  return d;
}

/** Evaluates the cubic Hermite interpolant with slopes d at xq (inside [x0, xn]). */
function hermite(x: readonly number[], y: readonly number[], d: readonly number[], xq: number): number {
  const k = bracket(x, xq);
  const h = x[k + 1] - x[k];
  const t = (xq - x[k]) / h;
  const t2 = t * t;
  const t3 = t2 * t;
  return (2 * t3 - 3 * t2 + 1) * y[k] + (t3 - 2 * t2 + t) * h * d[k] + (-2 * t3 + 3 * t2) * y[k + 1] + (t3 - t2) * h * d[k + 1];
}

/** A series ready to evaluate at any flow inside its range. */
export interface Interpolant {
  min: number;
  max: number;
  at(flow: number): number;
  /**
   * Flows at which to look for a crossing with another curve: the table's own points, with
   * intervals the curve rises over (or a least-squares fit's) split further, since only on a
   * falling PCHIP interval can a rising system curve cross at most once.
   */
  grid: number[];
  /**
   * How the value at a flow is obtained, as a reviewer checks it by hand: for PCHIP the two
   * points either side, t, the slopes there and the straight line between the points (for
   * comparison); for a least-squares fit its coefficients. `symbol` and `dim` name the column.
   */
  steps(flow: number, symbol: string, dim: StepDimension): Step[];
}

/** The index k of the interval [x_k, x_k+1] holding xq (the last one at the right end). */
function bracket(x: readonly number[], xq: number): number {
  let k = 0;
  let hi = x.length - 1;
  while (hi - k > 1) {
    const mid = (k + hi) >> 1;
    if (x[mid] <= xq) k = mid;
    else hi = mid;
  }
  return k;
}

/** Interpolants already built, by series and fit (a curve's series never change once checked). */
const interpolants = new WeakMap<Series, Map<CurveFit, Interpolant>>();

/** Builds the interpolant of a checked series by the chosen fit. */
export function interpolant(series: Series, fit: CurveFit = "pchip"): Interpolant {
  let byFit = interpolants.get(series);
  if (!byFit) interpolants.set(series, (byFit = new Map()));
  let f = byFit.get(fit);
  if (!f) byFit.set(fit, (f = buildInterpolant(series, fit)));
  return f;
}

function buildInterpolant(series: Series, fit: CurveFit): Interpolant {
  const { x, y } = series;
  const min = x[0];
  const max = x[x.length - 1];
  if (fit === "pchip") {
    const d = pchipSlopes(x, y);
    const steps = (q: number, symbol: string, dim: StepDimension): Step[] => {
      const k = bracket(x, q);
      const t = (q - x[k]) / (x[k + 1] - x[k]);
      const per = `per m³/s (base units)`;
      return [
        step("Q_k", "curve point at or below the flow", x[k], "flow", `point ${k + 1} of ${x.length}`),
        step("Q_k+1", "curve point above the flow", x[k + 1], "flow", `point ${k + 2} of ${x.length}`),
        step(`${symbol}_k`, "value at Q_k", y[k], dim, "from the table"),
        step(`${symbol}_k+1`, "value at Q_k+1", y[k + 1], dim, "from the table"),
        step("t", "position between the points", t, "ratio", "t = (Q − Q_k)/(Q_k+1 − Q_k)"),
        step("d_k", `slope at Q_k, ${per}`, d[k], "ratio", k === 0 ? "three-point end rule (SciPy PchipInterpolator)" : "weighted harmonic mean of the neighbouring secants (Fritsch–Butland)"),
        step("d_k+1", `slope at Q_k+1, ${per}`, d[k + 1], "ratio", k + 1 === x.length - 1 ? "three-point end rule (SciPy PchipInterpolator)" : "weighted harmonic mean of the neighbouring secants (Fritsch–Butland)"),
        step(`${symbol} (straight line)`, "straight line between the two points, for comparison", y[k] + t * (y[k + 1] - y[k]), dim, `${symbol}_k + t·(${symbol}_k+1 − ${symbol}_k)`),
      ];
    };
    return { min, max, at: (q) => hermite(x, y, d, q), grid: crossingGrid(x, (k) => y[k + 1] > y[k]), steps };
  }
  const degree = fit === "quadratic" ? 2 : 3;
  if (x.length < degree + 2) {
    throw new CalcError("fit", `a least-squares ${fit} needs at least ${degree + 2} points; the curve has ${x.length}`);
  }
  const poly = fitPolynomial(x, y, degree);
  const steps = (q: number, symbol: string): Step[] => [
    step("s", "scaled flow", (q - poly.centre) / poly.scale, "ratio", `s = (Q − Q_c)/Q_s with Q_c = ${poly.centre} and Q_s = ${poly.scale} m³/s, the middle and half-width of the curve's flows`),
    ...poly.coefficients.map((a, i) => step(`c${i}`, `coefficient of s^${i} in ${symbol}(s), base units`, a, "ratio", `least squares (${fit}) through the curve's ${x.length} points`)),
  ];
  return { min, max, at: (q) => evaluatePolynomial(poly, q), grid: crossingGrid(x, () => true), steps };
}

/** The table's flows, with each interval for which `split(k)` holds cut into eight. */
function crossingGrid(x: readonly number[], split: (k: number) => boolean): number[] {
  const grid = [x[0]];
  for (let k = 0; k < x.length - 1; k++) {
    const parts = split(k) ? 8 : 1;
    for (let j = 1; j <= parts; j++) grid.push(j === parts ? x[k + 1] : x[k] + ((x[k + 1] - x[k]) * j) / parts);
  }
  return grid;
}

/** Relative slack at the ends of a curve, so a flow read from the last point itself is inside. */
const RANGE_SLACK = 1e-9;

/** Value of a series at a flow, refusing flows outside the points. */
export function valueAt(arg: string, what: string, f: Interpolant, flow: number): number {
  const slack = RANGE_SLACK * Math.max(Math.abs(f.max), 1e-300);
  if (!(flow >= f.min - slack && flow <= f.max + slack)) {
    throw new CalcError(arg, `${quoted(flow, "flow")} is outside the ${what} curve (${quoted(f.min, "flow")} to ${quoted(f.max, "flow")}); values are never extrapolated`);
  }
  return f.at(Math.min(Math.max(flow, f.min), f.max));
}

/**
 * Sorts a series by flow and checks it: at least three points, no repeated flow, flows of zero
 * or more, values inside [lo, hi]. `what` names the column in messages.
 */
export function checkSeries(arg: string, what: string, x: readonly number[], y: readonly number[], lo: number, hi = Infinity): Series {
  if (x.length < 3) throw new CalcError(arg, `the ${what} column needs at least 3 points; it has ${x.length}`, "value");
  const order = x.map((_, i) => i).sort((a, b) => x[a] - x[b]);
  const xs = order.map((i) => x[i]);
  const ys = order.map((i) => y[i]);
  for (let i = 0; i < xs.length; i++) {
    if (!(Number.isFinite(xs[i]) && xs[i] >= 0)) throw new CalcError(arg, `flows must be zero or more; got ${xs[i]}`, "value");
    if (i > 0 && xs[i] === xs[i - 1]) throw new CalcError(arg, `the flow ${xs[i]} m³/s appears twice; each flow may appear once`, "value");
    if (!(Number.isFinite(ys[i]) && ys[i] >= lo && ys[i] <= hi)) {
      throw new CalcError(arg, `${what} ${ys[i]} at flow ${xs[i]} m³/s is out of range (expected ${lo} to ${hi})`, "value");
    }
  }
  return { x: xs, y: ys };
}

/**
 * A head curve may rise from shutoff to a peak and then must fall; one that falls and rises
 * again (two turning points) is not a pump curve.
 */
export function checkHeadShape(arg: string, head: Series): void {
  let falling = false;
  for (let i = 1; i < head.y.length; i++) {
    const dy = head.y[i] - head.y[i - 1];
    if (dy < 0) falling = true;
    else if (dy > 0 && falling) {
      throw new CalcError(arg, `head rises again at flow ${head.x[i]} m³/s after falling: a pump curve rises to one peak at most, then falls`, "value");
    }
  }
}


/** What each optional column of a curve is called, and the header that adds it. */
const COLUMN_NAMES: Record<keyof PumpCurve, [string, string]> = {
  head: ["head", "Head (m)"],
  efficiency: ["efficiency", "Eff (%)"],
  npshr: ["NPSHr", "NPSHr (ft)"],
  power: ["power", "Power (kW)"],
};

/** The interpolant of one column of a curve, or an error naming what is missing. */
export function curveInterpolant(arg: string, curve: PumpCurve, column: keyof PumpCurve, fit: CurveFit = "pchip"): Interpolant {
  const series = curve[column];
  if (!series) throw new CalcError(arg, `has no ${COLUMN_NAMES[column][0]} column: add one headed "${COLUMN_NAMES[column][1]}"`, "value");
  return interpolant(series, fit);
}

/** One impeller of a family: its size (in base units) or its label, and its curve. */
export interface Impeller {
  size: number | null;
  label: string;
  curve: PumpCurve;
}

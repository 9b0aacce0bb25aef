/** Least-squares polynomial fit by Householder QR (Golub & Van Loan, "Matrix Computations", §5.3). */

/**
 * Coefficients c0..c_degree of the polynomial minimising Σ(y − p(x))². The abscissae are
 * centred and scaled to [−1, 1] for conditioning; evaluate with `evaluatePolynomial`.
 */
interface PolynomialFit {
  coefficients: number[];
  centre: number;
  scale: number;
}

export function fitPolynomial(x: readonly number[], y: readonly number[], degree: number): PolynomialFit {
  const n = x.length;
  const cols = degree + 1;
  if (n < cols) throw new RangeError(`fitPolynomial: ${n} points cannot fix ${cols} coefficients`);
  const lo = Math.min(...x);
  const hi = Math.max(...x);
  const centre = (lo + hi) / 2;
  const scale = (hi - lo) / 2 || 1;
  const columns: number[][] = [];
  for (let j = 0; j < cols; j++) columns.push(x.map((v) => ((v - centre) / scale) ** j));
  try {
    return { coefficients: leastSquares(columns, y).coefficients, centre, scale };
  } catch {
    throw new RangeError("fitPolynomial: the points do not determine the polynomial");
  }
}

/**
 * Least squares of y on the given columns (each n values) by Householder QR: the coefficients,
 * and R, the upper-triangular factor (R[i][j] for i ≤ j), from which (AᵀA)⁻¹ = R⁻¹R⁻ᵀ follows.
 * Throws a RangeError when a column is zero after the reflections (the columns are dependent).
 */
export function leastSquares(columns: readonly (readonly number[])[], y: readonly number[]): { coefficients: number[]; r: number[][] } {
  const n = y.length;
  const cols = columns.length;
  // A is n × cols, stored by columns; b is a copy of y.
  const A = columns.map((c) => [...c]);
  const b = [...y];
  for (let k = 0; k < cols; k++) {
    let norm = 0;
    for (let i = k; i < n; i++) norm += A[k][i] * A[k][i];
    norm = Math.sqrt(norm);
    if (norm === 0) throw new RangeError("leastSquares: the columns are dependent");
    const alpha = A[k][k] > 0 ? -norm : norm;
    const v = new Array<number>(n).fill(0);
    for (let i = k; i < n; i++) v[i] = A[k][i];
    v[k] -= alpha;
    let vv = 0;
    for (let i = k; i < n; i++) vv += v[i] * v[i];
    if (vv === 0) continue;
    for (let j = k; j < cols; j++) {
      let dot = 0;
      for (let i = k; i < n; i++) dot += v[i] * A[j][i];
      const f = (2 * dot) / vv;
      for (let i = k; i < n; i++) A[j][i] -= f * v[i];
    }
    let dot = 0;
    for (let i = k; i < n; i++) dot += v[i] * b[i];
    const f = (2 * dot) / vv;
    for (let i = k; i < n; i++) b[i] -= f * v[i];
  }
  const c = new Array<number>(cols).fill(0);
  for (let k = cols - 1; k >= 0; k--) {
    let s = b[k];
    for (let j = k + 1; j < cols; j++) s -= A[j][k] * c[j];
    c[k] = s / A[k][k];
  }
  return { coefficients: c, r: Array.from({ length: cols }, (_, i) => Array.from({ length: cols }, (__, j) => (j >= i ? A[j][i] : 0))) };
}

export function evaluatePolynomial(fit: PolynomialFit, x: number): number {
  const t = (x - fit.centre) / fit.scale;
  let s = 0;
  for (let j = fit.coefficients.length - 1; j >= 0; j--) s = s * t + fit.coefficients[j];
  return s;
}

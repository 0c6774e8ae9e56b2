/**
 * Weighted linear least squares, y = a₀ + Σ aₖ·xₖ, with each point's 1σ as its weight (w = 1/σ²). Pure: no I/O.
 *
 * The coefficients solve the normal equations (XᵀWX)·a = XᵀWy and their covariance is (XᵀWX)⁻¹ — the matrix form
 * of the straight-line closed forms in Bevington & Robinson, "Data Reduction and Error Analysis for the Physical
 * Sciences", ch. 6–7 (from memory): for one regressor, Δ = S·Sxx − Sx², slope = (S·Sxy − Sx·Sy)/Δ, σ²(slope) = S/Δ.
 */

export interface WeightedPoint {
  /** The measured value. */
  y: number;
  /** Its 1σ, > 0. */
  sigma: number;
  /** The regressors' values for this point (the same count for every point). */
  x: readonly number[];
}

export interface WeightedFit {
  /** [a₀, a₁, …]: the intercept (at x = 0) then one slope per regressor. */
  coefficients: number[];
  /** 1σ of each coefficient from the stated uncertainties alone. */
  sigmas: number[];
  /** Covariance matrix of the coefficients, (XᵀWX)⁻¹. */
  covariance: number[][];
  /** Σ ((y − ŷ)/σ)². */
  chiSquare: number;
  /** Points minus coefficients. */
  degreesOfFreedom: number;
  /** chiSquare / degreesOfFreedom; null with no degree of freedom. */
  reducedChiSquare: number | null;
  /** Residuals y − ŷ in the order of the points. */
  residuals: number[];
}

/** Inverse of a small symmetric positive-definite matrix by Gauss–Jordan with partial pivoting; null when singular. */
function invert(matrix: number[][]): number[][] | null {
  const n = matrix.length;
  const a = matrix.map((row, i) => [...row, ...Array.from({ length: n }, (_, j) => (i === j ? 1 : 0))]);
  const scale = Math.max(...matrix.map((row, i) => Math.abs(row[i])));
  for (let col = 0; col < n; col++) {
    let pivot = col;
    for (let r = col + 1; r < n; r++) if (Math.abs(a[r][col]) > Math.abs(a[pivot][col])) pivot = r;
    // A pivot this small against the diagonal means a regressor with no spread (or two that move together).
    if (!(Math.abs(a[pivot][col]) > scale * 1e-13)) return null;
    [a[col], a[pivot]] = [a[pivot], a[col]];
    const p = a[col][col];
    for (let j = 0; j < 2 * n; j++) a[col][j] /= p;
    for (let r = 0; r < n; r++) {
      if (r === col) continue;
      const f = a[r][col];
      if (f === 0) continue;
      for (let j = 0; j < 2 * n; j++) a[r][j] -= f * a[col][j];
    }
  }
  return a.map((row) => row.slice(n));
}

/**
 * Fits y = a₀ + Σ aₖ·xₖ by weighted least squares.
 *
 * @param points - at least (regressors + 1) points, each with a finite y, a finite σ > 0 and the same number of x values.
 * @returns coefficients with their 1σ from the stated σ, the covariance, χ² and its degrees of freedom.
 * @throws RangeError when there are too few points, a σ is not above 0, the regressor counts differ, or the
 *   regressors have no spread (the normal matrix is singular).
 * @example weightedLinearFit([{ y: 1, sigma: 1, x: [0] }, { y: 3, sigma: 1, x: [1] }]).coefficients // [1, 2]
 */
export function weightedLinearFit(points: readonly WeightedPoint[]): WeightedFit {
  if (points.length === 0) throw new RangeError("weightedLinearFit needs at least one point; got none");
  const k = points[0].x.length;
  const n = k + 1;
  if (points.length < n) throw new RangeError(`weightedLinearFit needs at least ${n} points for ${k} regressors; got ${points.length}`);
  for (const [i, p] of points.entries()) {
    if (p.x.length !== k) throw new RangeError(`point ${i} has ${p.x.length} regressors; the first has ${k}`);
    if (!(p.sigma > 0) || !Number.isFinite(p.sigma)) throw new RangeError(`point ${i} sigma must be a finite number above 0; got ${p.sigma}`);
    if (!Number.isFinite(p.y) || p.x.some((v) => !Number.isFinite(v))) throw new RangeError(`point ${i} holds a value that is not finite`);
  }
  const normal = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  const rhs = new Array<number>(n).fill(0);
  for (const p of points) {
    const w = 1 / (p.sigma * p.sigma);
    const row = [1, ...p.x];
    for (let i = 0; i < n; i++) {
      rhs[i] += w * row[i] * p.y;
      for (let j = 0; j < n; j++) normal[i][j] += w * row[i] * row[j];
    }
  }
  const covariance = invert(normal);
  if (!covariance) throw new RangeError("weightedLinearFit: the regressors have no spread (the normal equations are singular)");
  const coefficients = covariance.map((row) => row.reduce((sum, c, j) => sum + c * rhs[j], 0));
  const residuals = points.map((p) => p.y - coefficients[0] - p.x.reduce((sum, v, j) => sum + coefficients[j + 1] * v, 0));
  const chiSquare = residuals.reduce((sum, r, i) => sum + (r / points[i].sigma) ** 2, 0);
  const degreesOfFreedom = points.length - n;
  return {
    coefficients,
    sigmas: covariance.map((row, i) => Math.sqrt(Math.max(row[i], 0))),
    covariance,
    chiSquare,
    degreesOfFreedom,
    reducedChiSquare: degreesOfFreedom > 0 ? chiSquare / degreesOfFreedom : null,
    residuals,
  };
}

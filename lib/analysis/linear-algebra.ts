/**
 * Solves G·x = b for a small symmetric positive (semi-)definite G by Cholesky factorisation.
 * A pivot that collapses below `relativeTolerance` of its diagonal marks a column the data cannot
 * tell apart from the others (for example a harmonic sitting on Nyquist); that unknown is set to 0
 * rather than letting round-off blow the others up.
 *
 * @param g - row-major n×n matrix (not modified)
 * @param b - right-hand side of length n (not modified)
 * @returns the solution x and the indices of the unknowns that were dropped
 */
export function solveSymmetric(
  g: Float64Array,
  b: Float64Array,
  relativeTolerance = 1e-13,
): { x: Float64Array; dropped: number[] } {
  const n = b.length;
  const l = new Float64Array(n * n);
  const dropped: number[] = [];
  const active = new Uint8Array(n).fill(1);
  for (let i = 0; i < n; i++) {
    let diagonal = g[i * n + i];
    for (let k = 0; k < i; k++) diagonal -= l[i * n + k] * l[i * n + k];
    if (!(diagonal > relativeTolerance * Math.abs(g[i * n + i])) || !(g[i * n + i] > 0)) {
      active[i] = 0;
      dropped.push(i);
      continue;
    }
    const root = Math.sqrt(diagonal);
    l[i * n + i] = root;
    for (let j = i + 1; j < n; j++) {
      let value = g[j * n + i];
      for (let k = 0; k < i; k++) value -= l[j * n + k] * l[i * n + k];
      l[j * n + i] = value / root;
    }
  }
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    if (!active[i]) continue;
    let value = b[i];
    for (let k = 0; k < i; k++) value -= l[i * n + k] * y[k];
    y[i] = value / l[i * n + i];
  }
  const x = new Float64Array(n);
  for (let i = n - 1; i >= 0; i--) {
    if (!active[i]) continue;
    let value = y[i];
    for (let k = i + 1; k < n; k++) value -= l[k * n + i] * x[k];
    x[i] = value / l[i * n + i];
  }
  return { x, dropped };
}

/**
 * One diagonal element of the inverse of a symmetric positive definite matrix, [G⁻¹]_ii, by
 * solving G·x = e_i. Used for the variance of one fitted parameter.
 */
export function inverseDiagonal(g: Float64Array, n: number, i: number): number {
  const e = new Float64Array(n);
  e[i] = 1;
  return solveSymmetric(g, e).x[i];
}

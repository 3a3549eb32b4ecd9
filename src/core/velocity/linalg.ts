/**
 * Small dense symmetric positive-definite systems (normal equations of the layer and joint fits):
 * Cholesky factor A = L L^T, forward and back substitution, and the inverse column by column (any
 * numerical linear algebra text, e.g. Golub & Van Loan, Matrix Computations, section 4.2).
 * Matrices are row-major Float64Arrays of n x n.
 */

/** Lower factor L of A, or null when A is not positive definite (a pivot at or below 1e-300). */
export function choleskyFactor(a: Float64Array, n: number): Float64Array | null {
  const l = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let s = a[i * n + j];
      for (let k = 0; k < j; k++) s -= l[i * n + k] * l[j * n + k];
      if (i === j) {
        if (!(s > 1e-300)) return null;
        l[i * n + i] = Math.sqrt(s);
      } else l[i * n + j] = s / l[j * n + j];
    }
  }
  return l;
}

/** x with L L^T x = b. */
export function choleskySolve(l: Float64Array, b: Float64Array, n: number): Float64Array {
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let s = b[i];
    for (let k = 0; k < i; k++) s -= l[i * n + k] * y[k];
    y[i] = s / l[i * n + i];
  }
  const x = new Float64Array(n);
  for (let i = n - 1; i >= 0; i--) {
    let s = y[i];
    for (let k = i + 1; k < n; k++) s -= l[k * n + i] * x[k];
    x[i] = s / l[i * n + i];
  }
  return x;
}

/** Solution of A x = b and the inverse of A (the covariance of a least-squares fit), or null when A is singular. */
export function solveSpd(a: Float64Array, b: Float64Array, n: number): { x: Float64Array; inv: Float64Array } | null {
  const l = choleskyFactor(a, n);
  if (!l) return null;
  const inv = new Float64Array(n * n);
  for (let j = 0; j < n; j++) {
    const e = new Float64Array(n);
    e[j] = 1;
    const c = choleskySolve(l, e, n);
    for (let i = 0; i < n; i++) inv[i * n + j] = c[i];
  }
  return { x: choleskySolve(l, b, n), inv };
}

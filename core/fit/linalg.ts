/**
 * Small dense linear algebra for the fitter: systems of at most about ten unknowns, solved thousands of
 * times per fit, on flat row-major Float64Arrays (no allocation in the hot paths). Tests check them
 * against ml-matrix, a general-purpose linear-algebra library.
 *
 * Method: Cholesky factorisation (any numerical-analysis text, e.g. Golub & Van Loan, *Matrix
 * Computations*, §4.2) with a tiny ridge on a pivot that is not positive relative to the largest diagonal
 * entry, so a singular direction (an inactive parameter, a segment with no weight) gives a zero
 * component instead of an exception.
 */

/** Relative size of the ridge put on a non-positive pivot. */
const RIDGE = 1e-13;

/**
 * Factorises the symmetric positive (semi-)definite n×n matrix M into L (lower, row-major, n×n) in place
 * of `L`. Returns false when M is all zeros.
 */
export function cholesky(M: ArrayLike<number>, n: number, L: Float64Array): boolean {
  let scale = 0;
  for (let i = 0; i < n; i++) scale = Math.max(scale, Math.abs(M[i * n + i]));
  if (!(scale > 0)) {
    L.fill(0, 0, n * n);
    return false;
  }
  for (let i = 0; i < n * n; i++) L[i] = M[i];
  for (let j = 0; j < n; j++) {
    let d = L[j * n + j];
    for (let k = 0; k < j; k++) d -= L[j * n + k] * L[j * n + k];
    if (d <= scale * RIDGE) d = scale * RIDGE;
    const ljj = Math.sqrt(d);
    L[j * n + j] = ljj;
    for (let i = j + 1; i < n; i++) {
      let s = L[i * n + j];
      for (let k = 0; k < j; k++) s -= L[i * n + k] * L[j * n + k];
      L[i * n + j] = s / ljj;
    }
    for (let k = j + 1; k < n; k++) L[j * n + k] = 0;
  }
  return true;
}

/** Solves L·Lᵀ·x = v with a factor from cholesky; x may be v. */
export function choleskySolve(L: Float64Array, n: number, v: ArrayLike<number>, x: Float64Array): void {
  for (let i = 0; i < n; i++) {
    let s = v[i];
    for (let k = 0; k < i; k++) s -= L[i * n + k] * x[k];
    x[i] = s / L[i * n + i];
  }
  for (let i = n - 1; i >= 0; i--) {
    let s = x[i];
    for (let k = i + 1; k < n; k++) s -= L[k * n + i] * x[k];
    x[i] = s / L[i * n + i];
  }
}

/** x = M⁻¹·v for a symmetric positive (semi-)definite M (n×n); zeros for an all-zero M. */
export function solveSym(M: ArrayLike<number>, n: number, v: ArrayLike<number>, x: Float64Array = new Float64Array(n), L: Float64Array = new Float64Array(n * n)): Float64Array {
  if (!cholesky(M, n, L)) {
    x.fill(0, 0, n);
    return x;
  }
  choleskySolve(L, n, v, x);
  return x;
}

/** The inverse of a symmetric positive (semi-)definite n×n matrix, row-major. */
export function inverseSym(M: ArrayLike<number>, n: number): Float64Array {
  const L = new Float64Array(n * n);
  const inv = new Float64Array(n * n);
  if (!cholesky(M, n, L)) return inv;
  const e = new Float64Array(n);
  const x = new Float64Array(n);
  for (let c = 0; c < n; c++) {
    e.fill(0);
    e[c] = 1;
    choleskySolve(L, n, e, x);
    for (let r = 0; r < n; r++) inv[r * n + c] = x[r];
  }
  return inv;
}

/** Solves the symmetric system given as nested arrays (for tests and small one-off uses). */
export function solveSymmetric(M: number[][], v: number[]): number[] {
  const n = v.length;
  const flat = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) flat[i * n + j] = M[i][j];
  return Array.from(solveSym(flat, n, v));
}

/**
 * Cholesky factorisation, solve and inverse for the small symmetric positive-definite systems
 * (p ≤ 4 or so) of the least-squares solver. Matrices are row-major Float64Arrays of size p×p.
 * Algorithm: Golub & Van Loan, Matrix Computations (4th ed. 2013), Algorithm 4.2.1.
 * For anything larger, use ml-matrix (CholeskyDecomposition); at this size the allocation-free
 * loops below are what makes thousands of fits per second possible.
 */

/** In-place Cholesky A = L·Lᵀ (lower triangle written into `a`). Returns false if A is not
 * numerically positive definite. */
export function choleskyInPlace(a: Float64Array, p: number): boolean {
  for (let j = 0; j < p; j++) {
    let s = a[j * p + j]!;
    for (let k = 0; k < j; k++) s -= a[j * p + k]! * a[j * p + k]!;
    if (!(s > 0) || !Number.isFinite(s)) return false;
    const ljj = Math.sqrt(s);
    a[j * p + j] = ljj;
    for (let i = j + 1; i < p; i++) {
      let t = a[i * p + j]!;
      for (let k = 0; k < j; k++) t -= a[i * p + k]! * a[j * p + k]!;
      a[i * p + j] = t / ljj;
    }
  }
  return true;
}

/** Solves L·Lᵀ·x = b in place in `b`, with L from choleskyInPlace. */
export function choleskySolveInPlace(l: Float64Array, p: number, b: Float64Array): void {
  for (let i = 0; i < p; i++) {
    let s = b[i]!;
    for (let k = 0; k < i; k++) s -= l[i * p + k]! * b[k]!;
    b[i] = s / l[i * p + i]!;
  }
  for (let i = p - 1; i >= 0; i--) {
    let s = b[i]!;
    for (let k = i + 1; k < p; k++) s -= l[k * p + i]! * b[k]!;
    b[i] = s / l[i * p + i]!;
  }
}

// Scratch for the inverse (p ≤ 16), so batch fits do not allocate typed arrays per call.
const scratchScale = new Float64Array(16);
const scratchL = new Float64Array(256);
const scratchCol = new Float64Array(16);

/** Inverse of a symmetric positive-definite p×p matrix (row-major, as a plain array), or null
 * when it is singular. The input is not modified. Relative conditioning guard: a pivot below
 * 1e-14 of its diagonal counts as singular, because the resulting variances would be meaningless. */
export function symmetricPositiveDefiniteInverse(a: ArrayLike<number>, p: number): number[] | null {
  const big = p > 16;
  const scale = big ? new Float64Array(p) : scratchScale;
  const l = big ? new Float64Array(p * p) : scratchL;
  const col = big ? new Float64Array(p) : scratchCol;
  // Scale to unit diagonal first (Jacobi preconditioning) so the singularity test is relative.
  for (let i = 0; i < p; i++) {
    const d = a[i * p + i]!;
    if (!(d > 0) || !Number.isFinite(d)) return null;
    scale[i] = 1 / Math.sqrt(d);
  }
  for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) l[i * p + j] = a[i * p + j]! * scale[i]! * scale[j]!;
  if (!choleskyInPlace(l, p)) return null;
  for (let i = 0; i < p; i++) if (l[i * p + i]! < 1e-7) return null; // pivot² < 1e-14
  const inv: number[] = new Array<number>(p * p).fill(0);
  for (let j = 0; j < p; j++) {
    col.fill(0, 0, p);
    col[j] = 1;
    choleskySolveInPlace(l, p, col);
    for (let i = 0; i < p; i++) inv[i * p + j] = col[i]! * scale[i]! * scale[j]!;
  }
  return inv;
}

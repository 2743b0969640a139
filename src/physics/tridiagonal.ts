/**
 * Tridiagonal linear solver (Thomas algorithm), allocation-free.
 *
 * Row i reads  sub[i] x[i-1] + diag[i] x[i] + sup[i] x[i+1] = rhs[i]  for i = 0 .. n-1
 * (sub[0] and sup[n-1] are ignored). No pivoting: meant for the diagonally dominant (or nearly so)
 * systems of the conductive column. The caller owns every buffer, so the solver is safe to use
 * from any thread.
 */

/**
 * Solve a tridiagonal system in place with the Thomas algorithm.
 *
 * @param sub sub-diagonal, length >= n (sub[0] unused); not modified
 * @param diag main diagonal, length >= n; not modified
 * @param sup super-diagonal, length >= n (sup[n-1] unused); not modified
 * @param rhs right-hand side, length >= n; overwritten with the solution x
 * @param scratch work array, length >= n (holds the modified super-diagonal)
 * @param n number of unknowns
 * @returns true on success; false if a pivot vanished or the solution is not finite
 *   (rhs then holds garbage and must not be used)
 */
export function solveTridiagonal(
  sub: Float64Array,
  diag: Float64Array,
  sup: Float64Array,
  rhs: Float64Array,
  scratch: Float64Array,
  n: number,
): boolean {
  if (n <= 0) return true;
  let pivot = diag[0];
  if (!(Math.abs(pivot) > 0)) return false;
  scratch[0] = sup[0] / pivot;
  rhs[0] = rhs[0] / pivot;
  for (let i = 1; i < n; i++) {
    const a = sub[i];
    pivot = diag[i] - a * scratch[i - 1];
    if (!(Math.abs(pivot) > 0)) return false;
    scratch[i] = sup[i] / pivot;
    rhs[i] = (rhs[i] - a * rhs[i - 1]) / pivot;
  }
  for (let i = n - 2; i >= 0; i--) rhs[i] -= scratch[i] * rhs[i + 1];
  for (let i = 0; i < n; i++) if (!Number.isFinite(rhs[i])) return false;
  return true;
}

/**
 * The little dense linear algebra the barrier method needs, for a handful of variables: Cholesky
 * solves (with a diagonal shift when a Hessian is not positive definite) and a null-space basis of
 * one linear equality row.
 */

/**
 * Solves (M + shift·I)·x = b by Cholesky, M symmetric n × n row-major; null if not positive definite.
 * Cost: O(n³/3).
 */
export function choleskySolve(matrix: Float64Array, rhs: Float64Array, shift = 0): Float64Array | null {
  const n = rhs.length;
  const lower = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let sum = matrix[i * n + j] + (i === j ? shift : 0);
      for (let k = 0; k < j; k++) sum -= lower[i * n + k] * lower[j * n + k];
      if (i === j) {
        if (!(sum > 0)) return null;
        lower[i * n + i] = Math.sqrt(sum);
      } else lower[i * n + j] = sum / lower[j * n + j];
    }
  }
  const solution = Float64Array.from(rhs);
  for (let i = 0; i < n; i++) {
    for (let k = 0; k < i; k++) solution[i] -= lower[i * n + k] * solution[k];
    solution[i] /= lower[i * n + i];
  }
  for (let i = n - 1; i >= 0; i--) {
    for (let k = i + 1; k < n; k++) solution[i] -= lower[k * n + i] * solution[k];
    solution[i] /= lower[i * n + i];
  }
  return solution;
}

/**
 * Solves M·x = b for symmetric M, adding the smallest shift (from 1e-12 of the diagonal's scale,
 * ×10 each try) that makes it positive definite when it is not — the Levenberg–Marquardt safeguard
 * that keeps a Newton step a descent direction on a non-convex function.
 */
export function shiftedSolve(matrix: Float64Array, rhs: Float64Array): { solution: Float64Array; shift: number } {
  const direct = choleskySolve(matrix, rhs);
  if (direct) return { solution: direct, shift: 0 };
  const n = rhs.length;
  let scale = 0;
  for (let i = 0; i < n; i++) scale = Math.max(scale, Math.abs(matrix[i * n + i]));
  let shift = Math.max(scale, 1e-300) * 1e-12;
  for (let attempt = 0; attempt < 40; attempt++, shift *= 10) {
    const solution = choleskySolve(matrix, rhs, shift);
    if (solution) return { solution, shift };
  }
  // A matrix no shift fixes has non-finite entries: a gradient step is the honest fallback.
  return { solution: Float64Array.from(rhs, (value) => value / Math.max(scale, 1)), shift: Infinity };
}

/**
 * A basis Z (n × (n−1), column-major list of columns) of {d : rowᵀd = 0}: eᵢ − (rowᵢ/row_k)e_k for
 * every i ≠ k, k the largest entry. Not orthonormal; Newton's method does not need it to be.
 */
export function nullSpaceOfRow(row: Float64Array): Float64Array[] {
  const n = row.length;
  let pivot = 0;
  for (let i = 1; i < n; i++) if (Math.abs(row[i]) > Math.abs(row[pivot])) pivot = i;
  const basis: Float64Array[] = [];
  for (let i = 0; i < n; i++) {
    if (i === pivot) continue;
    const column = new Float64Array(n);
    column[i] = 1;
    column[pivot] = -row[i] / row[pivot];
    basis.push(column);
  }
  return basis;
}

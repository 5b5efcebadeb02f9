/**
 * Column equilibration: each column of X (and y) is multiplied by a power of two that brings its
 * Euclidean norm near 1. Scaling by powers of two is exact in binary floating point, so the scaled
 * problem has exactly the same solution (up to the same scale) — yet Householder QR's error, which
 * depends on the condition number of the column-scaled matrix, no longer suffers from columns of
 * wildly different size (x and x¹⁰ in a polynomial, dollars and percentages in marketing data).
 * Reference: A. van der Sluis, "Condition numbers and equilibration of matrices", Numerische
 * Mathematik 14 (1969): column scaling to equal norms is within a factor √p of optimal.
 *
 * The same pass checks every value is finite, so the factorisation never meets NaN or Infinity.
 */

/** Rows sampled to choose a column's scale: enough for its magnitude, far fewer than n. */
export const scaleSampleRows = 4096;

/**
 * The exact power-of-two factor that brings a column's root-mean-square value times √n — its
 * norm — to about 1, estimated from an evenly spaced sample of rows (a full pass only when the
 * sample is all zeros). Equilibration need not be exact to work, only exact in arithmetic, so a
 * sample saves a pass over the data. Non-finite values are caught later, from R.
 *
 * Cost: O(min(n, 4,096)).
 */
export function equilibratingScale(values: Float64Array): number {
  const rowCount = values.length;
  const stride = Math.max(1, Math.floor(rowCount / scaleSampleRows));
  let sumOfSquares = 0;
  let sampled = 0;
  for (let row = 0; row < rowCount; row += stride) {
    const value = values[row];
    sumOfSquares += value * value;
    sampled += 1;
  }
  if (sumOfSquares === 0 && stride > 1) {
    for (let row = 0; row < rowCount; row++) sumOfSquares += values[row] * values[row];
    sampled = rowCount;
  }
  return scaleFromNorm(Math.sqrt((sumOfSquares / sampled) * rowCount));
}

/** 2^−round(log₂ norm), clamped so the factor stays a normal double; 1 for zero or non-finite norms. */
export function scaleFromNorm(norm: number): number {
  if (!(norm > 0) || !Number.isFinite(norm)) return 1;
  const exponent = Math.min(1000, Math.max(-1000, -Math.round(Math.log2(norm))));
  return 2 ** exponent;
}

/**
 * Throws naming the first non-finite value among the columns (called when R came out non-finite:
 * any NaN or infinity in the data reaches R's diagonal). Cost: O(np) in the worst case.
 */
export function assertFinite(columns: readonly Float64Array[], names: readonly string[], caller: string): void {
  columns.forEach((values, index) => {
    for (let row = 0; row < values.length; row++) {
      if (!Number.isFinite(values[row])) {
        throw new Error(`${caller} requires finite values ('${names[index]}' row ${row} is ${values[row]})`);
      }
    }
  });
}

/** Whether every value equals the first (a constant column). Cost: O(n), usually O(1). */
export function isConstant(values: Float64Array): boolean {
  const first = values[0];
  for (let row = 1; row < values.length; row++) if (values[row] !== first) return false;
  return true;
}

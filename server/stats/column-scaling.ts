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

/** What one pass over a column learns. */
export interface ColumnSummary {
  /** Euclidean norm of the column. */
  norm: number;
  /** Power-of-two factor that brings the norm into [1/√2, √2]; 1 for a zero column. */
  scale: number;
  minimum: number;
  maximum: number;
}

/**
 * Norm, range and exact equilibrating scale of a column.
 *
 * @throws naming the column and row of the first non-finite value
 * Cost: O(n).
 */
export function summariseColumn(values: Float64Array, name: string, caller: string): ColumnSummary {
  let sumOfSquares = 0;
  let largestMagnitude = 0;
  let minimum = Infinity;
  let maximum = -Infinity;
  for (let row = 0; row < values.length; row++) {
    const value = values[row];
    sumOfSquares += value * value;
    if (value < minimum) minimum = value;
    if (value > maximum) maximum = value;
  }
  if (!Number.isFinite(minimum) || !Number.isFinite(maximum) || Number.isNaN(sumOfSquares)) {
    const row = values.findIndex((value) => !Number.isFinite(value));
    throw new Error(`${caller} requires finite values ('${name}' row ${row} is ${values[row]})`);
  }
  largestMagnitude = Math.max(Math.abs(minimum), Math.abs(maximum));
  // Squares of values beyond ~1e154 overflow; the largest magnitude then stands in for the norm
  // (within a factor √n, which only loosens the equilibration a little).
  const norm = Number.isFinite(sumOfSquares) && (sumOfSquares > 0 || largestMagnitude === 0)
    ? Math.sqrt(sumOfSquares)
    : largestMagnitude;
  // Clamped so the factor itself stays a normal double even for subnormal or huge columns.
  const exponent = Math.min(1000, Math.max(-1000, -Math.round(Math.log2(norm))));
  const scale = norm === 0 ? 1 : 2 ** exponent;
  return { norm, scale, minimum, maximum };
}

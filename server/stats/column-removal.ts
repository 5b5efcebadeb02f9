/**
 * Deleting a column from a QR factorisation: after the column is removed, R is upper Hessenberg
 * from that column on, and one Givens rotation per later column restores the triangle.
 * Reference: Golub & Van Loan, Matrix Computations (4th ed.), §5.1.8 (Givens rotations) and
 * §6.5.2 (deleting a column).
 *
 * Used for rank deficiency: a column whose R diagonal is negligible is (numerically) a linear
 * combination of the columns before it, so it is reported as aliased and removed; the rotations
 * also carry the appended outcome column, so Qᵀy and the residual norm stay consistent.
 */

/**
 * Returns the (q − 1) × (q − 1) upper-triangular factor of the matrix without column `removed`.
 * `upper` is q × q row-major; it is not modified. Cost: O(q²) per later column.
 */
export function removeColumnFromUpperTriangular(upper: Float64Array, size: number, removed: number): Float64Array {
  const newSize = size - 1;
  // Work on a size × newSize copy without the removed column (still `size` rows).
  const work = new Float64Array(size * newSize);
  for (let row = 0; row < size; row++) {
    for (let column = 0, target = 0; column < size; column++) {
      if (column === removed) continue;
      work[row * newSize + target] = upper[row * size + column];
      target += 1;
    }
  }
  // Column c (c ≥ removed) now has one entry below the diagonal, at row c + 1: rotate it away.
  for (let column = removed; column < newSize; column++) {
    const top = work[column * newSize + column];
    const bottom = work[(column + 1) * newSize + column];
    if (bottom === 0) continue;
    const radius = Math.hypot(top, bottom);
    const cosine = top / radius;
    const sine = bottom / radius;
    for (let target = column; target < newSize; target++) {
      const upperValue = work[column * newSize + target];
      const lowerValue = work[(column + 1) * newSize + target];
      work[column * newSize + target] = cosine * upperValue + sine * lowerValue;
      work[(column + 1) * newSize + target] = -sine * upperValue + cosine * lowerValue;
    }
    work[(column + 1) * newSize + column] = 0;
  }
  // The last row is now zero; drop it.
  return work.slice(0, newSize * newSize);
}

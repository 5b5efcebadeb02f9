/**
 * Condition number of the column-scaled design: κ = σ_max / σ_min of X·D⁻¹, where D holds the
 * columns' Euclidean norms (so every column has norm 1). It measures collinearity that rescaling
 * cannot remove; Belsley, Kuh & Welsch (Regression Diagnostics, 1980, ch. 3) read κ above about 30
 * as a sign of harmful collinearity. It also bounds the solver's accuracy: Householder QR loses
 * about log₁₀ κ digits (and up to 2 log₁₀ κ when residuals are large), which is what decides
 * whether iterative refinement runs.
 *
 * Computed from the small factor R (XD⁻¹ = Q·RD⁻¹ has the same singular values), never from the data.
 */

import { Matrix, SingularValueDecomposition } from "ml-matrix";

/**
 * κ₂ of the upper-triangular R after normalising each of its columns to unit length.
 * Cost: O(p³) (a singular value decomposition of a p × p matrix).
 */
export function scaledConditionNumber(upper: Float64Array, size: number): number {
  if (size === 0) return NaN;
  const normalised = new Matrix(size, size);
  for (let column = 0; column < size; column++) {
    let sumOfSquares = 0;
    for (let row = 0; row <= column; row++) sumOfSquares += upper[row * size + column] ** 2;
    const norm = Math.sqrt(sumOfSquares);
    for (let row = 0; row <= column; row++) normalised.set(row, column, upper[row * size + column] / norm);
  }
  const singularValues = new SingularValueDecomposition(normalised, {
    computeLeftSingularVectors: false,
    computeRightSingularVectors: false,
  }).diagonal;
  const largest = Math.max(...singularValues);
  const smallest = Math.min(...singularValues);
  return smallest === 0 ? Infinity : largest / smallest;
}

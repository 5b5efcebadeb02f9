/**
 * One blocked pass over the observations that forms, for each row i, the vector
 * uᵢ = R⁻ᵀxᵢ (the row of Q = XR⁻¹) and the residual rᵢ. Every per-observation diagnostic is a
 * function of these: the leverage hᵢ = ‖uᵢ‖², and the sandwich covariances, which in these
 * coordinates are R⁻¹(Σ wᵢⱼ uᵢuⱼᵀ)R⁻ᵀ. Working on row blocks of 1,024 keeps the pass in cache
 * while the data stay column-major.
 */

import type { LeastSquaresSolution } from "./solve-least-squares";

/** Rows per block of the diagnostic pass. */
export const diagnosticRowsPerBlock = 1024;

/** One block as consumers see it (buffers are reused between blocks: copy what you keep). */
export interface RowBlock {
  /** Index of the block's first observation. */
  start: number;
  /** Rows in the block. */
  count: number;
  /** U = X_block R⁻¹, count × rank, column-major. */
  transformed: Float64Array;
  /** Residuals of the block's rows. */
  residuals: Float64Array;
  /** Leverages of the block's rows. */
  leverages: Float64Array;
}

/**
 * Computes residuals and leverages for every observation and hands each block to `visitors`
 * (covariance accumulators). When the solver already produced refined residuals they are used;
 * otherwise rᵢ = yᵢ − xᵢβ in doubles.
 *
 * Cost: n·rank² flops for U plus 2n·rank for residuals; memory 2n doubles for the outputs and
 * 1,024 × rank for the block.
 */
export function passOverRows(
  solution: LeastSquaresSolution,
  visitors: readonly ((block: RowBlock) => void)[],
): { residuals: Float64Array; leverages: Float64Array } {
  const { design, estimableColumns, inverseUpper, rank, refinedResiduals, estimates } = solution;
  const { rowCount, values, outcome } = design;
  const columns = estimableColumns.map((column) => values.subarray(column * rowCount, (column + 1) * rowCount));
  const coefficients = estimableColumns.map((column) => estimates[column]);
  const residuals = refinedResiduals ?? new Float64Array(rowCount);
  const leverages = new Float64Array(rowCount);
  const transformed = new Float64Array(Math.min(diagnosticRowsPerBlock, rowCount) * rank);
  for (let start = 0; start < rowCount; start += diagnosticRowsPerBlock) {
    const count = Math.min(diagnosticRowsPerBlock, rowCount - start);
    const end = start + count;
    transformed.fill(0, 0, count * rank);
    // U[:, k] = Σ_{j ≤ k} X[:, j] (R⁻¹)ⱼₖ, one axpy per non-zero of the triangle.
    for (let inner = 0; inner < rank; inner++) {
      const column = columns[inner];
      for (let target = inner; target < rank; target++) {
        const factor = inverseUpper[inner * rank + target];
        const offset = target * count - start;
        for (let row = start; row < end; row++) transformed[offset + row] += column[row] * factor;
      }
    }
    if (refinedResiduals === null) {
      for (let row = start; row < end; row++) residuals[row] = outcome[row];
      for (let inner = 0; inner < rank; inner++) {
        const column = columns[inner];
        const coefficient = coefficients[inner];
        for (let row = start; row < end; row++) residuals[row] -= column[row] * coefficient;
      }
    }
    for (let target = 0; target < rank; target++) {
      const offset = target * count - start;
      for (let row = start; row < end; row++) leverages[row] += transformed[offset + row] ** 2;
    }
    if (visitors.length > 0) {
      const block: RowBlock = {
        start,
        count,
        transformed,
        residuals: residuals.subarray(start, end),
        leverages: leverages.subarray(start, end),
      };
      for (const visit of visitors) visit(block);
    }
  }
  return { residuals, leverages };
}

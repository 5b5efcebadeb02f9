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
    // U[:, k] = Σ_{j ≤ k} X[:, j] (R⁻¹)ⱼₖ, four source columns per sweep so each entry of U is
    // loaded and stored once per four multiply-adds; hᵢ accumulates ‖uᵢ‖² column by column.
    for (let target = 0; target < rank; target++) {
      const offset = target * count - start;
      transformed.fill(0, target * count, (target + 1) * count);
      let inner = 0;
      for (; inner + 3 <= target; inner += 4) {
        const columnA = columns[inner];
        const columnB = columns[inner + 1];
        const columnC = columns[inner + 2];
        const columnD = columns[inner + 3];
        const factorA = inverseUpper[inner * rank + target];
        const factorB = inverseUpper[(inner + 1) * rank + target];
        const factorC = inverseUpper[(inner + 2) * rank + target];
        const factorD = inverseUpper[(inner + 3) * rank + target];
        for (let row = start; row < end; row++) {
          transformed[offset + row] +=
            columnA[row] * factorA + columnB[row] * factorB + columnC[row] * factorC + columnD[row] * factorD;
        }
      }
      for (; inner <= target; inner++) {
        const column = columns[inner];
        const factor = inverseUpper[inner * rank + target];
        for (let row = start; row < end; row++) transformed[offset + row] += column[row] * factor;
      }
      for (let row = start; row < end; row++) {
        const value = transformed[offset + row];
        leverages[row] += value * value;
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

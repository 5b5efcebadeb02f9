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
    computeTransformedBlock(columns, inverseUpper, rank, transformed, start, count);
    // hᵢ = ‖uᵢ‖², four columns of U per sweep.
    let target = 0;
    for (; target + 3 < rank; target += 4) {
      const offsetA = target * count - start;
      const offsetB = offsetA + count;
      const offsetC = offsetB + count;
      const offsetD = offsetC + count;
      for (let row = start; row < end; row++) {
        const a = transformed[offsetA + row];
        const b = transformed[offsetB + row];
        const c = transformed[offsetC + row];
        const d = transformed[offsetD + row];
        leverages[row] += a * a + b * b + c * c + d * d;
      }
    }
    for (; target < rank; target++) {
      const offset = target * count - start;
      for (let row = start; row < end; row++) {
        const value = transformed[offset + row];
        leverages[row] += value * value;
      }
    }
    if (refinedResiduals === null) {
      // r = y − Σⱼ xⱼβⱼ, four columns per sweep.
      for (let row = start; row < end; row++) residuals[row] = outcome[row];
      let inner = 0;
      for (; inner + 3 < rank; inner += 4) {
        const [columnA, columnB, columnC, columnD] = [columns[inner], columns[inner + 1], columns[inner + 2], columns[inner + 3]];
        const [betaA, betaB, betaC, betaD] = [coefficients[inner], coefficients[inner + 1], coefficients[inner + 2], coefficients[inner + 3]];
        for (let row = start; row < end; row++) {
          residuals[row] -= columnA[row] * betaA + columnB[row] * betaB + columnC[row] * betaC + columnD[row] * betaD;
        }
      }
      for (; inner < rank; inner++) {
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

/**
 * U_block = X_block R⁻¹ (count × rank, column-major) for rows [start, start + count).
 *
 * Tiles of 4 target columns × 4 source columns: each row loads four x values and four partial
 * sums of U, does sixteen multiply-adds and stores four sums — a quarter of the memory traffic
 * per flop of one axpy at a time. R⁻¹ is upper triangular, so tiles below its diagonal are
 * skipped and the zeros inside diagonal tiles are multiplied through.
 */
function computeTransformedBlock(
  columns: readonly Float64Array[],
  inverseUpper: Float64Array,
  rank: number,
  transformed: Float64Array,
  start: number,
  count: number,
): void {
  const end = start + count;
  transformed.fill(0, 0, count * rank);
  const factor = (inner: number, target: number) => (inner <= target ? inverseUpper[inner * rank + target] : 0);
  for (let targetStart = 0; targetStart < rank; targetStart += 4) {
    const targetCount = Math.min(4, rank - targetStart);
    for (let innerStart = 0; innerStart < Math.min(rank, targetStart + 4); innerStart += 4) {
      const innerCount = Math.min(4, rank - innerStart);
      if (targetCount === 4 && innerCount === 4) {
        const [x0, x1, x2, x3] = [columns[innerStart], columns[innerStart + 1], columns[innerStart + 2], columns[innerStart + 3]];
        const f00 = factor(innerStart, targetStart);
        const f10 = factor(innerStart + 1, targetStart);
        const f20 = factor(innerStart + 2, targetStart);
        const f30 = factor(innerStart + 3, targetStart);
        const f01 = factor(innerStart, targetStart + 1);
        const f11 = factor(innerStart + 1, targetStart + 1);
        const f21 = factor(innerStart + 2, targetStart + 1);
        const f31 = factor(innerStart + 3, targetStart + 1);
        const f02 = factor(innerStart, targetStart + 2);
        const f12 = factor(innerStart + 1, targetStart + 2);
        const f22 = factor(innerStart + 2, targetStart + 2);
        const f32 = factor(innerStart + 3, targetStart + 2);
        const f03 = factor(innerStart, targetStart + 3);
        const f13 = factor(innerStart + 1, targetStart + 3);
        const f23 = factor(innerStart + 2, targetStart + 3);
        const f33 = factor(innerStart + 3, targetStart + 3);
        const offset0 = targetStart * count - start;
        const offset1 = offset0 + count;
        const offset2 = offset1 + count;
        const offset3 = offset2 + count;
        for (let row = start; row < end; row++) {
          const a = x0[row];
          const b = x1[row];
          const c = x2[row];
          const d = x3[row];
          transformed[offset0 + row] += a * f00 + b * f10 + c * f20 + d * f30;
          transformed[offset1 + row] += a * f01 + b * f11 + c * f21 + d * f31;
          transformed[offset2 + row] += a * f02 + b * f12 + c * f22 + d * f32;
          transformed[offset3 + row] += a * f03 + b * f13 + c * f23 + d * f33;
        }
        continue;
      }
      // Edge tiles (rank not a multiple of four): one source column at a time.
      for (let target = targetStart; target < targetStart + targetCount; target++) {
        const offset = target * count - start;
        for (let inner = innerStart; inner < Math.min(innerStart + innerCount, target + 1); inner++) {
          const column = columns[inner];
          const weight = inverseUpper[inner * rank + target];
          for (let row = start; row < end; row++) transformed[offset + row] += column[row] * weight;
        }
      }
    }
  }
}

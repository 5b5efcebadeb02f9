/**
 * Sandwich covariance estimators, accumulated during the diagnostic pass over the rows.
 *
 * With uᵢ = R⁻ᵀxᵢ (so (XᵀX)⁻¹xᵢ = R⁻¹uᵢ), every sandwich (XᵀX)⁻¹ (Σ wᵢⱼ xᵢxⱼᵀ) (XᵀX)⁻¹ equals
 * R⁻¹ (Σ wᵢⱼ uᵢuⱼᵀ) R⁻ᵀ: the "meat" is accumulated in the well-scaled u coordinates and XᵀX is
 * never formed.
 *
 * References: J. G. MacKinnon & H. White, "Some heteroskedasticity-consistent covariance matrix
 * estimators with improved finite sample properties", J. Econometrics 29 (1985) — HC3 weights
 * rᵢ²/(1 − hᵢ)²; W. K. Newey & K. D. West, "A simple, positive semi-definite, heteroskedasticity
 * and autocorrelation consistent covariance matrix", Econometrica 55 (1987) — Bartlett weights
 * 1 − ℓ/(L + 1) on lag-ℓ cross products of the scores xᵢrᵢ, no small-sample factor.
 */

import type { RowBlock } from "./row-blocks";

/** Accumulates the meat block by block; `finish` returns the r × r meat matrix (row-major). */
export interface MeatAccumulator {
  visit(block: RowBlock): void;
  finish(): Float64Array;
}

/** HC3 meat Σ uᵢuᵢᵀ rᵢ²/(1 − hᵢ)². Cost: n·rank² flops. */
export function createHc3Accumulator(rank: number): MeatAccumulator {
  const meat = new Float64Array(rank * rank);
  let weights = new Float64Array(0);
  return {
    visit({ count, transformed, residuals, leverages }) {
      if (weights.length < count) weights = new Float64Array(count);
      for (let row = 0; row < count; row++) {
        const leverageComplement = 1 - leverages[row];
        weights[row] = (residuals[row] * residuals[row]) / (leverageComplement * leverageComplement);
      }
      for (let first = 0; first < rank; first++) {
        const firstOffset = first * count;
        for (let second = first; second < rank; second++) {
          const secondOffset = second * count;
          let sum = 0;
          for (let row = 0; row < count; row++) {
            sum += weights[row] * transformed[firstOffset + row] * transformed[secondOffset + row];
          }
          meat[first * rank + second] += sum;
        }
      }
    },
    finish() {
      for (let first = 0; first < rank; first++) {
        for (let second = 0; second < first; second++) meat[first * rank + second] = meat[second * rank + first];
      }
      return meat;
    },
  };
}

/**
 * Newey–West meat Σₗ wₗ Σᵢ (gᵢgᵢ₋ₗᵀ + gᵢ₋ₗgᵢᵀ) with gᵢ = uᵢrᵢ, w₀ = 1/2 (so lag 0 counts once)
 * and wₗ = 1 − ℓ/(lag + 1). The last `lag` scores of each block are carried into the next.
 * Cost: n·rank²·(lag + 1) flops.
 */
export function createNeweyWestAccumulator(rank: number, lag: number): MeatAccumulator {
  const meat = new Float64Array(rank * rank);
  // Scores of the previous `lag` rows followed by the current block, column-major, per column.
  let scores = new Float64Array(0);
  let scoresRows = 0;
  let carried = new Float64Array(lag * rank);
  let carriedRows = 0;
  return {
    visit({ count, transformed, residuals }) {
      const rows = carriedRows + count;
      if (scores.length < rows * rank) scores = new Float64Array(rows * rank);
      scoresRows = rows;
      for (let column = 0; column < rank; column++) {
        const offset = column * rows;
        for (let row = 0; row < carriedRows; row++) scores[offset + row] = carried[column * lag + row];
        for (let row = 0; row < count; row++) {
          scores[offset + carriedRows + row] = transformed[column * count + row] * residuals[row];
        }
      }
      for (let distance = 0; distance <= lag; distance++) {
        const weight = distance === 0 ? 0.5 : 1 - distance / (lag + 1);
        // Pairs (i, i − distance) with i in the current block and i − distance ≥ first carried row.
        const firstRow = Math.max(carriedRows, distance);
        for (let first = 0; first < rank; first++) {
          const firstOffset = first * rows;
          for (let second = 0; second < rank; second++) {
            const secondOffset = second * rows - distance;
            let sum = 0;
            for (let row = firstRow; row < rows; row++) sum += scores[firstOffset + row] * scores[secondOffset + row];
            // Adding both g gᵀ₋ₗ and its transpose: accumulate here, symmetrise in finish().
            meat[first * rank + second] += weight * sum;
          }
        }
      }
      // Keep the last `lag` scores for the next block.
      carriedRows = Math.min(lag, rows);
      if (carried.length < lag * rank) carried = new Float64Array(lag * rank);
      for (let column = 0; column < rank; column++) {
        for (let row = 0; row < carriedRows; row++) {
          carried[column * lag + row] = scores[column * scoresRows + rows - carriedRows + row];
        }
      }
    },
    finish() {
      const symmetric = new Float64Array(rank * rank);
      for (let first = 0; first < rank; first++) {
        for (let second = 0; second < rank; second++) {
          symmetric[first * rank + second] = meat[first * rank + second] + meat[second * rank + first];
        }
      }
      return symmetric;
    },
  };
}

/**
 * R⁻¹ M R⁻ᵀ for the upper-triangular R⁻¹ (row-major) and a symmetric meat M.
 * Cost: about rank³ flops.
 */
export function sandwich(inverseUpper: Float64Array, meat: Float64Array, rank: number): Float64Array {
  // left = R⁻¹ M
  const left = new Float64Array(rank * rank);
  for (let row = 0; row < rank; row++) {
    for (let column = 0; column < rank; column++) {
      let sum = 0;
      for (let inner = row; inner < rank; inner++) sum += inverseUpper[row * rank + inner] * meat[inner * rank + column];
      left[row * rank + column] = sum;
    }
  }
  const result = new Float64Array(rank * rank);
  for (let row = 0; row < rank; row++) {
    for (let column = row; column < rank; column++) {
      let sum = 0;
      for (let inner = column; inner < rank; inner++) sum += left[row * rank + inner] * inverseUpper[column * rank + inner];
      result[row * rank + column] = sum;
      result[column * rank + row] = sum;
    }
  }
  return result;
}

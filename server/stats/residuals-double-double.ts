/**
 * Residuals r = y − Xβ and the gradient Xᵀr accumulated in double-double arithmetic, the two
 * passes over the data that iterative refinement needs. Each product x·β is split exactly into
 * two doubles (Dekker's error-free product, inlined here — a function call per element would cost
 * more than the arithmetic), so cancellation between large terms loses nothing.
 * Reference: see `double-double.ts`.
 */

import { veltkampSplitFactor } from "./double-double";

/** Residuals as high + low parts, each of length n. */
export interface DoubleDoubleResiduals {
  high: Float64Array;
  low: Float64Array;
}

/**
 * r = y − Σⱼ (xⱼ + lowⱼ) βⱼ in double-double, where lowⱼ is the optional low-order part of column j.
 * Cost: about 30np flops.
 */
export function residualsDoubleDouble(
  columns: readonly Float64Array[],
  lowOrderParts: readonly (Float64Array | null)[],
  outcome: Float64Array,
  estimates: ArrayLike<number>,
): DoubleDoubleResiduals {
  const rowCount = outcome.length;
  const high = outcome.slice();
  const low = new Float64Array(rowCount);
  for (let column = 0; column < columns.length; column++) {
    const values = columns[column];
    const lowPart = lowOrderParts[column];
    // Subtracting x·β is adding x·(−β); split −β once per column.
    const coefficient = -estimates[column];
    if (coefficient === 0) continue;
    const coefficientScaled = veltkampSplitFactor * coefficient;
    const coefficientHigh = coefficientScaled - (coefficientScaled - coefficient);
    const coefficientLow = coefficient - coefficientHigh;
    for (let row = 0; row < rowCount; row++) {
      const x = values[row];
      const product = x * coefficient;
      const xScaled = veltkampSplitFactor * x;
      const xHigh = xScaled - (xScaled - x);
      const xLow = x - xHigh;
      let productError =
        xHigh * coefficientHigh - product + xHigh * coefficientLow + xLow * coefficientHigh + xLow * coefficientLow;
      if (lowPart !== null) productError += lowPart[row] * coefficient;
      const current = high[row];
      const sum = current + product;
      const virtual = sum - current;
      const sumError = current - (sum - virtual) + (product - virtual);
      const lowSum = low[row] + productError + sumError;
      const renormalised = sum + lowSum;
      low[row] = lowSum - (renormalised - sum);
      high[row] = renormalised;
    }
  }
  return { high, low };
}

/**
 * g = Xᵀr with X's low-order parts and r in double-double, rounded to doubles at the end.
 * Cost: about 25np flops.
 */
export function transposeTimesResidualsDoubleDouble(
  columns: readonly Float64Array[],
  lowOrderParts: readonly (Float64Array | null)[],
  residuals: DoubleDoubleResiduals,
): Float64Array {
  const gradient = new Float64Array(columns.length);
  const { high: residualHigh, low: residualLow } = residuals;
  for (let column = 0; column < columns.length; column++) {
    const values = columns[column];
    const lowPart = lowOrderParts[column];
    let sumHigh = 0;
    let sumLow = 0;
    for (let row = 0; row < values.length; row++) {
      const x = values[row];
      const r = residualHigh[row];
      const product = x * r;
      const xScaled = veltkampSplitFactor * x;
      const xHigh = xScaled - (xScaled - x);
      const xLow = x - xHigh;
      const rScaled = veltkampSplitFactor * r;
      const rHigh = rScaled - (rScaled - r);
      const rLow = r - rHigh;
      let productError = xHigh * rHigh - product + xHigh * rLow + xLow * rHigh + xLow * rLow;
      productError += x * residualLow[row];
      if (lowPart !== null) productError += lowPart[row] * r;
      const sum = sumHigh + product;
      const virtual = sum - sumHigh;
      const sumError = sumHigh - (sum - virtual) + (product - virtual);
      sumLow += productError + sumError;
      sumHigh = sum;
    }
    gradient[column] = sumHigh + sumLow;
  }
  return gradient;
}

/** Σ rᵢ² of double-double residuals, accumulated in double-double. Cost: about 25n flops. */
export function sumOfSquaresDoubleDouble(residuals: DoubleDoubleResiduals): number {
  const { high, low } = residuals;
  let sumHigh = 0;
  let sumLow = 0;
  for (let row = 0; row < high.length; row++) {
    const r = high[row];
    const square = r * r;
    const rScaled = veltkampSplitFactor * r;
    const rHigh = rScaled - (rScaled - r);
    const rLow = r - rHigh;
    const squareError = rHigh * rHigh - square + 2 * rHigh * rLow + rLow * rLow + 2 * r * low[row];
    const sum = sumHigh + square;
    const virtual = sum - sumHigh;
    sumLow += sumHigh - (sum - virtual) + (square - virtual) + squareError;
    sumHigh = sum;
  }
  return sumHigh + sumLow;
}

// Independent reference computations with ml-matrix's dense algebra: (XᵀX)⁻¹ by explicit
// inversion (fine for the well-conditioned data these tests use), used to check the engine's
// QR-based numbers by a different route.
import { Matrix, inverse } from "ml-matrix";
import type { Design } from "@/server/stats";

export function designMatrix(design: Design): Matrix {
  const matrix = new Matrix(design.rowCount, design.columnCount);
  for (let column = 0; column < design.columnCount; column++) {
    for (let row = 0; row < design.rowCount; row++) matrix.set(row, column, design.values[column * design.rowCount + row]);
  }
  return matrix;
}

export function directLeastSquares(design: Design) {
  const x = designMatrix(design);
  const y = Matrix.columnVector(Array.from(design.outcome));
  const inverseGram = inverse(x.transpose().mmul(x));
  const estimates = inverseGram.mmul(x.transpose()).mmul(y);
  const residuals = y.clone().sub(x.mmul(estimates));
  const residualDegreesOfFreedom = design.rowCount - design.columnCount;
  const residualVariance = residuals.transpose().mmul(residuals).get(0, 0) / residualDegreesOfFreedom;
  const leverages = Array.from({ length: design.rowCount }, (_, row) => {
    const xi = x.getRowVector(row);
    return xi.mmul(inverseGram).mmul(xi.transpose()).get(0, 0);
  });
  return { x, y, inverseGram, estimates: estimates.to1DArray(), residuals: residuals.to1DArray(), residualVariance, leverages, residualDegreesOfFreedom };
}

/** Largest relative difference between two arrays, relative to each pair's larger magnitude (or `floor`). */
export function largestRelativeDifference(actual: ArrayLike<number>, expected: ArrayLike<number>, floor = 0): number {
  let largest = 0;
  for (let index = 0; index < expected.length; index++) {
    const scale = Math.max(Math.abs(actual[index]), Math.abs(expected[index]), floor);
    if (scale === 0) continue;
    largest = Math.max(largest, Math.abs(actual[index] - expected[index]) / scale);
  }
  return largest;
}

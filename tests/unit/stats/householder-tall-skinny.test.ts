// The blocked QR kernel against its defining property RᵀR = XᵀX (Gram matrix formed directly
// with ml-matrix) and against itself across block sizes, including blocks smaller than p.
import { Matrix } from "ml-matrix";
import { describe, expect, it } from "vitest";
import { factorTallSkinny } from "@/server/stats/householder-tall-skinny";
import { createRandom } from "./support/random";

/** RᵀR against XᵀX, relative to the largest entry of XᵀX (well-conditioned random data). */
const gramTolerance = 1e-13;
/** |R| from different block sizes: the same factor up to rounding. */
const blockSizeTolerance = 1e-12;

function randomColumns(rowCount: number, columnCount: number, seed: number): Float64Array[] {
  const random = createRandom(seed);
  return Array.from({ length: columnCount }, (_, column) =>
    Float64Array.from({ length: rowCount }, () => (column === 0 ? 1 : random.normal() + column)),
  );
}

function upperTimesTranspose(upper: Float64Array, size: number): Matrix {
  const matrix = new Matrix(size, size);
  for (let row = 0; row < size; row++) for (let column = 0; column < size; column++) matrix.set(row, column, upper[row * size + column]);
  return matrix.transpose().mmul(matrix);
}

describe("factorTallSkinny", () => {
  for (const columnCount of [1, 2, 5, 8, 11]) {
    it(`gives R with RᵀR = XᵀX for ${columnCount} columns over several 4,096-row blocks`, () => {
      const rowCount = 9001;
      const columns = randomColumns(rowCount, columnCount, 31 + columnCount);
      const upper = factorTallSkinny(columns, new Float64Array(columnCount).fill(1), rowCount);
      const x = new Matrix(rowCount, columnCount);
      columns.forEach((values, column) => values.forEach((value, row) => x.set(row, column, value)));
      const gram = x.transpose().mmul(x);
      const product = upperTimesTranspose(upper, columnCount);
      const scale = gram.max();
      for (let row = 0; row < columnCount; row++) {
        for (let column = 0; column < columnCount; column++) {
          expect(Math.abs(product.get(row, column) - gram.get(row, column)) / scale).toBeLessThan(gramTolerance);
          if (row > column) expect(upper[row * columnCount + column]).toBe(0);
        }
      }
    });
  }

  it("gives the same |R| whatever the block size, even blocks shorter than the column count", () => {
    const rowCount = 5000;
    const columns = randomColumns(rowCount, 7, 5);
    const scales = new Float64Array(7).fill(0.25);
    const reference = factorTallSkinny(columns, scales, rowCount);
    for (const rowsPerBlock of [3, 64, 1000, 4999, 5000, 8192]) {
      const upper = factorTallSkinny(columns, scales, rowCount, rowsPerBlock);
      reference.forEach((value, index) => {
        expect(Math.abs(Math.abs(upper[index]) - Math.abs(value))).toBeLessThanOrEqual(blockSizeTolerance * Math.abs(reference[0]));
      });
    }
  });
});

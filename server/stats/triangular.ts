/**
 * Triangular solves and inverse for the small p × p factor R (row-major, upper triangular).
 * Reference: Golub & Van Loan, Matrix Computations (4th ed.), §3.1 (back and forward substitution).
 * These are backward stable: each computed solution is exact for a slightly perturbed R.
 */

/** Solves R x = b by back substitution. Cost: p² flops. */
export function solveUpperTriangular(upper: Float64Array, size: number, rightHandSide: ArrayLike<number>): Float64Array {
  const solution = Float64Array.from(rightHandSide);
  for (let row = size - 1; row >= 0; row--) {
    let sum = solution[row];
    for (let column = row + 1; column < size; column++) sum -= upper[row * size + column] * solution[column];
    solution[row] = sum / upper[row * size + row];
  }
  return solution;
}

/** Solves Rᵀ x = b by forward substitution. Cost: p² flops. */
export function solveUpperTriangularTransposed(
  upper: Float64Array,
  size: number,
  rightHandSide: ArrayLike<number>,
): Float64Array {
  const solution = Float64Array.from(rightHandSide);
  for (let row = 0; row < size; row++) {
    let sum = solution[row];
    for (let column = 0; column < row; column++) sum -= upper[column * size + row] * solution[column];
    solution[row] = sum / upper[row * size + row];
  }
  return solution;
}

/** R⁻¹, itself upper triangular (row-major). Cost: p³/3 flops. */
export function invertUpperTriangular(upper: Float64Array, size: number): Float64Array {
  const inverse = new Float64Array(size * size);
  // Column k of R⁻¹ solves R x = e_k; only its first k + 1 entries are non-zero.
  for (let column = 0; column < size; column++) {
    inverse[column * size + column] = 1 / upper[column * size + column];
    for (let row = column - 1; row >= 0; row--) {
      let sum = 0;
      for (let inner = row + 1; inner <= column; inner++) sum += upper[row * size + inner] * inverse[inner * size + column];
      inverse[row * size + column] = -sum / upper[row * size + row];
    }
  }
  return inverse;
}

/**
 * M Mᵀ for an upper-triangular M (row-major): with M = R⁻¹ this is (RᵀR)⁻¹ = (XᵀX)⁻¹.
 * Cost: p³/3 flops.
 */
export function multiplyUpperByTranspose(upper: Float64Array, size: number): Float64Array {
  const product = new Float64Array(size * size);
  for (let row = 0; row < size; row++) {
    for (let column = row; column < size; column++) {
      let sum = 0;
      // Row `row` and row `column` of M overlap from index `column` onwards.
      for (let inner = column; inner < size; inner++) sum += upper[row * size + inner] * upper[column * size + inner];
      product[row * size + column] = sum;
      product[column * size + row] = sum;
    }
  }
  return product;
}

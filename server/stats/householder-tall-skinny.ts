/**
 * Tall-skinny Householder QR: the upper-triangular factor R of an n × q matrix A (n ≫ q), computed
 * one block of rows at a time so that only R and one block are ever in working memory.
 *
 * Reference: G. H. Golub & C. F. Van Loan, Matrix Computations (4th ed.), §5.1–5.2 (Householder
 * reflections, Householder QR) and §5.2.2 on updating a QR factorisation by appending rows;
 * J. Demmel et al., "Communication-optimal parallel and sequential QR and LU factorizations"
 * (SIAM J. Sci. Comput. 34, 2012) for the tall-skinny ("TSQR", here a flat tree) scheme.
 *
 * For each block B of rows the kernel factors the stacked matrix [R; B]: reflector j touches row j
 * of R and column j of B only, because R's rows below j are already zero in column j. After the
 * last block, R is the R factor of all of A (Q is never formed; the solver appends y as the last
 * column, so the last column of R holds Qᵀy and its corner the residual norm).
 *
 * Cost: 2nq² flops (the Householder count 2nq² − 2q³/3 plus the q³ of re-triangularising R per
 * block, negligible when n ≫ q); memory q² + rowsPerBlock × q doubles.
 */

/**
 * Rows per block. The block (4,096 × (p + 1) doubles: 688 KB for p = 20) stays in the 2 MB level-2
 * cache of the benchmark machine. With reflections applied in pairs the kernel ran as fast with
 * 4,096-row blocks as with 512–2,048 (one-at-a-time reflections had preferred 1,024, whose five
 * active columns fit the 48 KB level-1 cache).
 */
export const defaultRowsPerBlock = 4096;

/**
 * Factors the columns (each scaled by `scales[k]` as it is read, so the caller can equilibrate
 * without copying the data) and returns R as a q × q row-major array (entries below the diagonal
 * are zero). Diagonal entries may be negative.
 *
 * @param columns q columns of length `rowCount` (views into the design matrix and the outcome)
 * @param scales q factors applied on reading; powers of two keep the scaling exact
 * Cost: 2 × rowCount × q² flops.
 */
export function factorTallSkinny(
  columns: readonly Float64Array[],
  scales: Float64Array,
  rowCount: number,
  rowsPerBlock: number = defaultRowsPerBlock,
): Float64Array {
  const columnCount = columns.length;
  const upper = new Float64Array(columnCount * columnCount);
  const block = new Float64Array(Math.min(rowsPerBlock, rowCount) * columnCount);
  for (let blockStart = 0; blockStart < rowCount; blockStart += rowsPerBlock) {
    const blockRows = Math.min(rowsPerBlock, rowCount - blockStart);
    for (let column = 0; column < columnCount; column++) {
      const source = columns[column];
      const scale = scales[column];
      const offset = column * blockRows;
      for (let row = 0; row < blockRows; row++) block[offset + row] = source[blockStart + row] * scale;
    }
    annihilateBlock(upper, block, blockRows, columnCount);
  }
  return upper;
}

/**
 * Applies q Householder reflections to [R; B] so that B becomes zero and R stays upper triangular.
 * B is column-major (blockRows × q) and is overwritten.
 *
 * Reflections are taken two at a time. For a target column x, reflector 1 then reflector 2 give
 *   w₁ = τ₁ (R₁ₓ + v₁ᵀx),  w₂ = τ₂ (R₂ₓ + v₂ᵀx − w₁ v₂ᵀv₁),  x ← x − w₁v₁ − w₂v₂
 * (the 2 × 2 case of the compact WY form, Schreiber & Van Loan, SIAM J. Sci. Stat. Comput. 10,
 * 1989), so each target column is read once for both dot products and once for both updates,
 * four target columns per sweep. That halves the memory traffic per flop of one-at-a-time
 * Householder, which is what limits a JavaScript kernel without SIMD.
 */
function annihilateBlock(upper: Float64Array, block: Float64Array, blockRows: number, columnCount: number): void {
  let pivot = 0;
  for (; pivot + 1 < columnCount; pivot += 2) {
    const second = pivot + 1;
    const firstTau = createReflector(upper, block, blockRows, columnCount, pivot);
    if (firstTau !== 0) applyReflector(upper, block, blockRows, columnCount, pivot, firstTau, second);
    const secondTau = createReflector(upper, block, blockRows, columnCount, second);
    const firstOffset = pivot * blockRows;
    const secondOffset = second * blockRows;
    // v₂ᵀv₁ over the block only: the reflectors' unit heads sit in different rows of R.
    let overlap = 0;
    for (let row = 0; row < blockRows; row++) overlap += block[firstOffset + row] * block[secondOffset + row];
    let target = pivot + 2;
    for (; target + 3 < columnCount; target += 4) {
      const offsetA = target * blockRows;
      const offsetB = offsetA + blockRows;
      const offsetC = offsetB + blockRows;
      const offsetD = offsetC + blockRows;
      let firstA = 0;
      let firstB = 0;
      let firstC = 0;
      let firstD = 0;
      let secondA = 0;
      let secondB = 0;
      let secondC = 0;
      let secondD = 0;
      for (let row = 0; row < blockRows; row++) {
        const reflector1 = block[firstOffset + row];
        const reflector2 = block[secondOffset + row];
        const valueA = block[offsetA + row];
        const valueB = block[offsetB + row];
        const valueC = block[offsetC + row];
        const valueD = block[offsetD + row];
        firstA += reflector1 * valueA;
        firstB += reflector1 * valueB;
        firstC += reflector1 * valueC;
        firstD += reflector1 * valueD;
        secondA += reflector2 * valueA;
        secondB += reflector2 * valueB;
        secondC += reflector2 * valueC;
        secondD += reflector2 * valueD;
      }
      const firstRow = pivot * columnCount + target;
      const secondRow = second * columnCount + target;
      const weight1A = firstTau * (upper[firstRow] + firstA);
      const weight1B = firstTau * (upper[firstRow + 1] + firstB);
      const weight1C = firstTau * (upper[firstRow + 2] + firstC);
      const weight1D = firstTau * (upper[firstRow + 3] + firstD);
      const weight2A = secondTau * (upper[secondRow] + secondA - weight1A * overlap);
      const weight2B = secondTau * (upper[secondRow + 1] + secondB - weight1B * overlap);
      const weight2C = secondTau * (upper[secondRow + 2] + secondC - weight1C * overlap);
      const weight2D = secondTau * (upper[secondRow + 3] + secondD - weight1D * overlap);
      upper[firstRow] -= weight1A;
      upper[firstRow + 1] -= weight1B;
      upper[firstRow + 2] -= weight1C;
      upper[firstRow + 3] -= weight1D;
      upper[secondRow] -= weight2A;
      upper[secondRow + 1] -= weight2B;
      upper[secondRow + 2] -= weight2C;
      upper[secondRow + 3] -= weight2D;
      for (let row = 0; row < blockRows; row++) {
        const reflector1 = block[firstOffset + row];
        const reflector2 = block[secondOffset + row];
        block[offsetA + row] -= weight1A * reflector1 + weight2A * reflector2;
        block[offsetB + row] -= weight1B * reflector1 + weight2B * reflector2;
        block[offsetC + row] -= weight1C * reflector1 + weight2C * reflector2;
        block[offsetD + row] -= weight1D * reflector1 + weight2D * reflector2;
      }
    }
    for (; target < columnCount; target++) {
      if (firstTau !== 0) applyReflector(upper, block, blockRows, columnCount, pivot, firstTau, target);
      if (secondTau !== 0) applyReflector(upper, block, blockRows, columnCount, second, secondTau, target);
    }
  }
  if (pivot < columnCount) {
    // An odd last column: its reflector has nothing to its right, it only sets R's corner.
    createReflector(upper, block, blockRows, columnCount, pivot);
  }
}

/**
 * Builds the reflector that zeroes column `pivot` of B into R's diagonal entry: R[pivot][pivot]
 * becomes alpha and B's column becomes the reflector's tail v (its head, in R's row, is 1).
 * Returns tau (H = I − tau v vᵀ), or 0 when the column is already zero (H = I).
 */
function createReflector(upper: Float64Array, block: Float64Array, blockRows: number, columnCount: number, pivot: number): number {
  const offset = pivot * blockRows;
  let blockSumOfSquares = 0;
  for (let row = 0; row < blockRows; row++) {
    const value = block[offset + row];
    blockSumOfSquares += value * value;
  }
  if (blockSumOfSquares === 0) return 0;
  const diagonal = upper[pivot * columnCount + pivot];
  const norm = Math.sqrt(diagonal * diagonal + blockSumOfSquares);
  // The sign of alpha is opposite to the diagonal's, so diagonal − alpha never cancels.
  const alpha = diagonal > 0 ? -norm : norm;
  const inverseHead = 1 / (diagonal - alpha);
  for (let row = 0; row < blockRows; row++) block[offset + row] *= inverseHead;
  upper[pivot * columnCount + pivot] = alpha;
  return (alpha - diagonal) / alpha;
}

/** Applies reflector `pivot` (tail in B's column `pivot`) to column `target` of [R; B]. */
function applyReflector(
  upper: Float64Array,
  block: Float64Array,
  blockRows: number,
  columnCount: number,
  pivot: number,
  tau: number,
  target: number,
): void {
  const reflectorOffset = pivot * blockRows;
  const targetOffset = target * blockRows;
  let dot = upper[pivot * columnCount + target];
  for (let row = 0; row < blockRows; row++) dot += block[reflectorOffset + row] * block[targetOffset + row];
  const weight = tau * dot;
  upper[pivot * columnCount + target] -= weight;
  for (let row = 0; row < blockRows; row++) block[targetOffset + row] -= weight * block[reflectorOffset + row];
}

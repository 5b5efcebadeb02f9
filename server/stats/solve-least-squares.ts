/**
 * The least-squares solve: β minimising ‖y − Xβ‖₂ by tall-skinny Householder QR of the
 * column-scaled design, with rank-deficiency detection and, when the problem's conditioning calls
 * for it, iterative refinement in double-double. `fitLeastSquares` builds the inference on top.
 */

import type { Design } from "./build-design";
import { removeColumnFromUpperTriangular } from "./column-removal";
import { assertFinite, equilibratingScale, isConstant } from "./column-scaling";
import { scaledConditionNumber } from "./condition-number";
import { factorTallSkinny } from "./householder-tall-skinny";
import { refineInverseGram } from "./inverse-refinement";
import { sumOfSquaresDoubleDouble } from "./residuals-double-double";
import { refineSolution } from "./solution-refinement";
import { invertUpperTriangular, multiplyUpperByTranspose, solveUpperTriangular } from "./triangular";

/**
 * Default relative tolerance on R's diagonal for declaring a column aliased: |Rⱼⱼ| ≤ tolerance ×
 * ‖xⱼ‖ means column j is within that relative distance of the span of the columns before it.
 * R's `lm` uses 1e-7, which wrongly drops a term of NIST's Filip (its smallest ratio is 5.2e-8);
 * exact duplicates give ratios near 1e-16, so 1e-10 separates the two with room on both sides.
 */
export const defaultRankTolerance = 1e-10;

/**
 * Refinement runs when the a-priori bound on the relative error of the plain QR solution exceeds
 * this: below it the answer already has 12 or more correct digits.
 */
export const refinementTrigger = 1e-12;

/**
 * A-priori bound on the relative error of each coefficient of the plain Householder solution,
 * from the first-order perturbation theory of least squares (Higham, Accuracy and Stability of
 * Numerical Algorithms, 2nd ed., §20.1, Thm 20.1 and 20.3, written per component): with backward
 * errors ‖ΔX‖ ≤ u‖X‖ and ‖Δy‖ ≤ u‖y‖,
 *   |δβⱼ| ≲ u ‖eⱼᵀR⁻¹‖ (‖y‖ + ‖X‖ ‖β‖ + ‖X‖ ‖r‖ / σ_min),
 * relative to |βⱼ| (NIST's measure: every digit of every coefficient counts). On the NIST sets
 * it is pessimistic by one to two orders of magnitude. The term u‖y‖/‖r‖ bounds the accuracy of
 * residuals formed in doubles (and so of σ and R²). Returns the largest of these ratios.
 */
function componentwiseErrorBound(
  scaledUpper: Float64Array,
  scaledInverseUpper: Float64Array,
  scaledEstimates: Float64Array,
  projectedOutcome: Float64Array,
  scaledResidualNorm: number,
  conditionNumber: number,
): number {
  const rank = scaledEstimates.length;
  const unitRoundoff = Number.EPSILON / 2;
  let upperFrobeniusSquared = 0;
  for (const value of scaledUpper) upperFrobeniusSquared += value * value;
  const designNorm = Math.sqrt(upperFrobeniusSquared);
  let fittedNormSquared = 0;
  for (const value of projectedOutcome) fittedNormSquared += value * value;
  const outcomeNorm = Math.sqrt(fittedNormSquared + scaledResidualNorm ** 2);
  let estimateNormSquared = 0;
  for (const value of scaledEstimates) estimateNormSquared += value * value;
  // ‖R⁻¹‖₂ = 1/σ_min = κ/σ_max ≤ κ√rank/‖R‖_F, because σ_max ≥ ‖R‖_F/√rank: an upper estimate.
  const inverseNorm = conditionNumber / (designNorm / Math.sqrt(rank));
  const perturbation =
    outcomeNorm + designNorm * Math.sqrt(estimateNormSquared) + designNorm * scaledResidualNorm * inverseNorm;
  let largest = unitRoundoff * (outcomeNorm / scaledResidualNorm);
  for (let row = 0; row < rank; row++) {
    let rowNormSquared = 0;
    for (let column = row; column < rank; column++) rowNormSquared += scaledInverseUpper[row * rank + column] ** 2;
    const rowNorm = Math.sqrt(rowNormSquared);
    const reference = Math.abs(scaledEstimates[row]);
    largest = Math.max(largest, (unitRoundoff * rowNorm * perturbation) / reference);
  }
  return largest;
}

/** When to run iterative refinement: when the error bound asks for it, always, or never. */
export type RefinementPolicy = "auto" | "always" | "never";

export interface SolveOptions {
  /** Relative tolerance on R's diagonal for aliasing (default `defaultRankTolerance`). */
  rankTolerance?: number;
  /** Default "auto": refine only when the error bound exceeds `refinementTrigger`. */
  refinement?: RefinementPolicy;
}

/** How accurate the solve is, and what it did to get there. */
export interface SolveAccuracy {
  /** A-priori bound on the plain QR solution's relative error (before refinement). */
  estimatedRelativeError: number;
  /** Refinement steps applied to β (0 when not needed). */
  solutionRefinementSteps: number;
  /** Refinement steps applied to (XᵀX)⁻¹ (0 when not needed). */
  inverseRefinementSteps: number;
}

export interface LeastSquaresSolution {
  design: Design;
  /** Design columns that entered the fit (indices into `design.termNames`), in order. */
  estimableColumns: number[];
  /** Names of terms that are linear combinations of earlier terms, left out of the fit. */
  aliasedTerms: string[];
  rank: number;
  /** β for every design column; NaN for aliased terms. */
  estimates: Float64Array;
  /** R⁻¹ for the estimable columns in original units, rank × rank row-major (upper triangular). */
  inverseUpper: Float64Array;
  /** (XᵀX)⁻¹ for the estimable columns in original units, rank × rank row-major. */
  inverseGram: Float64Array;
  /** ‖y − Xβ‖², from the refined residuals or, unrefined, from the corner of R. */
  residualSumOfSquares: number;
  /** Residuals rounded from double-double when refinement ran, else null (computed later). */
  refinedResiduals: Float64Array | null;
  /** κ₂ of the column-scaled design (see `scaledConditionNumber`). */
  conditionNumber: number;
  /** Upper-triangular R of the scaled design for the estimable columns (row-major). */
  scaledUpper: Float64Array;
  /** Its inverse R̃⁻¹. */
  scaledInverseUpper: Float64Array;
  /** Power-of-two column scales of that factorisation. */
  scales: Float64Array;
  accuracy: SolveAccuracy;
}

/**
 * Solves min ‖y − Xβ‖₂ for a design matrix.
 *
 * @throws "fitLeastSquares requires more observations (n = 3) than terms (p = 3)" and similar
 *   messages for non-finite values, a constant outcome, or a design with no non-zero column.
 * Cost: 2n(p + 1)² flops for the QR (the only full pass over the data when refinement is not needed), plus about 55np flops per refinement step and 12.5np² for
 *   the Gram matrix when refinement runs; memory (p + 1) × 4,096 doubles beyond the data
 *   (plus 2n for double-double residuals when refining).
 */
export function solveLeastSquares(design: Design, options: SolveOptions = {}, caller = "solveLeastSquares"): LeastSquaresSolution {
  const { rowCount, columnCount, termNames } = design;
  const rankTolerance = options.rankTolerance ?? defaultRankTolerance;
  const policy = options.refinement ?? "auto";
  if (!(rowCount > columnCount)) {
    throw new Error(`${caller} requires more observations (n = ${rowCount}) than terms (p = ${columnCount})`);
  }
  const columns = termNames.map((_, index) => design.values.subarray(index * rowCount, (index + 1) * rowCount));
  const outcomeName = design.specification.outcome;

  // Factor [X y] with every column scaled by an exact power of two.
  const scales = Float64Array.from([...columns, design.outcome], equilibratingScale);
  let augmentedUpper = factorTallSkinny([...columns, design.outcome], scales, rowCount);
  if (!augmentedUpper.every(Number.isFinite)) {
    assertFinite([...columns, design.outcome], [...termNames, outcomeName], caller);
  }
  if (isConstant(design.outcome)) {
    throw new Error(
      `${caller} requires an outcome that varies (all ${rowCount} values of '${outcomeName}' equal ${design.outcome[0]})`,
    );
  }
  // ‖x̃ⱼ‖ = ‖R̃[:, j]‖ (Q is orthogonal): the column norms for the rank test come free with R.
  const scaledColumnNorms = termNames.map((_, column) => {
    let sumOfSquares = 0;
    for (let row = 0; row <= column; row++) sumOfSquares += augmentedUpper[row * (columnCount + 1) + column] ** 2;
    return Math.sqrt(sumOfSquares);
  });

  // Rank: drop, one at a time, each column whose diagonal is negligible next to its own norm.
  const kept = termNames.map((_, index) => index);
  const aliased: number[] = [];
  for (let position = 0; position < kept.length; ) {
    const size = kept.length + 1;
    const column = kept[position];
    if (Math.abs(augmentedUpper[position * size + position]) > rankTolerance * scaledColumnNorms[column]) {
      position += 1;
      continue;
    }
    aliased.push(column);
    augmentedUpper = removeColumnFromUpperTriangular(augmentedUpper, size, position);
    kept.splice(position, 1);
  }
  const rank = kept.length;
  if (rank === 0) throw new Error(`${caller} requires at least one term that is not identically zero`);

  const size = rank + 1;
  const scaledUpper = new Float64Array(rank * rank);
  const projectedOutcome = new Float64Array(rank);
  for (let row = 0; row < rank; row++) {
    for (let column = row; column < rank; column++) scaledUpper[row * rank + column] = augmentedUpper[row * size + column];
    projectedOutcome[row] = augmentedUpper[row * size + rank];
  }
  const scaledResidualNorm = Math.abs(augmentedUpper[rank * size + rank]);
  const keptScales = Float64Array.from(kept, (column) => scales[column]);
  const outcomeScale = scales[columnCount];
  const scaledEstimates = solveUpperTriangular(scaledUpper, rank, projectedOutcome);
  let estimates: Float64Array = Float64Array.from(scaledEstimates, (value, index) => (value * keptScales[index]) / outcomeScale);
  const scaledInverseUpper = invertUpperTriangular(scaledUpper, rank);
  const conditionNumber = scaledConditionNumber(scaledUpper, rank);

  const solutionErrorBound = componentwiseErrorBound(
    scaledUpper,
    scaledInverseUpper,
    scaledEstimates,
    projectedOutcome,
    scaledResidualNorm,
    conditionNumber,
  );
  const unitRoundoff = Number.EPSILON / 2;
  const inverseErrorBound = unitRoundoff * conditionNumber;

  const keptColumns = kept.map((column) => columns[column]);
  const keptLowParts = kept.map((column) => design.lowOrderParts[column]);
  let residualSumOfSquares = (scaledResidualNorm / outcomeScale) ** 2;
  let refinedResiduals: Float64Array | null = null;
  let solutionRefinementSteps = 0;
  if (policy === "always" || (policy === "auto" && !(solutionErrorBound <= refinementTrigger))) {
    const refined = refineSolution(keptColumns, keptLowParts, design.outcome, scaledUpper, keptScales, estimates);
    estimates = refined.estimates;
    solutionRefinementSteps = refined.steps;
    residualSumOfSquares = sumOfSquaresDoubleDouble(refined.residuals);
    const { high, low } = refined.residuals;
    refinedResiduals = high;
    for (let row = 0; row < rowCount; row++) refinedResiduals[row] = high[row] + low[row];
  }

  let scaledInverseGram: Float64Array;
  let inverseRefinementSteps = 0;
  if (policy === "always" || (policy === "auto" && !(inverseErrorBound <= refinementTrigger))) {
    const refined = refineInverseGram(keptColumns, keptLowParts, keptScales, scaledInverseUpper);
    scaledInverseGram = refined.inverseGram;
    inverseRefinementSteps = refined.steps;
  } else {
    scaledInverseGram = multiplyUpperByTranspose(scaledInverseUpper, rank);
  }

  // Back to original units: X = X̃ S⁻¹, so R⁻¹ = S R̃⁻¹ and (XᵀX)⁻¹ = S (X̃ᵀX̃)⁻¹ S, exactly.
  const inverseUpper = Float64Array.from(scaledInverseUpper, (value, index) => value * keptScales[Math.floor(index / rank)]);
  const inverseGram = Float64Array.from(
    scaledInverseGram,
    (value, index) => value * keptScales[Math.floor(index / rank)] * keptScales[index % rank],
  );
  const allEstimates = new Float64Array(columnCount).fill(NaN);
  kept.forEach((column, position) => {
    allEstimates[column] = estimates[position];
  });
  return {
    design,
    estimableColumns: kept,
    aliasedTerms: aliased.map((column) => termNames[column]),
    rank,
    estimates: allEstimates,
    inverseUpper,
    inverseGram,
    residualSumOfSquares,
    refinedResiduals,
    conditionNumber,
    scaledUpper,
    scaledInverseUpper,
    scales: keptScales,
    accuracy: {
      estimatedRelativeError: solutionErrorBound,
      solutionRefinementSteps,
      inverseRefinementSteps,
    },
  };
}

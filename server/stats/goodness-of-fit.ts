/**
 * Whole-model statistics: R² and adjusted R², the overall F test, the Gaussian log-likelihood and
 * the information criteria. Conventions follow R's `summary.lm`, `logLik.lm` and `AIC`.
 */

import { fDistributionUpperTail } from "./student-t";

export interface GoodnessOfFit {
  totalSumOfSquares: number;
  rSquared: number;
  adjustedRSquared: number;
  /**
   * True when R² is centred (model with intercept: 1 − RSS/Σ(y − ȳ)²). Without an intercept R² is
   * uncentred, 1 − RSS/Σy², as R and NIST report it; it is not comparable with a centred R².
   */
  rSquaredCentred: boolean;
  fStatistic: number;
  fNumeratorDegreesOfFreedom: number;
  fDenominatorDegreesOfFreedom: number;
  fPValue: number;
  /** "anova" for classical covariance (sums of squares), "wald" for HC3 / Newey–West. */
  fTestKind: "anova" | "wald";
  logLikelihood: number;
  /** −2 log L + 2k with k = rank + 1 (the +1 counts σ², as R's AIC does). */
  akaikeInformationCriterion: number;
  /** −2 log L + k log n, k as for AIC. */
  bayesianInformationCriterion: number;
}

/**
 * Σ(y − ȳ)² by the corrected two-pass algorithm (Chan, Golub & LeVeque, "Algorithms for computing
 * the sample variance", The American Statistician 37, 1983), or Σy² when `centred` is false.
 * Cost: 3n flops.
 */
export function totalSumOfSquares(outcome: Float64Array, centred: boolean): number {
  const count = outcome.length;
  let mean = 0;
  if (centred) {
    for (let row = 0; row < count; row++) mean += outcome[row];
    mean /= count;
  }
  let sumOfSquares = 0;
  let deviationSum = 0;
  for (let row = 0; row < count; row++) {
    const deviation = outcome[row] - mean;
    sumOfSquares += deviation * deviation;
    deviationSum += deviation;
  }
  // Correction term: removes the first-order effect of rounding in the mean.
  return centred ? sumOfSquares - (deviationSum * deviationSum) / count : sumOfSquares;
}

/**
 * @param waldStatistic for robust covariances, bᵀV⁻¹b for the slope coefficients (null: classical)
 */
export function goodnessOfFit(input: {
  outcome: Float64Array;
  hasIntercept: boolean;
  rank: number;
  residualSumOfSquares: number;
  waldStatistic: number | null;
}): GoodnessOfFit {
  const { outcome, hasIntercept, rank, residualSumOfSquares, waldStatistic } = input;
  const count = outcome.length;
  const residualDegreesOfFreedom = count - rank;
  const total = totalSumOfSquares(outcome, hasIntercept);
  const rSquared = 1 - residualSumOfSquares / total;
  const adjustedRSquared =
    1 - ((1 - rSquared) * (count - (hasIntercept ? 1 : 0))) / residualDegreesOfFreedom;
  const numeratorDegreesOfFreedom = rank - (hasIntercept ? 1 : 0);
  let fStatistic: number;
  if (numeratorDegreesOfFreedom === 0) {
    fStatistic = NaN;
  } else if (waldStatistic === null) {
    fStatistic =
      ((total - residualSumOfSquares) / numeratorDegreesOfFreedom) / (residualSumOfSquares / residualDegreesOfFreedom);
  } else {
    fStatistic = waldStatistic / numeratorDegreesOfFreedom;
  }
  const logLikelihood = -0.5 * count * (Math.log(2 * Math.PI) + Math.log(residualSumOfSquares / count) + 1);
  const parameterCount = rank + 1;
  return {
    totalSumOfSquares: total,
    rSquared,
    adjustedRSquared,
    rSquaredCentred: hasIntercept,
    fStatistic,
    fNumeratorDegreesOfFreedom: numeratorDegreesOfFreedom,
    fDenominatorDegreesOfFreedom: residualDegreesOfFreedom,
    fPValue: fDistributionUpperTail(fStatistic, numeratorDegreesOfFreedom, residualDegreesOfFreedom),
    fTestKind: waldStatistic === null ? "anova" : "wald",
    logLikelihood,
    akaikeInformationCriterion: -2 * logLikelihood + 2 * parameterCount,
    bayesianInformationCriterion: -2 * logLikelihood + Math.log(count) * parameterCount,
  };
}

/**
 * bᵀV⁻¹b for the coefficients at `positions` (Cholesky of the sub-covariance): the Wald statistic
 * that all those coefficients are zero. Returns NaN if the sub-covariance is not positive definite.
 * Cost: O(q³) for q positions.
 */
export function waldStatistic(estimates: Float64Array, covariance: Float64Array, rank: number, positions: readonly number[]): number {
  const size = positions.length;
  const lower = new Float64Array(size * size);
  for (let row = 0; row < size; row++) {
    for (let column = 0; column <= row; column++) {
      let sum = covariance[positions[row] * rank + positions[column]];
      for (let inner = 0; inner < column; inner++) sum -= lower[row * size + inner] * lower[column * size + inner];
      if (row === column) {
        if (!(sum > 0)) return NaN;
        lower[row * size + row] = Math.sqrt(sum);
      } else {
        lower[row * size + column] = sum / lower[column * size + column];
      }
    }
  }
  // Solve L z = b; then bᵀV⁻¹b = ‖z‖².
  let statistic = 0;
  const solution = new Float64Array(size);
  for (let row = 0; row < size; row++) {
    let sum = estimates[positions[row]];
    for (let inner = 0; inner < row; inner++) sum -= lower[row * size + inner] * solution[inner];
    solution[row] = sum / lower[row * size + row];
    statistic += solution[row] * solution[row];
  }
  return statistic;
}

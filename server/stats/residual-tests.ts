/**
 * Two tests on the residuals of a least-squares fit that say whether its standard errors and
 * intervals can be read as they stand.
 *
 * - Breusch–Pagan in Koenker's studentized form: LM = n·R² of the auxiliary regression of rᵢ² on
 *   the fit's own regressors, χ² with rank − 1 degrees of freedom when the error variance is
 *   constant. Koenker's form does not assume normal errors (the original does).
 *   T. S. Breusch & A. R. Pagan, "A simple test for heteroscedasticity and random coefficient
 *   variation", Econometrica 47 (1979); R. Koenker, "A note on studentizing a test for
 *   heteroscedasticity", Journal of Econometrics 17 (1981).
 * - Jarque–Bera: JB = n/6 · (S² + (K − 3)²/4) from the residuals' skewness S and kurtosis K
 *   (moments about the mean, divided by n), χ² with 2 degrees of freedom under normal errors, whose
 *   upper tail is exactly e^(−JB/2). C. M. Jarque & A. K. Bera, Economics Letters 6 (1980) and
 *   International Statistical Review 55 (1987).
 *
 * The auxiliary regression is not run as a second fit: with X = QR, the explained sum of squares
 * of the centred squares z = r² − mean(r²) is ‖Qᵀz‖², and Qᵀz = Σᵢ uᵢ zᵢ with uᵢ = R⁻ᵀxᵢ, the
 * rows the diagnostic pass forms anyway (see row-blocks). So the test costs 2n·rank flops on top.
 */

import jstatModule from "jstat";
import type { RowBlock } from "./row-blocks";

const { jStat } = jstatModule;

export interface HeteroskedasticityTest {
  /** Koenker's studentized Breusch–Pagan statistic n·R²ₐᵤₓ. */
  statistic: number;
  degreesOfFreedom: number;
  pValue: number;
}

export interface NormalityTest {
  /** Jarque–Bera statistic. */
  statistic: number;
  pValue: number;
  /** Skewness of the residuals (0 for a normal distribution). */
  skewness: number;
  /** Kurtosis of the residuals (3 for a normal distribution). */
  kurtosis: number;
}

export interface ResidualTests {
  /** Null without an intercept (the auxiliary regression needs a constant among the regressors), with fewer than two estimable columns, or when every rᵢ² is equal. */
  heteroskedasticity: HeteroskedasticityTest | null;
  /** Null when the residuals are all zero. */
  normality: NormalityTest | null;
}

/** P(χ²_df ≥ x): the upper regularised incomplete gamma Q(df/2, x/2). */
export function chiSquareUpperTail(x: number, degreesOfFreedom: number): number {
  if (Number.isNaN(x) || !(degreesOfFreedom > 0)) return NaN;
  if (x <= 0) return 1;
  if (degreesOfFreedom === 2) return Math.exp(-x / 2);
  return Math.min(1, Math.max(0, 1 - jStat.lowRegGamma(degreesOfFreedom / 2, x / 2)));
}

/**
 * Collects Σᵢ uᵢrᵢ² and Σᵢ uᵢ during the diagnostic pass (a row-block visitor), then turns them into
 * Koenker's statistic once every residual is known.
 */
export function createHeteroskedasticityAccumulator(rank: number) {
  const weightedBySquares = new Float64Array(rank);
  const sums = new Float64Array(rank);
  return {
    visit(block: RowBlock) {
      const { count, transformed, residuals } = block;
      for (let target = 0; target < rank; target++) {
        const offset = target * count;
        let weighted = 0;
        let plain = 0;
        for (let row = 0; row < count; row++) {
          const u = transformed[offset + row];
          weighted += u * residuals[row] * residuals[row];
          plain += u;
        }
        weightedBySquares[target] += weighted;
        sums[target] += plain;
      }
    },
    /** Needs an intercept among the regressors: only then is the constant in the span of X. */
    finish(residuals: Float64Array, hasIntercept: boolean): HeteroskedasticityTest | null {
      const n = residuals.length;
      if (!hasIntercept || rank < 2) return null;
      let meanSquare = 0;
      for (let row = 0; row < n; row++) meanSquare += residuals[row] * residuals[row];
      meanSquare /= n;
      let totalSumOfSquares = 0;
      for (let row = 0; row < n; row++) totalSumOfSquares += (residuals[row] * residuals[row] - meanSquare) ** 2;
      if (!(totalSumOfSquares > 0)) return null;
      // Qᵀz = Qᵀr² − mean(r²)·Qᵀ1.
      let explainedSumOfSquares = 0;
      for (let target = 0; target < rank; target++) explainedSumOfSquares += (weightedBySquares[target] - meanSquare * sums[target]) ** 2;
      const statistic = (n * Math.min(explainedSumOfSquares, totalSumOfSquares)) / totalSumOfSquares;
      const degreesOfFreedom = rank - 1;
      return { statistic, degreesOfFreedom, pValue: chiSquareUpperTail(statistic, degreesOfFreedom) };
    },
  };
}

/** Jarque–Bera from the residuals. Cost: O(n). */
export function jarqueBera(residuals: Float64Array): NormalityTest | null {
  const n = residuals.length;
  let mean = 0;
  for (let row = 0; row < n; row++) mean += residuals[row];
  mean /= n;
  let second = 0;
  let third = 0;
  let fourth = 0;
  for (let row = 0; row < n; row++) {
    const deviation = residuals[row] - mean;
    const square = deviation * deviation;
    second += square;
    third += square * deviation;
    fourth += square * square;
  }
  second /= n;
  third /= n;
  fourth /= n;
  if (!(second > 0)) return null;
  const skewness = third / second ** 1.5;
  const kurtosis = fourth / (second * second);
  const statistic = (n / 6) * (skewness * skewness + (kurtosis - 3) ** 2 / 4);
  return { statistic, pValue: chiSquareUpperTail(statistic, 2), skewness, kurtosis };
}

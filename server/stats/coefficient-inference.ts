/**
 * The coefficient table: estimate, standard error, t statistic, two-sided p-value and confidence
 * interval for each term, from a covariance matrix of the estimates and Student's t with the
 * residual degrees of freedom (n − rank), whichever covariance was chosen — the convention of R's
 * `lmtest::coeftest` and statsmodels' `use_t=True`.
 */

import { studentTCriticalValue, studentTTwoSidedPValue } from "./student-t";

/** One row of the coefficient table. Aliased terms have NaN everywhere but `aliased: true`. */
export interface CoefficientSummary {
  term: string;
  estimate: number;
  standardError: number;
  tStatistic: number;
  pValue: number;
  lowerBound: number;
  upperBound: number;
  aliased: boolean;
}

/**
 * Builds the coefficient table.
 *
 * @param estimates β for every design column (NaN for aliased ones)
 * @param estimableColumns which design columns the covariance matrix covers, in its order
 * @param covariance rank × rank row-major covariance of the estimable coefficients
 * Cost: O(p) incomplete beta evaluations.
 */
export function summariseCoefficients(
  termNames: readonly string[],
  estimates: Float64Array,
  estimableColumns: readonly number[],
  covariance: Float64Array,
  residualDegreesOfFreedom: number,
  confidenceLevel: number,
): CoefficientSummary[] {
  const rank = estimableColumns.length;
  const criticalValue = studentTCriticalValue(confidenceLevel, residualDegreesOfFreedom);
  const positionOf = new Map(estimableColumns.map((column, position) => [column, position]));
  return termNames.map((term, column) => {
    const position = positionOf.get(column);
    if (position === undefined) {
      return {
        term,
        estimate: NaN,
        standardError: NaN,
        tStatistic: NaN,
        pValue: NaN,
        lowerBound: NaN,
        upperBound: NaN,
        aliased: true,
      };
    }
    const estimate = estimates[column];
    const standardError = Math.sqrt(covariance[position * rank + position]);
    const tStatistic = estimate / standardError;
    return {
      term,
      estimate,
      standardError,
      tStatistic,
      pValue: studentTTwoSidedPValue(tStatistic, residualDegreesOfFreedom),
      lowerBound: estimate - criticalValue * standardError,
      upperBound: estimate + criticalValue * standardError,
      aliased: false,
    };
  });
}

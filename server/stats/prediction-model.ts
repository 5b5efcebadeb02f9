/**
 * What prediction needs from a fit, in one shape whether it comes from a fresh fit or from a
 * stored fit record: coefficients, R⁻¹ (for leverage), the covariance used for intervals, s and
 * its degrees of freedom, the training ranges and the largest training leverage.
 */

import type { CovarianceType } from "./covariance-choice";
import type { ModelSpecification } from "./model-specification";
import type { ObservedRange } from "./observed-range";
import { studentTCriticalValue } from "./student-t";

export interface PredictionModel {
  specification: ModelSpecification;
  /** All design column names, aliased ones included. */
  termNames: readonly string[];
  /** Raw predictor columns a scenario point must provide (see `predictorColumns`). */
  columnNames: readonly string[];
  /** Design columns that have coefficients (indices into termNames). */
  estimableColumns: readonly number[];
  aliasedTerms: readonly string[];
  /** β of the estimable columns. */
  coefficients: Float64Array;
  /** R⁻¹ for the estimable columns, rank × rank row-major upper triangular: h₀ = ‖R⁻ᵀx₀‖². */
  inverseUpper: Float64Array;
  /** Covariance of β used for the confidence interval of a mean (the fit's covariance choice). */
  covariance: Float64Array;
  covarianceType: CovarianceType;
  neweyWestLag: number | null;
  residualStandardError: number;
  residualDegreesOfFreedom: number;
  confidenceLevel: number;
  columnRanges: Readonly<Record<string, ObservedRange>>;
  termRanges: Readonly<Record<string, ObservedRange>>;
  maxTrainingLeverage: number;
  /** Critical values already computed, by confidence level (quantiles cost tens of microseconds). */
  criticalValues: Map<number, number>;
}

/**
 * Critical values shared by all models, by level and degrees of freedom: a server that parses a
 * stored record afresh for each request still skips the quantile (tens of microseconds).
 * Bounded: cleared when it reaches `sharedCacheLimit` entries.
 */
const sharedCriticalValues = new Map<string, number>();
const sharedCacheLimit = 1024;

/** The two-sided Student t critical value for `level`, cached on the model and shared. */
export function criticalValueFor(model: PredictionModel, level: number): number {
  let value = model.criticalValues.get(level);
  if (value !== undefined) return value;
  const key = `${level}|${model.residualDegreesOfFreedom}`;
  value = sharedCriticalValues.get(key);
  if (value === undefined) {
    value = studentTCriticalValue(level, model.residualDegreesOfFreedom);
    if (sharedCriticalValues.size >= sharedCacheLimit) sharedCriticalValues.clear();
    sharedCriticalValues.set(key, value);
  }
  model.criticalValues.set(level, value);
  return value;
}

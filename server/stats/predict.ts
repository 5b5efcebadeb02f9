/**
 * Predictions from a fit or a fit record: the mean response at a scenario point with its
 * confidence interval (CI) and prediction interval (PI), totals over a horizon of H periods, and
 * the difference between two plans.
 *
 * Variances (Montgomery, Peck & Vining, Introduction to Linear Regression Analysis, 5th ed., §3.4–3.5):
 * - mean at x₀: Var(x₀ᵀβ̂) = x₀ᵀVx₀ with V the fit's covariance of β̂ — s²(XᵀX)⁻¹ for classical
 *   (so s²h₀), the HC3 or Newey–West sandwich otherwise. The CI follows the fit's covariance choice.
 * - new observation at x₀: s² + x₀ᵀVx₀. The PI adds s², the estimated variance of one new error.
 * - total over H periods at points x₀₁ … x₀H, with a = Σₜ x₀ₜ = X₀ᵀ1: the mean total aᵀβ̂ has
 *   variance aᵀVa (classical: s² 1ᵀX₀(XᵀX)⁻¹X₀ᵀ1) and the realised total, a sum of H new
 *   observations with independent errors, s²H + aᵀVa. Autocorrelated errors would widen the PI
 *   further; Newey–West only corrects the coefficient uncertainty.
 * - plan A minus plan B: d = a_A − a_B, difference dᵀβ̂ with variance dᵀVd — computed from the
 *   covariance, not by subtracting intervals, because both totals share the same β̂ and their
 *   errors are strongly positively correlated. Only a CI is given: the two plans are alternatives
 *   for the same future, so future noise does not separate them.
 * Intervals use Student's t with the fit's residual degrees of freedom.
 */

import { type ExtrapolationReport, extrapolationReport } from "./extrapolation";
import type { LeastSquaresFit } from "./fit-least-squares";
import { type FitRecord, predictionModelFromRecord } from "./fit-record";
import { type PredictionModel, criticalValueFor } from "./prediction-model";
import { type NamedPoint, evaluateScenarioPoint } from "./scenario-point";

/** Anything prediction can start from: a fresh fit or a stored record. */
export type PredictionSource = LeastSquaresFit | FitRecord;

export interface PredictionOptions {
  /** Confidence level of the intervals (default: the fit's level, usually 0.95). */
  confidenceLevel?: number;
}

export interface Interval {
  lower: number;
  upper: number;
}

export interface PointPrediction {
  mean: number;
  /** √(x₀ᵀVx₀). */
  standardErrorOfMean: number;
  /** √(s² + x₀ᵀVx₀). */
  standardErrorOfPrediction: number;
  /** For the mean response at x₀. */
  confidenceInterval: Interval;
  /** For one new observation at x₀. */
  predictionInterval: Interval;
  confidenceLevel: number;
  /** h₀ = x₀ᵀ(XᵀX)⁻¹x₀. */
  leverage: number;
  extrapolation: ExtrapolationReport;
  warnings: string[];
}

/**
 * A plan over H periods: the same point for `periods` periods (default 1), or one point per period.
 */
export type Plan = { point: NamedPoint; periods?: number } | { points: readonly NamedPoint[] };

export interface TotalPrediction {
  periods: number;
  /** Predicted total of the outcome over the periods. */
  total: number;
  /** √(aᵀVa), a = sum of the periods' design rows. */
  standardErrorOfTotal: number;
  /** √(H s² + aᵀVa). */
  standardErrorOfPrediction: number;
  confidenceInterval: Interval;
  predictionInterval: Interval;
  confidenceLevel: number;
  /** One report per distinct point: one for a repeated point, H for a list. */
  extrapolation: ExtrapolationReport[];
  extrapolating: boolean;
  warnings: string[];
}

export interface DifferencePrediction {
  /** Total of plan A minus total of plan B. */
  difference: number;
  /** √(dᵀVd), d = a_A − a_B. */
  standardError: number;
  confidenceInterval: Interval;
  confidenceLevel: number;
  totalA: number;
  totalB: number;
  extrapolating: boolean;
  warnings: string[];
}

function toModel(source: PredictionSource): PredictionModel {
  return "predictionModel" in source ? source.predictionModel : predictionModelFromRecord(source);
}

function levelOf(model: PredictionModel, options: PredictionOptions, caller: string): number {
  const level = options.confidenceLevel ?? model.confidenceLevel;
  if (!(level > 0 && level < 1)) {
    throw new Error(`${caller} requires a confidence level strictly between 0 and 1 (got ${level})`);
  }
  return level;
}

function aliasWarnings(model: PredictionModel): string[] {
  return model.aliasedTerms.length === 0
    ? []
    : [`aliased terms ${model.aliasedTerms.map((term) => `'${term}'`).join(", ")} have no coefficient and are ignored`];
}

/** Estimable part of x₀, its leverage and its extrapolation report. */
function analysePoint(model: PredictionModel, point: NamedPoint, caller: string) {
  const row = evaluateScenarioPoint(model.specification, point, caller);
  const rank = model.estimableColumns.length;
  const estimable = new Float64Array(rank);
  for (let position = 0; position < rank; position++) estimable[position] = row[model.estimableColumns[position]];
  // u = R⁻ᵀx₀ (uₖ = Σ_{j ≤ k} x₀ⱼ (R⁻¹)ⱼₖ), h₀ = ‖u‖².
  let leverage = 0;
  for (let column = 0; column < rank; column++) {
    let sum = 0;
    for (let inner = 0; inner <= column; inner++) sum += estimable[inner] * model.inverseUpper[inner * rank + column];
    leverage += sum * sum;
  }
  const report = extrapolationReport(
    model.columnNames,
    point,
    model.termNames,
    row,
    model.columnRanges,
    model.termRanges,
    leverage,
    model.maxTrainingLeverage,
  );
  return { estimable, leverage, report };
}

/** aᵀVa and aᵀβ. */
function meanAndVariance(model: PredictionModel, vector: Float64Array): { mean: number; variance: number } {
  const rank = vector.length;
  let mean = 0;
  let variance = 0;
  for (let row = 0; row < rank; row++) {
    mean += model.coefficients[row] * vector[row];
    let sum = 0;
    for (let column = 0; column < rank; column++) sum += model.covariance[row * rank + column] * vector[column];
    variance += vector[row] * sum;
  }
  return { mean, variance: Math.max(variance, 0) };
}

function interval(center: number, halfWidth: number): Interval {
  return { lower: center - halfWidth, upper: center + halfWidth };
}

/**
 * Predicts the outcome at one scenario point.
 *
 * @example predict(fit, { tv: 120, radio: 30 }).predictionInterval // => { lower: …, upper: … }
 * @throws if the point lacks a column the model reads, or the level is outside (0, 1)
 * Cost: O(p²) — a few microseconds once the critical value for the level is cached.
 */
export function predict(source: PredictionSource, point: NamedPoint, options: PredictionOptions = {}): PointPrediction {
  const caller = "predict";
  const model = toModel(source);
  const confidenceLevel = levelOf(model, options, caller);
  const { estimable, leverage, report } = analysePoint(model, point, caller);
  const { mean, variance } = meanAndVariance(model, estimable);
  const residualVariance = model.residualStandardError ** 2;
  const standardErrorOfMean = Math.sqrt(variance);
  const standardErrorOfPrediction = Math.sqrt(residualVariance + variance);
  const critical = criticalValueFor(model, confidenceLevel);
  return {
    mean,
    standardErrorOfMean,
    standardErrorOfPrediction,
    confidenceInterval: interval(mean, critical * standardErrorOfMean),
    predictionInterval: interval(mean, critical * standardErrorOfPrediction),
    confidenceLevel,
    leverage,
    extrapolation: report,
    warnings: aliasWarnings(model),
  };
}

/** Same as `predict`, named for the record path the web server takes on each slider move. */
export function predictFromRecord(record: FitRecord, point: NamedPoint, options: PredictionOptions = {}): PointPrediction {
  return predict(record, point, options);
}

/** Sum of a plan's design rows (estimable part), its period count and per-point reports. */
function sumPlan(model: PredictionModel, plan: Plan, caller: string) {
  const rank = model.estimableColumns.length;
  const sum = new Float64Array(rank);
  const reports: ExtrapolationReport[] = [];
  if ("points" in plan) {
    if (plan.points.length === 0) throw new Error(`${caller} requires at least one period in a plan`);
    for (const point of plan.points) {
      const { estimable, report } = analysePoint(model, point, caller);
      for (let position = 0; position < rank; position++) sum[position] += estimable[position];
      reports.push(report);
    }
    return { sum, periods: plan.points.length, reports };
  }
  const periods = plan.periods ?? 1;
  if (!Number.isInteger(periods) || periods < 1) {
    throw new Error(`${caller} requires a whole number of periods of at least 1 (got ${periods})`);
  }
  const { estimable, report } = analysePoint(model, plan.point, caller);
  for (let position = 0; position < rank; position++) sum[position] = estimable[position] * periods;
  return { sum, periods, reports: [report] };
}

/**
 * Predicts the total outcome over a plan's H periods, with intervals for the expected total (CI)
 * and for the realised total (PI).
 *
 * @throws if the plan is empty, periods is not a positive integer, or a point is incomplete
 * Cost: O(H·p²).
 */
export function predictTotal(source: PredictionSource, plan: Plan, options: PredictionOptions = {}): TotalPrediction {
  const caller = "predictTotal";
  const model = toModel(source);
  const confidenceLevel = levelOf(model, options, caller);
  const { sum, periods, reports } = sumPlan(model, plan, caller);
  const { mean, variance } = meanAndVariance(model, sum);
  const standardErrorOfTotal = Math.sqrt(variance);
  const standardErrorOfPrediction = Math.sqrt(periods * model.residualStandardError ** 2 + variance);
  const critical = criticalValueFor(model, confidenceLevel);
  return {
    periods,
    total: mean,
    standardErrorOfTotal,
    standardErrorOfPrediction,
    confidenceInterval: interval(mean, critical * standardErrorOfTotal),
    predictionInterval: interval(mean, critical * standardErrorOfPrediction),
    confidenceLevel,
    extrapolation: reports,
    extrapolating: reports.some((report) => report.extrapolating),
    warnings: aliasWarnings(model),
  };
}

/**
 * The difference in expected total outcome between plan A and plan B, with its confidence
 * interval from the fit's covariance.
 *
 * @throws as for `predictTotal`
 * Cost: O((H_A + H_B)·p²).
 */
export function predictDifference(
  source: PredictionSource,
  planA: Plan,
  planB: Plan,
  options: PredictionOptions = {},
): DifferencePrediction {
  const caller = "predictDifference";
  const model = toModel(source);
  const confidenceLevel = levelOf(model, options, caller);
  const first = sumPlan(model, planA, caller);
  const second = sumPlan(model, planB, caller);
  const difference = Float64Array.from(first.sum, (value, position) => value - second.sum[position]);
  const { mean, variance } = meanAndVariance(model, difference);
  const standardError = Math.sqrt(variance);
  const critical = criticalValueFor(model, confidenceLevel);
  return {
    difference: mean,
    standardError,
    confidenceInterval: interval(mean, critical * standardError),
    confidenceLevel,
    totalA: meanAndVariance(model, first.sum).mean,
    totalB: meanAndVariance(model, second.sum).mean,
    extrapolating: [...first.reports, ...second.reports].some((report) => report.extrapolating),
    warnings: aliasWarnings(model),
  };
}

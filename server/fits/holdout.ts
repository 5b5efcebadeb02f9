import "server-only";
import { type LeastSquaresFit, type NamedColumns, buildDesign, fitLeastSquares, predict, predictorColumns } from "@/server/stats";
import type { FitComputeInput } from "./compute";
import { engineMessage, isEngineRefusal } from "./specification";
import type { HoldoutCheck, HoldoutRow } from "./types";

/** Rows held out: a quarter of weekly data, at most a fifth of the history. */
export const HOLDOUT_PERIODS = 13;
/** Above this many rows the check is skipped: refitting would double a large fit's time and memory for 13 rows' worth of insight. */
export const HOLDOUT_MAX_ROWS = 100_000;

const slice = (columns: NamedColumns, names: readonly string[], end: number): Record<string, Float64Array> =>
  Object.fromEntries(names.map((name) => [name, Float64Array.from(columns[name].slice(0, end))]));

/**
 * P(X ≤ k) for X ~ Binomial(n, p): how surprising it is that only k of n actual values fell inside
 * intervals that should each hold them with probability p (if the rows were independent).
 */
export function binomialLowerTail(k: number, n: number, p: number): number {
  let total = 0;
  let choose = 1; // C(n, i), built up term by term
  for (let i = 0; i <= k; i++) {
    if (i > 0) choose = (choose * (n - i + 1)) / i;
    total += choose * p ** i * (1 - p) ** (n - i);
  }
  return Math.min(1, total);
}

/**
 * How the model would have done on the most recent periods it had not seen: refit the same terms,
 * level and standard errors on every row but the last `HOLDOUT_PERIODS` (in period order), predict
 * those rows, and count how many actual values fall inside their prediction intervals. A guide to
 * how far to trust the intervals on new weeks, not a proof: the market of the next quarter may differ.
 * Skipped (with the reason) without a period column (no order to hold out by), with too few rows
 * for the refit, for very large histories, or when the refit itself is refused (e.g. a term that
 * does not vary in the earlier rows).
 */
export function holdoutCheck(input: FitComputeInput, fit: LeastSquaresFit): HoldoutCheck {
  const n = fit.observationCount;
  if (!input.periodColumn) return { status: "skipped", reason: "The spend history has no period column, so there is no order to hold the latest rows out by." };
  if (n > HOLDOUT_MAX_ROWS) return { status: "skipped", reason: `Histories above ${HOLDOUT_MAX_ROWS.toLocaleString("en")} rows are not refitted for this check.` };
  const periods = Math.min(HOLDOUT_PERIODS, Math.floor(n / 5));
  const trainedOn = n - periods;
  if (periods < 2 || trainedOn <= fit.parameterCount + 1) {
    return { status: "skipped", reason: `Too few rows (${n}) to refit ${fit.parameterCount} coefficients without the latest ones.` };
  }
  const predictors = predictorColumns(input.specification);
  let earlier: LeastSquaresFit;
  try {
    earlier = fitLeastSquares(buildDesign(input.specification, slice(input.columns, [input.specification.outcome, ...predictors], trainedOn)), {
      confidenceLevel: input.level,
      covariance: input.covariance,
    });
  } catch (error) {
    if (!isEngineRefusal(error)) throw error;
    return { status: "skipped", reason: `Without the latest ${periods} rows the refit is refused. ${engineMessage(error)}` };
  }
  if (earlier.aliasedTerms.length > 0) {
    return { status: "skipped", reason: `Without the latest ${periods} rows, ${earlier.aliasedTerms.map((term) => `'${term}'`).join(", ")} cannot be told apart from other terms.` };
  }
  const outcome = input.columns[input.specification.outcome];
  const rows: HoldoutRow[] = [];
  let absolute = 0;
  let squared = 0;
  let percent = 0;
  let percentDefined = true;
  let inside = 0;
  for (let row = trainedOn; row < n; row++) {
    const point = Object.fromEntries(predictors.map((name) => [name, input.columns[name][row]]));
    const prediction = predict(earlier, point);
    const actual = outcome[row];
    const error = actual - prediction.mean;
    absolute += Math.abs(error);
    squared += error * error;
    if (actual === 0) percentDefined = false;
    else percent += Math.abs(error / actual);
    const within = actual >= prediction.predictionInterval.lower && actual <= prediction.predictionInterval.upper;
    if (within) inside++;
    rows.push({
      label: input.periodLabels?.[row] ?? null,
      actual,
      predicted: prediction.mean,
      lower: prediction.predictionInterval.lower,
      upper: prediction.predictionInterval.upper,
      inside: within,
      // Outside the earlier rows' ranges or their combinations: the interval there is a reach.
      extrapolating: prediction.extrapolation.extrapolating,
    });
  }
  const level = earlier.confidenceLevel;
  return {
    status: "done",
    periods,
    trainedOn,
    level,
    rows,
    inside,
    fewerInsideThanExpected: binomialLowerTail(inside, periods, level) < 0.05,
    meanAbsoluteError: absolute / periods,
    rootMeanSquaredError: Math.sqrt(squared / periods),
    meanAbsolutePercentageError: percentDefined ? percent / periods : null,
  };
}

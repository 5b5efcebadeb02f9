/**
 * Ordinary least squares with full inference: the solve (see `solveLeastSquares`), the coefficient
 * table under a chosen covariance, whole-model statistics, collinearity and per-observation
 * diagnostics. The shape follows statsmodels' OLS results (Seabold & Perktold, 2010) with names
 * spelled out.
 */

import type { Design } from "./build-design";
import { type CoefficientSummary, summariseCoefficients } from "./coefficient-inference";
import { type Collinearity, collinearityDiagnostics } from "./collinearity";
import { type CovarianceChoice, type CovarianceType, resolveCovarianceChoice } from "./covariance-choice";
import { type GoodnessOfFit, goodnessOfFit, waldStatistic } from "./goodness-of-fit";
import { type ModelSpecification, predictorColumns } from "./model-specification";
import {
  cooksDistances,
  durbinWatson,
  externallyStudentizedResiduals,
  fittedValues,
  studentizedResiduals,
} from "./observation-diagnostics";
import type { PredictionModel } from "./prediction-model";
import { type ResidualTests, createHeteroskedasticityAccumulator, jarqueBera } from "./residual-tests";
import { type RowBlock, passOverRows } from "./row-blocks";
import {
  type MeatAccumulator,
  createHc3Accumulator,
  createNeweyWestAccumulator,
  sandwich,
} from "./sandwich-covariance";
import { type LeastSquaresSolution, type SolveAccuracy, type SolveOptions, solveLeastSquares } from "./solve-least-squares";

/** Default confidence level of intervals. */
export const defaultConfidenceLevel = 0.95;

export interface FitOptions extends SolveOptions {
  /** Covariance for standard errors and intervals; default classical. */
  covariance?: CovarianceChoice;
  /** Confidence level of the coefficient intervals and the default for predictions (default 0.95). */
  confidenceLevel?: number;
}

/** The result of `fitLeastSquares`. Per-observation arrays are in the design's row order. */
export interface LeastSquaresFit extends GoodnessOfFit {
  specification: ModelSpecification;
  termNames: string[];
  hasIntercept: boolean;
  observationCount: number;
  /** Design columns (the intercept included), aliased ones included. */
  parameterCount: number;
  /** Columns actually estimated (parameterCount minus aliased terms). */
  rank: number;
  aliasedTerms: string[];
  coefficients: CoefficientSummary[];
  /** β for every design column (NaN for aliased terms). */
  estimates: Float64Array;
  confidenceLevel: number;
  covarianceType: CovarianceType;
  /** Newey–West lag used, else null. */
  neweyWestLag: number | null;
  /** Covariance of the estimable coefficients under the chosen type, rank × rank row-major. */
  covariance: Float64Array;
  /** s: √(RSS / (n − rank)). */
  residualStandardError: number;
  residualDegreesOfFreedom: number;
  residualSumOfSquares: number;
  collinearity: Collinearity;
  /** κ₂ of the design with every column scaled to unit length. */
  conditionNumber: number;
  residuals: Float64Array;
  /** Hat values hᵢ = xᵢᵀ(XᵀX)⁻¹xᵢ. */
  leverages: Float64Array;
  maxLeverage: number;
  durbinWatson: number;
  /** Breusch–Pagan (Koenker) for unequal error variance and Jarque–Bera for non-normal errors. */
  residualTests: ResidualTests;
  /** ŷ = y − r (computed on first access). */
  readonly fittedValues: Float64Array;
  /** rᵢ / (s √(1 − hᵢ)) (computed on first access). */
  readonly studentizedResiduals: Float64Array;
  /** Residuals studentized with s₍ᵢ₎ from the fit without observation i (computed on first access). */
  readonly externallyStudentizedResiduals: Float64Array;
  /** Cook's distances (computed on first access). */
  readonly cooksDistances: Float64Array;
  accuracy: SolveAccuracy;
  /** Things a reader of the numbers should know (aliased terms, leverages of 1, exact fit). */
  warnings: string[];
  /** Everything prediction needs (also what `createFitRecord` stores). */
  predictionModel: PredictionModel;
}

/**
 * Fits y = Xβ + ε by least squares and computes the inference and diagnostics.
 *
 * @example
 * const design = buildDesign({ outcome: "y", intercept: true, terms: [{ kind: "linear", column: "x" }] },
 *   { y: [1, 3, 2, 5, 4], x: [1, 2, 3, 4, 5] });
 * fitLeastSquares(design).coefficients[1].estimate // => 0.8
 * @throws see `solveLeastSquares` (n ≤ p, non-finite values, constant outcome), and for an
 *   invalid covariance choice or confidence level
 * Cost: the solve, plus n·rank² flops for leverages (n·rank²(lag + 1) more for Newey–West) and
 *   2n·rank for the Breusch–Pagan test;
 *   memory 2n doubles (residuals, leverages) plus n per diagnostic array read.
 */
export function fitLeastSquares(design: Design, options: FitOptions = {}): LeastSquaresFit {
  const caller = "fitLeastSquares";
  const confidenceLevel = options.confidenceLevel ?? defaultConfidenceLevel;
  if (!(confidenceLevel > 0 && confidenceLevel < 1)) {
    throw new Error(`${caller} requires a confidence level strictly between 0 and 1 (got ${confidenceLevel})`);
  }
  const covarianceChoice = resolveCovarianceChoice(options.covariance, design.rowCount, caller);
  const solution = solveLeastSquares(design, options, caller);
  return completeFit(solution, covarianceChoice, confidenceLevel);
}

function completeFit(
  solution: LeastSquaresSolution,
  covarianceChoice: { type: CovarianceType; lag: number | null },
  confidenceLevel: number,
): LeastSquaresFit {
  const { design, rank, estimableColumns, estimates } = solution;
  const { rowCount, termNames } = design;
  const residualDegreesOfFreedom = rowCount - rank;
  const warnings: string[] = [];
  if (solution.aliasedTerms.length > 0) {
    const named = solution.aliasedTerms.map((term) => `'${term}'`).join(", ");
    warnings.push(
      solution.aliasedTerms.length === 1
        ? `term ${named} is a linear combination of earlier terms (aliased) and was left out`
        : `terms ${named} are linear combinations of earlier terms (aliased) and were left out`,
    );
  }

  let accumulator: MeatAccumulator | null = null;
  if (covarianceChoice.type === "hc3") accumulator = createHc3Accumulator(rank);
  if (covarianceChoice.type === "newey-west") accumulator = createNeweyWestAccumulator(rank, covarianceChoice.lag ?? 0);
  const heteroskedasticity = createHeteroskedasticityAccumulator(rank);
  const visitors = [(block: RowBlock) => heteroskedasticity.visit(block)];
  if (accumulator !== null) visitors.push((block: RowBlock) => accumulator.visit(block));
  const { residuals, leverages } = passOverRows(solution, visitors);

  let residualSumOfSquares = solution.residualSumOfSquares;
  if (solution.refinedResiduals === null) {
    // Use the residual vector itself so σ, studentized residuals and Cook's distances agree.
    residualSumOfSquares = 0;
    for (let row = 0; row < rowCount; row++) residualSumOfSquares += residuals[row] * residuals[row];
  }
  const residualVariance = residualSumOfSquares / residualDegreesOfFreedom;
  const residualStandardError = Math.sqrt(residualVariance);
  if (residualSumOfSquares === 0) warnings.push("the fit is exact: residuals are zero, so standard errors are zero");

  let maxLeverage = 0;
  for (let row = 0; row < rowCount; row++) if (leverages[row] > maxLeverage) maxLeverage = leverages[row];
  const classicalCovariance = Float64Array.from(solution.inverseGram, (value) => value * residualVariance);
  const covariance = accumulator === null ? classicalCovariance : sandwich(solution.inverseUpper, accumulator.finish(), rank);
  if (covarianceChoice.type === "hc3" && maxLeverage >= 1 - 1e-12) {
    warnings.push("an observation has leverage 1, so the HC3 covariance is not finite");
  }

  const estimableEstimates = Float64Array.from(estimableColumns, (column) => estimates[column]);
  const slopePositions = estimableColumns.flatMap((_, position) => (design.hasIntercept && position === 0 ? [] : [position]));
  const fitStatistics = goodnessOfFit({
    outcome: design.outcome,
    hasIntercept: design.hasIntercept,
    rank,
    residualSumOfSquares,
    waldStatistic:
      covarianceChoice.type === "classical" ? null : waldStatistic(estimableEstimates, covariance, rank, slopePositions),
  });

  const estimableTerms = estimableColumns.map((column) => termNames[column]);
  const collinearity = collinearityDiagnostics(
    estimableTerms,
    estimableColumns.map((column) => design.values.subarray(column * rowCount, (column + 1) * rowCount)),
    solution.scaledUpper,
    solution.scaledInverseUpper,
    design.hasIntercept,
  );

  const predictionModel: PredictionModel = {
    specification: design.specification,
    termNames,
    columnNames: predictorColumns(design.specification),
    estimableColumns,
    aliasedTerms: solution.aliasedTerms,
    coefficients: estimableEstimates,
    inverseUpper: solution.inverseUpper,
    covariance,
    covarianceType: covarianceChoice.type,
    neweyWestLag: covarianceChoice.lag,
    residualStandardError,
    residualDegreesOfFreedom,
    confidenceLevel,
    columnRanges: design.columnRanges,
    termRanges: design.termRanges,
    maxTrainingLeverage: maxLeverage,
    criticalValues: new Map(),
  };

  // Diagnostics that are cheap to derive are computed on first read and kept (n doubles each).
  let fitted: Float64Array | null = null;
  let internal: Float64Array | null = null;
  let external: Float64Array | null = null;
  let cooks: Float64Array | null = null;
  const internalStudentized = () => {
    internal ??= studentizedResiduals(residuals, leverages, residualStandardError);
    return internal;
  };

  return {
    ...fitStatistics,
    specification: design.specification,
    termNames,
    hasIntercept: design.hasIntercept,
    observationCount: rowCount,
    parameterCount: design.columnCount,
    rank,
    aliasedTerms: solution.aliasedTerms,
    coefficients: summariseCoefficients(
      termNames,
      estimates,
      estimableColumns,
      covariance,
      residualDegreesOfFreedom,
      confidenceLevel,
    ),
    estimates,
    confidenceLevel,
    covarianceType: covarianceChoice.type,
    neweyWestLag: covarianceChoice.lag,
    covariance,
    residualStandardError,
    residualDegreesOfFreedom,
    residualSumOfSquares,
    collinearity,
    conditionNumber: solution.conditionNumber,
    residuals,
    leverages,
    maxLeverage,
    durbinWatson: durbinWatson(residuals),
    residualTests: { heteroskedasticity: heteroskedasticity.finish(residuals, design.hasIntercept), normality: jarqueBera(residuals) },
    get fittedValues() {
      fitted ??= fittedValues(design.outcome, residuals);
      return fitted;
    },
    get studentizedResiduals() {
      return internalStudentized();
    },
    get externallyStudentizedResiduals() {
      external ??= externallyStudentizedResiduals(internalStudentized(), residualDegreesOfFreedom);
      return external;
    },
    get cooksDistances() {
      cooks ??= cooksDistances(internalStudentized(), leverages, rank);
      return cooks;
    },
    accuracy: solution.accuracy,
    warnings,
    predictionModel,
  };
}

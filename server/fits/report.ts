import "server-only";
import { type FitRecord, type LeastSquaresFit, termColumns } from "@/server/stats";
import { periodCoverage } from "@/server/datasets/period-coverage";
import { normalQq, pointsAt, scatterRows, timeSeries } from "./plot-data";
import type { CoefficientRow, FitReport, HoldoutCheck } from "./types";

const finiteOrNull = (value: number) => (Number.isFinite(value) ? value : null);

function residualTestsOf(fit: LeastSquaresFit): NonNullable<FitReport["residualTests"]> {
  const { heteroskedasticity, normality } = fit.residualTests;
  const finite = (...values: number[]) => values.every(Number.isFinite);
  return {
    heteroskedasticity:
      heteroskedasticity && finite(heteroskedasticity.statistic, heteroskedasticity.pValue)
        ? { statistic: heteroskedasticity.statistic, df: heteroskedasticity.degreesOfFreedom, pValue: heteroskedasticity.pValue }
        : null,
    normality: normality && finite(normality.statistic, normality.pValue, normality.skewness, normality.kurtosis) ? { ...normality } : null,
  };
}

/**
 * The report of a fit: the engine's numbers renamed for the API (estimate, stdError, tStatistic,
 * pValue, ciLow, ciHigh, vif…), exact, plus plot data for the diagnostics.
 *
 * @param periodLabels the dataset's period of each row (ISO dates), or null when it has none
 * @param units unit or currency of each column, null when unknown
 */
export function buildFitReport(input: {
  fit: LeastSquaresFit;
  record: FitRecord;
  /** The held-out check (server/fits/holdout.ts); left out of reports built without it. */
  holdout?: HoldoutCheck;
  periodColumn: string | null;
  periodLabels: readonly string[] | null;
  /** Data row number (1-based, file order) of each fitted row; default 1, 2, … */
  rowNumbers?: ArrayLike<number> | null;
  /** The outcome column as fitted (for the time plot). */
  outcomeValues: Float64Array;
  units: Record<string, string | null>;
}): FitReport {
  const { fit, record } = input;
  const specification = fit.specification;
  const vifByTerm = new Map<string, number>();
  fit.collinearity.terms.forEach((term, index) => vifByTerm.set(term, fit.collinearity.varianceInflationFactors[index]));

  const coefficients: CoefficientRow[] = fit.coefficients.map((row, index) => {
    const term = fit.hasIntercept ? (index === 0 ? null : specification.terms[index - 1]) : specification.terms[index];
    return {
      term: row.term,
      kind: term === null ? "intercept" : term.kind,
      columns: term === null ? [] : [...termColumns(term)],
      estimate: finiteOrNull(row.estimate),
      stdError: finiteOrNull(row.standardError),
      tStatistic: finiteOrNull(row.tStatistic),
      pValue: finiteOrNull(row.pValue),
      ciLow: finiteOrNull(row.lowerBound),
      ciHigh: finiteOrNull(row.upperBound),
      vif: term === null ? null : finiteOrNull(vifByTerm.get(row.term) ?? NaN),
      aliased: row.aliased,
    };
  });

  const size = fit.collinearity.terms.length;
  const correlations = Array.from({ length: size }, (_, a) =>
    Array.from({ length: size }, (_, b) => fit.collinearity.correlations[a * size + b]),
  );

  const fitted = fit.fittedValues;
  const standardized = fit.studentizedResiduals;
  const cooks = fit.cooksDistances;
  const rows = scatterRows({ standardized, leverages: fit.leverages, cooks });
  let maxCooks = -Infinity;
  for (const value of cooks) if (value > maxCooks) maxCooks = value;

  const units: Record<string, string | null> = {};
  for (const column of [specification.outcome, ...specification.terms.flatMap((term) => termColumns(term))]) {
    units[column] = input.units[column] ?? null;
  }

  return {
    reportVersion: 1,
    outcome: specification.outcome,
    units,
    periodColumn: input.periodColumn,
    intercept: fit.hasIntercept,
    level: fit.confidenceLevel,
    covariance: { type: fit.covarianceType, lag: fit.neweyWestLag },
    n: fit.observationCount,
    parameterCount: fit.parameterCount,
    rank: fit.rank,
    dfModel: fit.fNumeratorDegreesOfFreedom,
    dfResidual: fit.residualDegreesOfFreedom,
    coefficients,
    rSquared: fit.rSquared,
    adjRSquared: fit.adjustedRSquared,
    rSquaredUncentred: !fit.rSquaredCentred,
    sigma: fit.residualStandardError,
    fStatistic: finiteOrNull(fit.fStatistic),
    fPValue: finiteOrNull(fit.fPValue),
    fTestKind: fit.fTestKind,
    fDf: [fit.fNumeratorDegreesOfFreedom, fit.fDenominatorDegreesOfFreedom],
    durbinWatson: finiteOrNull(fit.durbinWatson),
    residualTests: residualTestsOf(fit),
    ...(input.holdout ? { holdout: input.holdout } : {}),
    periodCoverage: input.periodLabels ? periodCoverage(input.periodLabels) : null,
    logLik: fit.logLikelihood,
    aic: fit.akaikeInformationCriterion,
    bic: fit.bayesianInformationCriterion,
    conditionNumber: fit.conditionNumber,
    collinearity: {
      terms: [...fit.collinearity.terms],
      correlations,
      vif: Array.from(fit.collinearity.varianceInflationFactors),
      centred: fit.collinearity.varianceInflationCentred,
    },
    diagnostics: {
      total: fit.observationCount,
      sampled: rows.length < fit.observationCount,
      points: pointsAt(rows, { fitted, residuals: fit.residuals, standardized, leverages: fit.leverages, cooks }, input.rowNumbers ?? null),
      qq: normalQq(standardized),
      series: timeSeries(input.outcomeValues, fitted, input.periodLabels, input.rowNumbers ?? null),
      maxCooks: finiteOrNull(maxCooks),
      maxLeverage: fit.maxLeverage,
    },
    warnings: [...fit.warnings],
    recordChecksum: record.checksum,
  };
}

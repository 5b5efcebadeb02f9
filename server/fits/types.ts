import "server-only";
import type { PeriodCoverage } from "@/server/datasets/period-coverage";
import type { CovarianceType, ModelSpecification } from "@/server/stats";

import type { FitStatus } from "@/db/schema/fits";

export { fitStatuses, type FitStatus } from "@/db/schema/fits";

export const termTransforms = ["none", "log1p"] as const;
export type TermTransform = (typeof termTransforms)[number];

/** One column entering the model, as the builder and the API describe it. */
export type FitTermInput = { column: string; transform: TermTransform; role: "spend" | "control" };

export type CovarianceInput = { type: "classical" } | { type: "hc3" } | { type: "newey-west"; lag?: number };

/** What an analyst asks for: validated by the route's zod schema, turned into the engine's specification. */
export type FitInput = {
  datasetId: string;
  name?: string;
  outcome: string;
  terms: FitTermInput[];
  interactions: [string, string][];
  intercept: boolean;
  level: number;
  covariance: CovarianceInput;
};

/** One row of the coefficient table. Numbers the engine leaves undefined (NaN) are null. */
export type CoefficientRow = {
  term: string;
  kind: "intercept" | "linear" | "control" | "log1p" | "power" | "interaction";
  /** Raw data columns the term reads (empty for the intercept). */
  columns: string[];
  estimate: number | null;
  stdError: number | null;
  tStatistic: number | null;
  pValue: number | null;
  ciLow: number | null;
  ciHigh: number | null;
  /** Variance inflation factor; null for the intercept and aliased terms. */
  vif: number | null;
  aliased: boolean;
};

/** Per-observation diagnostics for plots, column-wise; `row` is the data row number (1-based, file order). */
export type DiagnosticPoints = {
  row: number[];
  fitted: number[];
  residual: number[];
  standardized: (number | null)[];
  leverage: number[];
  cooks: (number | null)[];
};

/**
 * The fit report: the engine's numbers, exact, plus plot data (downsampled beyond a few thousand
 * rows — every statistic is still computed on all rows). Stored with the fit and sent as is by the API.
 */
export type FitReport = {
  reportVersion: 1;
  outcome: string;
  /** Unit or currency of each column used (outcome included), null when the dataset names none. */
  units: Record<string, string | null>;
  periodColumn: string | null;
  intercept: boolean;
  level: number;
  covariance: { type: CovarianceType; lag: number | null };
  n: number;
  parameterCount: number;
  rank: number;
  dfModel: number;
  dfResidual: number;
  coefficients: CoefficientRow[];
  rSquared: number;
  adjRSquared: number;
  /** True without an intercept: R² is then 1 − RSS/Σy², not comparable with a centred R². */
  rSquaredUncentred: boolean;
  /** Residual standard error. */
  sigma: number;
  fStatistic: number | null;
  fPValue: number | null;
  fTestKind: "anova" | "wald";
  fDf: [number, number];
  durbinWatson: number | null;
  /**
   * Breusch–Pagan (Koenker's studentized form) for error variance that changes with the regressors, and
   * Jarque–Bera for non-normal errors. Absent from reports stored before these tests were added.
   */
  residualTests?: {
    heteroskedasticity: { statistic: number; df: number; pValue: number } | null;
    normality: { statistic: number; pValue: number; skewness: number; kurtosis: number } | null;
  };
  /** The latest periods predicted by a refit without them. Absent from reports stored before the check was added. */
  holdout?: HoldoutCheck;
  /** Whether the fitted rows' periods come at one steady step (null without a period column). Absent from older reports. */
  periodCoverage?: PeriodCoverage | null;
  logLik: number;
  aic: number;
  bic: number;
  conditionNumber: number;
  collinearity: { terms: string[]; correlations: number[][]; vif: number[]; centred: boolean };
  diagnostics: {
    total: number;
    sampled: boolean;
    points: DiagnosticPoints;
    qq: { theoretical: number[]; sample: number[] };
    series: { label: string[]; outcome: number[]; fitted: number[]; rowsPerPoint: number };
    maxCooks: number | null;
    maxLeverage: number;
  };
  warnings: string[];
  recordChecksum: string;
};

export type FitSummaryDto = {
  id: string;
  name: string;
  status: FitStatus;
  datasetId: string;
  datasetName: string | null;
  outcome: string;
  termCount: number;
  n: number;
  rSquared: number;
  authorId: string | null;
  authorName: string | null;
  createdAt: Date;
  updatedAt: Date;
  submittedAt: Date | null;
  approvedAt: Date | null;
  retiredAt: Date | null;
};

export type FitDto = FitSummaryDto & {
  workspaceId: string;
  specification: ModelSpecification;
  input: FitInput;
  level: number;
  covariance: { type: CovarianceType; lag: number | null };
  recordChecksum: string;
  approvedBy: string | null;
  approvedByName: string | null;
  report: FitReport;
};

export type FitTrailEntry = {
  id: number;
  at: Date;
  action: string;
  actorName: string | null;
  actorEmail: string | null;
  from: FitStatus | null;
  to: FitStatus | null;
  comment: string | null;
};

/** One held-out row: the actual outcome against the refit's prediction interval. */
export type HoldoutRow = {
  /** The row's period (ISO date), null without labels. */
  label: string | null;
  actual: number;
  predicted: number;
  lower: number;
  upper: number;
  inside: boolean;
  /** The row lies outside the earlier rows' ranges or their combinations. */
  extrapolating: boolean;
};

export type HoldoutCheck =
  | {
      status: "done";
      /** Rows held out (the latest, in period order). */
      periods: number;
      /** Rows the refit used. */
      trainedOn: number;
      /** Level of the prediction intervals. */
      level: number;
      rows: HoldoutRow[];
      /** Held-out rows whose actual outcome fell inside the prediction interval. */
      inside: number;
      /** So few inside that intervals of this level would rarely (under 5%) do as badly: the recent rows differ from the history. */
      fewerInsideThanExpected: boolean;
      meanAbsoluteError: number;
      rootMeanSquaredError: number;
      /** Null when an actual outcome is zero. */
      meanAbsolutePercentageError: number | null;
    }
  | { status: "skipped"; reason: string };

/** What the scenario room says about a fit's held-out check. */
export type HeldOutSummary = { inside: number; periods: number; level: number; fewerInsideThanExpected: boolean };

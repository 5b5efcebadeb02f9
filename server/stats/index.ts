/**
 * Tributary's regression engine: pure, isomorphic TypeScript (no I/O, no Node-only modules), used
 * by route handlers and, for instant previews, by client components. See README.md.
 */

// Model specification and design matrix
export * from "./model-specification";
export { type Design, type NamedColumns, buildDesign } from "./build-design";
export type { ObservedRange } from "./observed-range";
export { type NamedPoint, evaluateScenarioPoint } from "./scenario-point";

// Fitting and inference
export {
  type LeastSquaresSolution,
  type RefinementPolicy,
  type SolveAccuracy,
  type SolveOptions,
  defaultRankTolerance,
  refinementTrigger,
  solveLeastSquares,
} from "./solve-least-squares";
export { type FitOptions, type LeastSquaresFit, defaultConfidenceLevel, fitLeastSquares } from "./fit-least-squares";
export { fitModel } from "./fit-model";
export type { CoefficientSummary } from "./coefficient-inference";
export type { Collinearity } from "./collinearity";
export { type CovarianceChoice, type CovarianceType, defaultNeweyWestLag } from "./covariance-choice";
export type { GoodnessOfFit } from "./goodness-of-fit";
export { type HeteroskedasticityTest, type NormalityTest, type ResidualTests, chiSquareUpperTail, jarqueBera } from "./residual-tests";

// Prediction
export {
  type DifferencePrediction,
  type Interval,
  type Plan,
  type PointPrediction,
  type PredictionOptions,
  type PredictionSource,
  type TotalPrediction,
  predict,
  predictDifference,
  predictFromRecord,
  predictTotal,
} from "./predict";
export type { ExtrapolationReport, RangeExcursion } from "./extrapolation";

// Fit records
export {
  type FitRecord,
  createFitRecord,
  fitRecordVersion,
  parseFitRecord,
  verifyFitRecord,
} from "./fit-record";
export { canonicalJson } from "./canonical-json";
export { sha256Hex } from "./sha256";

// Distributions
export {
  fDistributionUpperTail,
  studentTCriticalValue,
  studentTQuantile,
  studentTTwoSidedPValue,
  studentTUpperTail,
} from "./student-t";

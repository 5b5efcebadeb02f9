/**
 * The fit record: everything needed to predict from a fit without its data, as plain JSON with a
 * version and a SHA-256 checksum. It is what gets stored when a fit is approved and what the web
 * server (and the browser, for instant previews) predicts from on every slider move.
 *
 * It keeps R⁻¹ rather than (XᵀX)⁻¹: the leverage of a new point is then h₀ = ‖R⁻ᵀx₀‖², a
 * triangular product that cannot come out negative, and (XᵀX)⁻¹ = R⁻¹R⁻ᵀ is available if needed.
 * The covariance actually used for intervals is stored beside it (it differs from s²R⁻¹R⁻ᵀ for
 * HC3 and Newey–West).
 */

import { canonicalJson } from "./canonical-json";
import type { CovarianceType } from "./covariance-choice";
import type { LeastSquaresFit } from "./fit-least-squares";
import { type ModelSpecification, designTermNames, parseModelSpecification, predictorColumns } from "./model-specification";
import type { ObservedRange } from "./observed-range";
import type { PredictionModel } from "./prediction-model";
import { sha256Hex } from "./sha256";

/** Current fit record format. */
export const fitRecordVersion = 1;

export interface FitRecord {
  version: 1;
  specification: ModelSpecification;
  /** All design column names in order, the intercept first when present. */
  termNames: string[];
  aliasedTerms: string[];
  /** Names of the terms with coefficients, in the order of `coefficients`, `inverseUpper`, `covariance`. */
  estimableTerms: string[];
  coefficients: number[];
  /** Rows of the upper triangle of R⁻¹ (original units): row i holds columns i … rank − 1. */
  inverseUpper: number[][];
  /** Covariance of the coefficients used for intervals, rank × rank. */
  covariance: number[][];
  covarianceType: CovarianceType;
  neweyWestLag: number | null;
  residualStandardError: number;
  residualDegreesOfFreedom: number;
  observationCount: number;
  /** Default confidence level for predictions. */
  confidenceLevel: number;
  /** Training range of each raw predictor column. */
  columnRanges: Record<string, ObservedRange>;
  /** Training range of each design column (by term name). */
  termRanges: Record<string, ObservedRange>;
  /** Largest training leverage: a new point above it lies outside the regressor hull. */
  maxTrainingLeverage: number;
  /** Headline statistics, for display next to a stored fit. */
  summary: {
    rSquared: number;
    adjustedRSquared: number;
    rSquaredCentred: boolean;
    conditionNumber: number;
    /** Null when undefined (an exact fit has no residual variation). */
    durbinWatson: number | null;
  };
  /** "sha256:" + hex digest of the canonical JSON of every other field. */
  checksum: string;
}

type UnsignedFitRecord = Omit<FitRecord, "checksum">;

function checksumOf(record: UnsignedFitRecord): string {
  return `sha256:${sha256Hex(canonicalJson(record))}`;
}

function finiteOrThrow(value: number, what: string): number {
  if (!Number.isFinite(value)) throw new Error(`createFitRecord requires a finite ${what} (got ${value})`);
  return value;
}

/**
 * Captures a fit as a record.
 *
 * @throws if a stored quantity is not finite (for example an HC3 covariance with a leverage of 1)
 * Cost: O(p²) plus hashing a few kilobytes.
 */
export function createFitRecord(fit: LeastSquaresFit): FitRecord {
  const model = fit.predictionModel;
  const rank = model.estimableColumns.length;
  const rangeCopy = (ranges: Readonly<Record<string, ObservedRange>>) =>
    Object.fromEntries(Object.entries(ranges).map(([name, range]) => [name, { minimum: range.minimum, maximum: range.maximum }]));
  const unsigned: UnsignedFitRecord = {
    version: fitRecordVersion,
    specification: JSON.parse(JSON.stringify(model.specification)) as ModelSpecification,
    termNames: [...model.termNames],
    aliasedTerms: [...model.aliasedTerms],
    estimableTerms: model.estimableColumns.map((column) => model.termNames[column]),
    coefficients: Array.from(model.coefficients, (value) => finiteOrThrow(value, "coefficient")),
    inverseUpper: Array.from({ length: rank }, (_, row) =>
      Array.from(model.inverseUpper.subarray(row * rank + row, (row + 1) * rank), (value) => finiteOrThrow(value, "R inverse entry")),
    ),
    covariance: Array.from({ length: rank }, (_, row) =>
      Array.from(model.covariance.subarray(row * rank, (row + 1) * rank), (value) => finiteOrThrow(value, "covariance entry")),
    ),
    covarianceType: model.covarianceType,
    neweyWestLag: model.neweyWestLag,
    residualStandardError: finiteOrThrow(model.residualStandardError, "residual standard error"),
    residualDegreesOfFreedom: model.residualDegreesOfFreedom,
    observationCount: fit.observationCount,
    confidenceLevel: model.confidenceLevel,
    columnRanges: rangeCopy(model.columnRanges),
    termRanges: rangeCopy(model.termRanges),
    maxTrainingLeverage: finiteOrThrow(model.maxTrainingLeverage, "maximum leverage"),
    summary: {
      rSquared: finiteOrThrow(fit.rSquared, "R squared"),
      adjustedRSquared: finiteOrThrow(fit.adjustedRSquared, "adjusted R squared"),
      rSquaredCentred: fit.rSquaredCentred,
      conditionNumber: finiteOrThrow(fit.conditionNumber, "condition number"),
      durbinWatson: Number.isFinite(fit.durbinWatson) ? fit.durbinWatson : null,
    },
  };
  return { ...unsigned, checksum: checksumOf(unsigned) };
}

/**
 * Whether the record's checksum matches its content (a changed digit anywhere fails).
 * Cost: canonical serialisation and SHA-256 of the record (tens of microseconds).
 */
export function verifyFitRecord(record: FitRecord): boolean {
  const { checksum, ...unsigned } = record;
  try {
    return checksum === checksumOf(unsigned);
  } catch {
    return false;
  }
}

function isFiniteNumberArray(value: unknown, length: number): value is number[] {
  return Array.isArray(value) && value.length === length && value.every((item) => typeof item === "number" && Number.isFinite(item));
}

function isRangeRecord(value: unknown): value is Record<string, ObservedRange> {
  return (
    typeof value === "object" &&
    value !== null &&
    Object.values(value).every(
      (range) =>
        typeof range === "object" &&
        range !== null &&
        typeof (range as ObservedRange).minimum === "number" &&
        typeof (range as ObservedRange).maximum === "number",
    )
  );
}

/**
 * Checks untrusted JSON (from storage or a request) and returns it as a fit record.
 *
 * @throws naming the first problem: wrong version, malformed field, inconsistent sizes, or a
 *   checksum that does not match (the record was altered or damaged)
 */
export function parseFitRecord(value: unknown): FitRecord {
  const fail = (reason: string): never => {
    throw new Error(`parseFitRecord requires ${reason}`);
  };
  if (typeof value !== "object" || value === null) fail("an object");
  const record = value as FitRecord;
  if (record.version !== fitRecordVersion) fail(`version ${fitRecordVersion} (got ${String(record.version)})`);
  const specification = parseModelSpecification(record.specification);
  const termNames = designTermNames(specification);
  if (!Array.isArray(record.termNames) || record.termNames.join("\u0000") !== termNames.join("\u0000")) {
    fail("termNames to match the specification");
  }
  if (!Array.isArray(record.estimableTerms) || !record.estimableTerms.every((term) => termNames.includes(term))) {
    fail("estimableTerms to be term names");
  }
  const rank = record.estimableTerms.length;
  if (!Array.isArray(record.aliasedTerms) || record.aliasedTerms.length + rank !== termNames.length) {
    fail("aliasedTerms and estimableTerms to cover the terms");
  }
  if (!isFiniteNumberArray(record.coefficients, rank)) fail(`${rank} finite coefficients`);
  if (!Array.isArray(record.inverseUpper) || !record.inverseUpper.every((row, index) => isFiniteNumberArray(row, rank - index))) {
    fail("inverseUpper rows of lengths rank, rank − 1, …, 1");
  }
  if (!Array.isArray(record.covariance) || record.covariance.length !== rank || !record.covariance.every((row) => isFiniteNumberArray(row, rank))) {
    fail(`a ${rank} × ${rank} covariance`);
  }
  if (!["classical", "hc3", "newey-west"].includes(record.covarianceType)) fail("a known covarianceType");
  for (const field of ["residualStandardError", "residualDegreesOfFreedom", "observationCount", "confidenceLevel", "maxTrainingLeverage"] as const) {
    if (typeof record[field] !== "number" || !Number.isFinite(record[field])) fail(`a finite ${field}`);
  }
  if (!isRangeRecord(record.columnRanges) || !isRangeRecord(record.termRanges)) fail("columnRanges and termRanges");
  if (typeof record.checksum !== "string") fail("a checksum");
  if (!verifyFitRecord(record)) fail("a checksum that matches the content (the record was altered)");
  return record;
}

/** Prepared prediction models of records, so repeated predictions skip the conversion. */
const preparedModels = new WeakMap<FitRecord, PredictionModel>();

/**
 * The prediction model of a record (cached per record object). Does not verify the checksum:
 * call `parseFitRecord` or `verifyFitRecord` once when the record is loaded.
 */
export function predictionModelFromRecord(record: FitRecord): PredictionModel {
  const cached = preparedModels.get(record);
  if (cached !== undefined) return cached;
  const rank = record.estimableTerms.length;
  const inverseUpper = new Float64Array(rank * rank);
  record.inverseUpper.forEach((row, rowIndex) => inverseUpper.set(row, rowIndex * rank + rowIndex));
  const covariance = new Float64Array(rank * rank);
  record.covariance.forEach((row, rowIndex) => covariance.set(row, rowIndex * rank));
  const model: PredictionModel = {
    specification: record.specification,
    termNames: record.termNames,
    columnNames: predictorColumns(record.specification),
    estimableColumns: record.estimableTerms.map((term) => record.termNames.indexOf(term)),
    aliasedTerms: record.aliasedTerms,
    coefficients: Float64Array.from(record.coefficients),
    inverseUpper,
    covariance,
    covarianceType: record.covarianceType,
    neweyWestLag: record.neweyWestLag,
    residualStandardError: record.residualStandardError,
    residualDegreesOfFreedom: record.residualDegreesOfFreedom,
    confidenceLevel: record.confidenceLevel,
    columnRanges: record.columnRanges,
    termRanges: record.termRanges,
    maxTrainingLeverage: record.maxTrainingLeverage,
    criticalValues: new Map(),
  };
  preparedModels.set(record, model);
  return model;
}

/**
 * Design matrix construction: named data columns in, a column-major Float64Array out.
 */

import {
  type ModelSpecification,
  designTermNames,
  parseModelSpecification,
  predictorColumns,
} from "./model-specification";
import { type ObservedRange, observedRange } from "./observed-range";
import { evaluateTermColumn, termHasLowOrderPart } from "./term-values";

/** Data columns by name; every column has one value per observation (row). */
export type NamedColumns = Readonly<Record<string, Float64Array | readonly number[]>>;

/**
 * A design matrix X with its outcome y, ready for `fitLeastSquares`.
 *
 * `values` is column-major: column j occupies `values[j × rowCount … (j + 1) × rowCount)`, so each
 * term's values are contiguous (the layout the QR kernel streams through).
 */
export interface Design {
  specification: ModelSpecification;
  /** Column names of X: "(Intercept)" first if present, then the term names. */
  termNames: string[];
  rowCount: number;
  columnCount: number;
  values: Float64Array;
  /**
   * Per column, the low-order part of values a double cannot hold exactly (powers, interactions),
   * or null when the column is exact. Used only by iterative refinement.
   */
  lowOrderParts: (Float64Array | null)[];
  outcome: Float64Array;
  hasIntercept: boolean;
  /** Range of each raw predictor column the specification reads. */
  columnRanges: Record<string, ObservedRange>;
  /** Range of each design column (by term name), the intercept included. */
  termRanges: Record<string, ObservedRange>;
}

/**
 * Builds the design matrix of a model specification from named data columns.
 *
 * @example
 * buildDesign({ outcome: "sales", intercept: true, terms: [{ kind: "log1p", column: "tv" }] },
 *   { sales: [10, 12, 15], tv: [0, 1, 3] }).termNames // => ["(Intercept)", "log1p(tv)"]
 * @throws if the specification is malformed, a column is missing, columns differ in length,
 *   a value is not finite, or a log1p term meets a value ≤ −1.
 * Cost: O(n × p) time; memory n × p doubles for X (plus n per power or interaction term).
 */
export function buildDesign(specification: ModelSpecification, columns: NamedColumns): Design {
  const checkedSpecification = parseModelSpecification(specification);
  const outcome = toFiniteFloat64(checkedSpecification.outcome, columns);
  const rowCount = outcome.length;
  const predictors = new Map<string, Float64Array>();
  const columnRanges: Record<string, ObservedRange> = {};
  for (const name of predictorColumns(checkedSpecification)) {
    const values = toFiniteFloat64(name, columns);
    if (values.length !== rowCount) {
      throw new Error(
        `buildDesign requires columns of equal length ('${name}' has ${values.length} rows, '${checkedSpecification.outcome}' has ${rowCount})`,
      );
    }
    predictors.set(name, values);
    columnRanges[name] = observedRange(values);
  }
  const lookup = (name: string) => predictors.get(name) as Float64Array;
  const termNames = designTermNames(checkedSpecification);
  const columnCount = termNames.length;
  const values = new Float64Array(rowCount * columnCount);
  const lowOrderParts: (Float64Array | null)[] = [];
  let column = 0;
  if (checkedSpecification.intercept) {
    values.fill(1, 0, rowCount);
    lowOrderParts.push(null);
    column = 1;
  }
  for (const term of checkedSpecification.terms) {
    const high = values.subarray(column * rowCount, (column + 1) * rowCount);
    const low = termHasLowOrderPart(term) ? new Float64Array(rowCount) : null;
    evaluateTermColumn(term, lookup, high, low, "buildDesign");
    lowOrderParts.push(low);
    column += 1;
  }
  const termRanges: Record<string, ObservedRange> = {};
  termNames.forEach((name, index) => {
    termRanges[name] = observedRange(values, index * rowCount, (index + 1) * rowCount);
  });
  return {
    specification: checkedSpecification,
    termNames,
    rowCount,
    columnCount,
    values,
    lowOrderParts,
    outcome,
    hasIntercept: checkedSpecification.intercept,
    columnRanges,
    termRanges,
  };
}

/** The named column as a Float64Array (shared, not copied, when it already is one), all finite. */
function toFiniteFloat64(name: string, columns: NamedColumns): Float64Array {
  const source = Object.hasOwn(columns, name) ? columns[name] : undefined;
  if (source === undefined) throw new Error(`buildDesign requires a column named '${name}'`);
  const values = source instanceof Float64Array ? source : Float64Array.from(source);
  for (let row = 0; row < values.length; row++) {
    if (!Number.isFinite(values[row])) {
      throw new Error(`buildDesign requires finite values (column '${name}' row ${row} is ${values[row]})`);
    }
  }
  return values;
}

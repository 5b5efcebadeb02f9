/**
 * A scenario point — one value per raw column, by name — turned into a row of the design matrix
 * with the same term arithmetic that built the training design.
 */

import { type ModelSpecification, predictorColumns } from "./model-specification";
import { evaluateTermAtPoint } from "./term-values";

/** Raw column values of one period of a plan, by column name (extra names are ignored). */
export type NamedPoint = Readonly<Record<string, number>>;

/**
 * The design row x₀ for a point: 1 for the intercept (if any), then each term's value.
 *
 * @example
 * evaluateScenarioPoint({ outcome: "sales", intercept: true,
 *   terms: [{ kind: "log1p", column: "tv" }] }, { tv: Math.E - 1 }) // => Float64Array [1, 1]
 * @throws if a column the specification reads is missing or not finite, or log1p meets x ≤ −1
 * Cost: O(p).
 */
export function evaluateScenarioPoint(
  specification: ModelSpecification,
  point: NamedPoint,
  caller = "evaluateScenarioPoint",
): Float64Array {
  const value = (column: string) => {
    const entry = Object.hasOwn(point, column) ? point[column] : undefined;
    if (typeof entry !== "number") throw new Error(`${caller} requires a value for column '${column}'`);
    if (!Number.isFinite(entry)) throw new Error(`${caller} requires a finite value for column '${column}' (got ${entry})`);
    return entry;
  };
  const { terms } = specification;
  const offset = specification.intercept ? 1 : 0;
  const row = new Float64Array(terms.length + offset);
  if (offset === 1) row[0] = 1;
  for (let index = 0; index < terms.length; index++) row[index + offset] = evaluateTermAtPoint(terms[index], value, caller);
  return row;
}

/** The raw columns a point must provide. */
export function scenarioColumns(specification: ModelSpecification): string[] {
  return predictorColumns(specification);
}

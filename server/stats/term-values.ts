/**
 * Values of one term, for a whole column (design matrix) or a single point (scenario). Both paths
 * share the arithmetic below, so a scenario equal to a training row gives exactly that row.
 *
 * Powers and interactions are computed in double-double: the rounded double goes into the design
 * matrix and the rounding error into a separate low-order column. The QR factorisation uses only
 * the doubles; iterative refinement uses both, which is what lets an ill-conditioned polynomial
 * (NIST's Filip, degree 10) be solved to the digits its data define. Rounding x¹⁰ to a double
 * alone perturbs Filip's coefficients in the eighth digit.
 */

import { veltkampSplitFactor } from "./double-double";
import type { TermSpecification } from "./model-specification";

/** Returns a raw column's values by name, or throws naming the missing column. */
export type ColumnLookup = (column: string) => Float64Array;

/** Whether a term's values need a low-order part (powers and interactions do). */
export function termHasLowOrderPart(term: TermSpecification): boolean {
  return term.kind === "power" || term.kind === "interaction";
}

/**
 * Writes the term's value for every row into `high`, and the part a double cannot hold into `low`
 * for terms that have one (see `termHasLowOrderPart`; pass null for the others).
 *
 * @throws if a log1p term meets a value ≤ −1 (log(1 + x) is undefined there)
 * Cost: O(n) for linear and log1p terms, O(n × exponent) for powers.
 */
export function evaluateTermColumn(
  term: TermSpecification,
  lookup: ColumnLookup,
  high: Float64Array,
  low: Float64Array | null,
  caller: string,
): void {
  switch (term.kind) {
    case "linear":
    case "control":
      high.set(lookup(term.column));
      return;
    case "log1p": {
      const values = lookup(term.column);
      for (let row = 0; row < values.length; row++) {
        const value = values[row];
        if (!(value > -1)) {
          throw new Error(`${caller} requires column '${term.column}' > -1 for log1p (row ${row} is ${value})`);
        }
        high[row] = Math.log1p(value);
      }
      return;
    }
    case "power": {
      const values = lookup(term.column);
      const lowPart = low ?? new Float64Array(values.length);
      for (let row = 0; row < values.length; row++) {
        powerDoubleDouble(values[row], term.exponent, high, lowPart, row);
      }
      return;
    }
    case "interaction": {
      const first = lookup(term.columns[0]);
      const second = lookup(term.columns[1]);
      const lowPart = low ?? new Float64Array(first.length);
      for (let row = 0; row < first.length; row++) {
        productDoubleDouble(first[row], second[row], high, lowPart, row);
      }
      return;
    }
  }
}

/**
 * The term's value at one point (a double; the low-order part is not needed to predict).
 *
 * @throws if a log1p term meets a value ≤ −1
 */
export function evaluateTermAtPoint(term: TermSpecification, value: (column: string) => number, caller: string): number {
  switch (term.kind) {
    case "linear":
    case "control":
      return value(term.column);
    case "log1p": {
      const x = value(term.column);
      if (!(x > -1)) throw new Error(`${caller} requires column '${term.column}' > -1 for log1p (got ${x})`);
      return Math.log1p(x);
    }
    case "power":
      powerDoubleDouble(value(term.column), term.exponent, scratchHigh, scratchLow, 0);
      return scratchHigh[0];
    case "interaction":
      return value(term.columns[0]) * value(term.columns[1]);
  }
}

const scratchHigh = new Float64Array(1);
const scratchLow = new Float64Array(1);

/** x × y as high + low exactly (Dekker's error-free product), written at `index`. */
function productDoubleDouble(x: number, y: number, high: Float64Array, low: Float64Array, index: number): void {
  const product = x * y;
  const xScaled = veltkampSplitFactor * x;
  const xHigh = xScaled - (xScaled - x);
  const xLow = x - xHigh;
  const yScaled = veltkampSplitFactor * y;
  const yHigh = yScaled - (yScaled - y);
  const yLow = y - yHigh;
  high[index] = product;
  low[index] = xHigh * yHigh - product + xHigh * yLow + xLow * yHigh + xLow * yLow;
}

/**
 * x^exponent in double-double by repeated multiplication: each step multiplies (high + low) by x
 * with an error-free product of the high part, so the result has relative error about
 * exponent × 2^-104 — far below what a double can show.
 */
function powerDoubleDouble(x: number, exponent: number, high: Float64Array, low: Float64Array, index: number): void {
  const xScaled = veltkampSplitFactor * x;
  const xHigh = xScaled - (xScaled - x);
  const xLow = x - xHigh;
  let currentHigh = x;
  let currentLow = 0;
  for (let step = 1; step < exponent; step++) {
    const product = currentHigh * x;
    const currentScaled = veltkampSplitFactor * currentHigh;
    const currentHighHigh = currentScaled - (currentScaled - currentHigh);
    const currentHighLow = currentHigh - currentHighHigh;
    const productError =
      currentHighHigh * xHigh - product + currentHighHigh * xLow + currentHighLow * xHigh + currentHighLow * xLow;
    const lowSum = productError + currentLow * x;
    currentHigh = product + lowSum;
    currentLow = lowSum - (currentHigh - product);
  }
  high[index] = currentHigh;
  low[index] = currentLow;
}

/**
 * Extrapolation checks for a scenario point. A regression is only supported by its data inside
 * the region the training points cover; outside it, intervals understate the real uncertainty.
 *
 * Two checks (Montgomery, Peck & Vining, Introduction to Linear Regression Analysis, 5th ed.,
 * §3.8 "Hidden extrapolation in multiple regression"):
 * - each raw column and each term against its observed [minimum, maximum];
 * - the point's leverage h₀ = x₀ᵀ(XᵀX)⁻¹x₀ against the largest training leverage h_max. The
 *   ellipsoid {x : xᵀ(XᵀX)⁻¹x ≤ h_max} is the smallest such ellipsoid containing every training
 *   point; a point outside it is extrapolation even when each column on its own is in range
 *   (spend combinations never seen together) — "hidden" extrapolation.
 */

import type { ObservedRange } from "./observed-range";

/** A value outside its training range, and by how much. */
export interface RangeExcursion {
  /** Column or term name. */
  name: string;
  value: number;
  minimum: number;
  maximum: number;
  /** Distance beyond the nearest bound (positive), in the value's own units. */
  distance: number;
  /** Distance as a fraction of the observed range width (Infinity when the range is a point). */
  relativeDistance: number;
}

export interface ExtrapolationReport {
  /** Raw columns outside their observed range. */
  columns: RangeExcursion[];
  /** Terms (design columns) outside their observed range. */
  terms: RangeExcursion[];
  /** h₀ of the point. */
  leverage: number;
  maxTrainingLeverage: number;
  /** h₀ > h_max: outside the regressor hull's ellipsoid. */
  hiddenExtrapolation: boolean;
  /** Any of the above. */
  extrapolating: boolean;
}

/** The excursion of `value` outside `range`, or null inside it. */
export function rangeExcursion(name: string, value: number, range: ObservedRange): RangeExcursion | null {
  const below = range.minimum - value;
  const above = value - range.maximum;
  if (below <= 0 && above <= 0) return null;
  const distance = Math.max(below, above);
  const width = range.maximum - range.minimum;
  return {
    name,
    value,
    minimum: range.minimum,
    maximum: range.maximum,
    distance,
    relativeDistance: width > 0 ? distance / width : Infinity,
  };
}

/** Values outside their ranges, for parallel arrays of names and values. */
function excursions(
  names: readonly string[],
  valueOf: (index: number) => number,
  ranges: Readonly<Record<string, ObservedRange>>,
): RangeExcursion[] {
  const found: RangeExcursion[] = [];
  for (let index = 0; index < names.length; index++) {
    const range = ranges[names[index]];
    const excursion = range === undefined ? null : rangeExcursion(names[index], valueOf(index), range);
    if (excursion !== null) found.push(excursion);
  }
  return found;
}

/**
 * Builds the report for one point. Cost: O(p).
 *
 * @param point raw column values; `columnNames` are the columns the specification reads
 * @param termValues design row x₀, in the order of `termNames`
 */
export function extrapolationReport(
  columnNames: readonly string[],
  point: Readonly<Record<string, number>>,
  termNames: readonly string[],
  termValues: Float64Array,
  columnRanges: Readonly<Record<string, ObservedRange>>,
  termRanges: Readonly<Record<string, ObservedRange>>,
  leverage: number,
  maxTrainingLeverage: number,
): ExtrapolationReport {
  const columns = excursions(columnNames, (index) => point[columnNames[index]], columnRanges);
  const terms = excursions(termNames, (index) => termValues[index], termRanges);
  // A relative margin keeps a training point itself (h₀ = h_max up to rounding) from being flagged.
  const hiddenExtrapolation = leverage > maxTrainingLeverage * (1 + 1e-9);
  return {
    columns,
    terms,
    leverage,
    maxTrainingLeverage,
    hiddenExtrapolation,
    extrapolating: hiddenExtrapolation || columns.length > 0 || terms.length > 0,
  };
}

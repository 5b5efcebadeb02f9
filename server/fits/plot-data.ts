import "server-only";
import jstatModule from "jstat";
import type { DiagnosticPoints } from "./types";

const { jStat } = jstatModule;

/** Plots stay readable and the report small: beyond these counts plot data is a sample (statistics never are). */
export const maxScatterPoints = 2_000;
export const maxQqPoints = 1_000;
export const maxSeriesPoints = 1_000;

const finiteOrNull = (value: number) => (Number.isFinite(value) ? value : null);

/** Indices of the `count` largest values (ties may add a few); NaN never counts as large. */
function largestIndices(values: Float64Array, count: number): number[] {
  if (count <= 0) return [];
  const finite = values.filter((value) => Number.isFinite(value));
  if (finite.length === 0) return [];
  const sorted = finite.sort();
  const threshold = sorted[Math.max(0, sorted.length - count)];
  const result: number[] = [];
  for (let row = 0; row < values.length && result.length < count * 2; row++) if (values[row] >= threshold) result.push(row);
  return result;
}

/**
 * Rows to draw in the scatter plots: every row when there are few; otherwise the most extreme rows
 * (largest |standardized residual|, leverage and Cook's distance — the ones a reader must see) plus
 * an even stride through the rest.
 */
export function scatterRows(diagnostics: { standardized: Float64Array; leverages: Float64Array; cooks: Float64Array }): number[] {
  const n = diagnostics.leverages.length;
  if (n <= maxScatterPoints) return Array.from({ length: n }, (_, row) => row);
  const extremes = maxScatterPoints / 10;
  const chosen = new Set<number>([
    ...largestIndices(diagnostics.standardized.map(Math.abs), extremes),
    ...largestIndices(diagnostics.leverages, extremes),
    ...largestIndices(diagnostics.cooks, extremes),
  ]);
  const stride = n / (maxScatterPoints - chosen.size);
  for (let position = 0; position < n && chosen.size < maxScatterPoints; position += stride) chosen.add(Math.floor(position));
  return [...chosen].sort((a, b) => a - b);
}

export function pointsAt(
  rows: number[],
  data: { fitted: Float64Array; residuals: Float64Array; standardized: Float64Array; leverages: Float64Array; cooks: Float64Array },
  rowNumbers: ArrayLike<number> | null,
): DiagnosticPoints {
  return {
    row: rows.map((row) => (rowNumbers ? rowNumbers[row] : row + 1)),
    fitted: rows.map((row) => data.fitted[row]),
    residual: rows.map((row) => data.residuals[row]),
    standardized: rows.map((row) => finiteOrNull(data.standardized[row])),
    leverage: rows.map((row) => data.leverages[row]),
    cooks: rows.map((row) => finiteOrNull(data.cooks[row])),
  };
}

/** R's `ppoints`: plotting positions (i − a) / (m + 1 − 2a), a = 3/8 for m ≤ 10, else 1/2. */
function plottingPosition(rank: number, count: number): number {
  const a = count <= 10 ? 3 / 8 : 1 / 2;
  return (rank + 1 - a) / (count + 1 - 2 * a);
}

/**
 * Normal Q–Q data of the standardized residuals (as R's `qqnorm`): sorted sample quantiles against
 * standard normal quantiles at the plotting positions. With many rows, both tails are kept whole
 * and the middle is taken at evenly spaced ranks.
 */
export function normalQq(standardized: Float64Array): { theoretical: number[]; sample: number[] } {
  const sorted = standardized.filter((value) => Number.isFinite(value)).sort();
  const count = sorted.length;
  let ranks: number[];
  if (count <= maxQqPoints) ranks = Array.from({ length: count }, (_, rank) => rank);
  else {
    const tail = 50;
    const middle = maxQqPoints - 2 * tail;
    const set = new Set<number>();
    for (let rank = 0; rank < tail; rank++) {
      set.add(rank);
      set.add(count - 1 - rank);
    }
    for (let step = 0; step < middle; step++) set.add(tail + Math.round((step * (count - 1 - 2 * tail)) / (middle - 1)));
    ranks = [...set].sort((a, b) => a - b);
  }
  return {
    theoretical: ranks.map((rank) => jStat.normal.inv(plottingPosition(rank, count), 0, 1)),
    sample: ranks.map((rank) => sorted[rank]),
  };
}

/**
 * Outcome and fitted values in row order for the time plot; beyond `maxSeriesPoints` rows, the mean
 * of each run of consecutive rows (labelled by its first row), so the shape stays and the size is bounded.
 */
export function timeSeries(
  outcome: Float64Array,
  fitted: Float64Array,
  labels: readonly string[] | null,
  rowNumbers: ArrayLike<number> | null,
): { label: string[]; outcome: number[]; fitted: number[]; rowsPerPoint: number } {
  const n = outcome.length;
  const rowsPerPoint = Math.max(1, Math.ceil(n / maxSeriesPoints));
  const result = { label: [] as string[], outcome: [] as number[], fitted: [] as number[], rowsPerPoint };
  for (let start = 0; start < n; start += rowsPerPoint) {
    const end = Math.min(n, start + rowsPerPoint);
    let outcomeSum = 0;
    let fittedSum = 0;
    for (let row = start; row < end; row++) {
      outcomeSum += outcome[row];
      fittedSum += fitted[row];
    }
    result.label.push(labels ? labels[start] : `Row ${rowNumbers ? rowNumbers[start] : start + 1}`);
    result.outcome.push(outcomeSum / (end - start));
    result.fitted.push(fittedSum / (end - start));
  }
  return result;
}

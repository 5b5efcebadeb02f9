// The held-out check against an independent computation: ordinary least squares on the earlier rows
// by explicit inversion with ml-matrix, prediction intervals ŷ ± t·s·√(1 + x₀ᵀ(XᵀX)⁻¹x₀) with jStat's
// t quantile (Montgomery, Peck & Vining, §3.5), and the binomial tail against jStat's binomial.
import jstatModule from "jstat";
import { Matrix, inverse } from "ml-matrix";
import { describe, expect, it } from "vitest";
import type { FitComputeInput } from "@/server/fits/compute";
import { binomialLowerTail, HOLDOUT_MAX_ROWS, holdoutCheck } from "@/server/fits/holdout";
import { buildDesign, fitLeastSquares, type ModelSpecification } from "@/server/stats";
import { createRandom } from "../stats/support/random";

const { jStat } = jstatModule;

const specification: ModelSpecification = {
  outcome: "sales",
  intercept: true,
  terms: [
    { kind: "linear", column: "search" },
    { kind: "log1p", column: "video" },
    { kind: "control", column: "promo" },
  ],
};

/** Weekly-like rows; `shiftLatest` adds a level change to the latest 13 rows (a market the history never saw). */
function weeks(rowCount: number, seed: number, options: { shiftLatest?: number; promoOnlyLatest?: boolean } = {}) {
  const random = createRandom(seed);
  const search = Array.from({ length: rowCount }, () => 5_000 + 20_000 * random.uniform());
  const video = Array.from({ length: rowCount }, () => 30_000 * random.uniform());
  const promo = Array.from({ length: rowCount }, (_, row) => (options.promoOnlyLatest ? (row >= rowCount - 13 ? 1 : 0) : random.uniform() < 0.2 ? 1 : 0));
  const sales = search.map((value, row) => 50_000 + 3 * value + 4_000 * Math.log1p(video[row]) + 9_000 * promo[row] + 6_000 * random.normal() + (row >= rowCount - 13 ? options.shiftLatest ?? 0 : 0));
  const labels = Array.from({ length: rowCount }, (_, row) => new Date(Date.UTC(2023, 0, 2 + 7 * row)).toISOString().slice(0, 10));
  return { columns: { sales, search, video, promo }, labels };
}

function input(data: ReturnType<typeof weeks>, overrides: Partial<FitComputeInput> = {}): FitComputeInput {
  return {
    specification,
    columns: data.columns,
    level: 0.95,
    covariance: { type: "classical" },
    periodColumn: "week_start",
    periodLabels: data.labels,
    units: { sales: "EUR" },
    ...overrides,
  };
}

const fitOf = (computeInput: FitComputeInput) => fitLeastSquares(buildDesign(computeInput.specification, computeInput.columns), { confidenceLevel: computeInput.level });

describe("holdoutCheck", () => {
  it("refits without the latest 13 rows and predicts them as an explicit computation does", () => {
    const data = weeks(156, 7);
    const computeInput = input(data);
    const check = holdoutCheck(computeInput, fitOf(computeInput));
    if (check.status !== "done") throw new Error(check.reason);
    expect(check.periods).toBe(13);
    expect(check.trainedOn).toBe(143);
    expect(check.rows.map((row) => row.label)).toEqual(data.labels.slice(143));

    const designRow = (row: number) => [1, data.columns.search[row], Math.log1p(data.columns.video[row]), data.columns.promo[row]];
    const x = new Matrix(Array.from({ length: 143 }, (_, row) => designRow(row)));
    const y = Matrix.columnVector(data.columns.sales.slice(0, 143));
    const inverseGram = inverse(x.transpose().mmul(x));
    const beta = inverseGram.mmul(x.transpose()).mmul(y);
    const residuals = y.clone().sub(x.mmul(beta)).to1DArray();
    const s2 = residuals.reduce((sum, value) => sum + value * value, 0) / (143 - 4);
    const t = jStat.studentt.inv(0.975, 143 - 4);
    let absolute = 0;
    check.rows.forEach((row, index) => {
      const x0 = Matrix.rowVector(designRow(143 + index));
      const mean = x0.mmul(beta).get(0, 0);
      const halfWidth = t * Math.sqrt(s2 * (1 + x0.mmul(inverseGram).mmul(x0.transpose()).get(0, 0)));
      expect(Math.abs(row.predicted - mean) / Math.abs(mean)).toBeLessThan(1e-9);
      // jStat's t quantile carries about 7 digits (server/stats/student-t.ts).
      expect(Math.abs(row.upper - (mean + halfWidth)) / halfWidth).toBeLessThan(1e-6);
      expect(Math.abs(row.lower - (mean - halfWidth)) / halfWidth).toBeLessThan(1e-6);
      expect(row.actual).toBe(data.columns.sales[143 + index]);
      expect(row.inside).toBe(row.actual >= row.lower && row.actual <= row.upper);
      absolute += Math.abs(row.actual - row.predicted);
    });
    expect(check.inside).toBe(check.rows.filter((row) => row.inside).length);
    expect(check.meanAbsoluteError).toBeCloseTo(absolute / 13, 6);
    expect(check.fewerInsideThanExpected).toBe(false);
  });

  it("flags latest rows that the intervals miss far more often than their level allows", () => {
    const data = weeks(156, 8, { shiftLatest: 40_000 });
    const computeInput = input(data);
    const check = holdoutCheck(computeInput, fitOf(computeInput));
    if (check.status !== "done") throw new Error(check.reason);
    expect(check.inside).toBeLessThan(6);
    expect(check.rows.filter((row) => !row.inside).every((row) => row.actual > row.upper)).toBe(true);
    expect(check.fewerInsideThanExpected).toBe(true);
  });

  it("is skipped, with the reason, when there is no order, too few rows, too many, or the refit cannot tell the terms apart", () => {
    const data = weeks(156, 9);
    const noOrder = input(data, { periodColumn: null, periodLabels: null });
    expect(holdoutCheck(noOrder, fitOf(noOrder))).toMatchObject({ status: "skipped", reason: expect.stringMatching(/no period column/) });

    const few = input(weeks(8, 10));
    expect(holdoutCheck(few, fitOf(few))).toMatchObject({ status: "skipped", reason: expect.stringMatching(/Too few rows \(8\)/) });

    const promoLate = input(weeks(156, 11, { promoOnlyLatest: true }));
    expect(holdoutCheck(promoLate, fitOf(promoLate))).toMatchObject({ status: "skipped", reason: expect.stringMatching(/without the latest 13 rows/i) });

    // An outcome that only starts to move in the latest rows: the engine refuses the refit, in users' words.
    const flat = weeks(156, 13);
    flat.columns.sales = flat.columns.sales.map((value, row) => (row < 143 ? 100_000 : value));
    const flatInput = input(flat);
    expect(holdoutCheck(flatInput, fitOf(flatInput))).toMatchObject({ status: "skipped", reason: expect.stringMatching(/^Without the latest 13 rows the refit is refused\. The fit requires an outcome that varies/) });

    const huge = weeks(HOLDOUT_MAX_ROWS + 1, 12);
    const hugeInput = input(huge);
    expect(holdoutCheck(hugeInput, fitOf(hugeInput))).toMatchObject({ status: "skipped", reason: expect.stringMatching(/100,000 rows/) });
  });
});

describe("binomialLowerTail", () => {
  it("matches jStat's binomial distribution", () => {
    for (const [k, n, p] of [
      [10, 13, 0.95],
      [11, 13, 0.95],
      [13, 13, 0.95],
      [0, 13, 0.9],
      [5, 20, 0.5],
    ] as const) {
      expect(binomialLowerTail(k, n, p)).toBeCloseTo(jStat.binomial.cdf(k, n, p), 9);
    }
  });
});

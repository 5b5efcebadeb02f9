// Prediction intervals, leverage, horizon totals and plan differences, checked against an
// independent computation: ml-matrix's explicit inverse of XᵀX on well-conditioned seeded data,
// and Student t quantiles from jStat's inverse (the engine polishes its own; they agree to 1e-7).
import jstatModule from "jstat";
import { Matrix } from "ml-matrix";
import { describe, expect, it } from "vitest";
import {
  type ModelSpecification,
  buildDesign,
  fitLeastSquares,
  predict,
  predictDifference,
  predictTotal,
} from "@/server/stats";
import { directLeastSquares } from "./support/direct";
import { marketingData } from "./support/random";

const { jStat } = jstatModule;

/** Agreement between QR-based and normal-equation computations on well-conditioned data. */
const independentRouteTolerance = 1e-9;
/** jStat's own quantile is accurate to about 2e-8 relative; the engine's is polished. */
const quantileTolerance = 1e-7;

const specification: ModelSpecification = {
  outcome: "sales",
  intercept: true,
  terms: [
    { kind: "linear", column: "tv" },
    { kind: "linear", column: "radio" },
    { kind: "log1p", column: "search" },
    { kind: "control", column: "price" },
  ],
};
const data = marketingData(120, 20240601);
const design = buildDesign(specification, data);
const fit = fitLeastSquares(design);
const direct = directLeastSquares(design);

function designRow(point: Record<string, number>): number[] {
  return [1, point.tv, point.radio, Math.log1p(point.search), point.price];
}

function quadraticForm(matrix: Matrix, vector: number[]): number {
  const column = Matrix.columnVector(vector);
  return column.transpose().mmul(matrix).mmul(column).get(0, 0);
}

describe("predict at a single point", () => {
  const point = { tv: 130, radio: 35, search: 44, price: 10.2 };
  const prediction = predict(fit, point);
  const row = designRow(point);
  const leverage = quadraticForm(direct.inverseGram, row);
  const mean = row.reduce((sum, value, index) => sum + value * direct.estimates[index], 0);
  const critical = jStat.studentt.inv(0.975, direct.residualDegreesOfFreedom);

  it("gives the mean x₀ᵀβ", () => {
    expect(Math.abs(prediction.mean - mean) / Math.abs(mean)).toBeLessThan(independentRouteTolerance);
  });

  it("gives the leverage h₀ = x₀ᵀ(XᵀX)⁻¹x₀", () => {
    expect(Math.abs(prediction.leverage - leverage) / leverage).toBeLessThan(independentRouteTolerance);
  });

  it("gives the confidence interval mean ± t s √h₀", () => {
    const halfWidth = critical * Math.sqrt(direct.residualVariance * leverage);
    const actualHalfWidth = (prediction.confidenceInterval.upper - prediction.confidenceInterval.lower) / 2;
    expect(Math.abs(actualHalfWidth - halfWidth) / halfWidth).toBeLessThan(quantileTolerance);
  });

  it("gives the prediction interval mean ± t s √(1 + h₀), wider than the confidence interval", () => {
    const halfWidth = critical * Math.sqrt(direct.residualVariance * (1 + leverage));
    const actualHalfWidth = (prediction.predictionInterval.upper - prediction.predictionInterval.lower) / 2;
    expect(Math.abs(actualHalfWidth - halfWidth) / halfWidth).toBeLessThan(quantileTolerance);
    expect(prediction.predictionInterval.lower).toBeLessThan(prediction.confidenceInterval.lower);
  });

  it("honours another confidence level", () => {
    const ninety = predict(fit, point, { confidenceLevel: 0.9 });
    const criticalNinety = jStat.studentt.inv(0.95, direct.residualDegreesOfFreedom);
    const halfWidth = criticalNinety * Math.sqrt(direct.residualVariance * leverage);
    const actualHalfWidth = (ninety.confidenceInterval.upper - ninety.confidenceInterval.lower) / 2;
    expect(Math.abs(actualHalfWidth - halfWidth) / halfWidth).toBeLessThan(quantileTolerance);
  });

  it("matches the training leverages at a training row", () => {
    const rowIndex = 7;
    const training = predict(fit, { tv: data.tv[rowIndex], radio: data.radio[rowIndex], search: data.search[rowIndex], price: data.price[rowIndex] });
    expect(Math.abs(training.leverage - direct.leverages[rowIndex]) / direct.leverages[rowIndex]).toBeLessThan(
      independentRouteTolerance,
    );
    expect(Math.abs(fit.leverages[rowIndex] - direct.leverages[rowIndex]) / direct.leverages[rowIndex]).toBeLessThan(
      independentRouteTolerance,
    );
    expect(training.extrapolation.extrapolating).toBe(false);
  });
});

describe("predictTotal over a horizon", () => {
  const points = [
    { tv: 100, radio: 30, search: 40, price: 10 },
    { tv: 150, radio: 20, search: 60, price: 9.5 },
    { tv: 80, radio: 45, search: 25, price: 10.5 },
    { tv: 190, radio: 40, search: 70, price: 9.2 },
  ];
  const critical = jStat.studentt.inv(0.975, direct.residualDegreesOfFreedom);

  it("uses s²(H + 1ᵀX₀(XᵀX)⁻¹X₀ᵀ1) for the prediction interval and s²·1ᵀX₀(XᵀX)⁻¹X₀ᵀ1 for the confidence interval", () => {
    const summed = points.map(designRow).reduce((sum, row) => sum.map((value, index) => value + row[index]));
    const quadratic = quadraticForm(direct.inverseGram, summed);
    const total = predictTotal(fit, { points });
    const meanTotal = summed.reduce((sum, value, index) => sum + value * direct.estimates[index], 0);
    expect(Math.abs(total.total - meanTotal) / meanTotal).toBeLessThan(independentRouteTolerance);
    const confidenceHalfWidth = critical * Math.sqrt(direct.residualVariance * quadratic);
    const predictionHalfWidth = critical * Math.sqrt(direct.residualVariance * (points.length + quadratic));
    expect(Math.abs((total.confidenceInterval.upper - total.total) - confidenceHalfWidth) / confidenceHalfWidth).toBeLessThan(
      quantileTolerance,
    );
    expect(Math.abs((total.predictionInterval.upper - total.total) - predictionHalfWidth) / predictionHalfWidth).toBeLessThan(
      quantileTolerance,
    );
    expect(total.periods).toBe(4);
    expect(total.extrapolation).toHaveLength(4);
  });

  it("treats a repeated point like the explicit list of the same point", () => {
    const repeated = predictTotal(fit, { point: points[1], periods: 13 });
    const listed = predictTotal(fit, { points: Array.from({ length: 13 }, () => points[1]) });
    expect(repeated.total).toBeCloseTo(listed.total, 9);
    expect(repeated.standardErrorOfPrediction).toBeCloseTo(listed.standardErrorOfPrediction, 9);
    expect(repeated.extrapolation).toHaveLength(1);
  });

  it("reduces to predict for one period", () => {
    const single = predictTotal(fit, { point: points[0] });
    const point = predict(fit, points[0]);
    expect(single.total).toBe(point.mean);
    expect(single.predictionInterval).toEqual(point.predictionInterval);
  });

  it("rejects an empty plan or a fractional number of periods", () => {
    expect(() => predictTotal(fit, { points: [] })).toThrow("predictTotal requires at least one period in a plan");
    expect(() => predictTotal(fit, { point: points[0], periods: 2.5 })).toThrow(
      "predictTotal requires a whole number of periods of at least 1 (got 2.5)",
    );
  });
});

describe("predictDifference between two plans", () => {
  const planA = { point: { tv: 160, radio: 30, search: 50, price: 10 }, periods: 8 };
  const planB = { point: { tv: 120, radio: 45, search: 50, price: 10 }, periods: 8 };

  it("takes its interval from the covariance of the difference, not from the two intervals", () => {
    const difference = predictDifference(fit, planA, planB);
    const vector = designRow(planA.point).map((value, index) => 8 * (value - designRow(planB.point)[index]));
    const variance = direct.residualVariance * quadraticForm(direct.inverseGram, vector);
    const critical = jStat.studentt.inv(0.975, direct.residualDegreesOfFreedom);
    const halfWidth = critical * Math.sqrt(variance);
    expect(Math.abs((difference.confidenceInterval.upper - difference.difference) - halfWidth) / halfWidth).toBeLessThan(
      quantileTolerance,
    );
    const totalA = predictTotal(fit, planA);
    const totalB = predictTotal(fit, planB);
    expect(difference.difference).toBeCloseTo(totalA.total - totalB.total, 8);
    // Subtracting intervals would give a far wider (and wrong) band: the totals share β̂.
    const subtractedHalfWidth =
      (totalA.confidenceInterval.upper - totalA.confidenceInterval.lower) / 2 +
      (totalB.confidenceInterval.upper - totalB.confidenceInterval.lower) / 2;
    expect(halfWidth).toBeLessThan(subtractedHalfWidth);
  });

  it("is zero with zero width for identical plans", () => {
    const same = predictDifference(fit, planA, planA);
    expect(same.difference).toBe(0);
    expect(same.standardError).toBe(0);
  });
});

describe("extrapolation flags", () => {
  it("names each raw column outside its observed range and by how much", () => {
    const range = fit.predictionModel.columnRanges.tv;
    const prediction = predict(fit, { tv: range.maximum + 25, radio: 30, search: 40, price: 10 });
    expect(prediction.extrapolation.columns).toEqual([
      expect.objectContaining({ name: "tv", distance: expect.closeTo(25, 9), maximum: range.maximum }),
    ]);
    expect(prediction.extrapolation.terms.map((term) => term.name)).toEqual(["tv"]);
    expect(prediction.extrapolation.extrapolating).toBe(true);
  });

  it("flags a term outside its range (log1p of search below its minimum)", () => {
    const range = fit.predictionModel.columnRanges.search;
    const prediction = predict(fit, { tv: 120, radio: 30, search: range.minimum - 5, price: 10 });
    expect(prediction.extrapolation.terms.map((term) => term.name)).toEqual(["log1p(search)"]);
  });

  it("detects hidden extrapolation: every column in range, the combination outside the regressor hull", () => {
    // radio rises with tv in the training data; high tv with the lowest radio was never seen.
    const tvRange = fit.predictionModel.columnRanges.tv;
    const radioRange = fit.predictionModel.columnRanges.radio;
    const corner = { tv: tvRange.maximum, radio: radioRange.minimum, search: 20.5, price: 9.01 };
    const prediction = predict(fit, corner);
    expect(prediction.extrapolation.columns).toEqual([]);
    expect(prediction.leverage).toBeGreaterThan(fit.maxLeverage);
    expect(prediction.extrapolation.hiddenExtrapolation).toBe(true);
  });

  it("does not flag the centre of the data", () => {
    const centre = { tv: 125, radio: 42.5, search: 50, price: 10 };
    expect(predict(fit, centre).extrapolation.extrapolating).toBe(false);
  });
});

describe("scenario points", () => {
  it("requires every column the model reads", () => {
    expect(() => predict(fit, { tv: 1, radio: 2, search: 3 })).toThrow("predict requires a value for column 'price'");
    expect(() => predict(fit, { tv: 1, radio: 2, search: -3, price: 1 })).toThrow(
      "predict requires column 'search' > -1 for log1p (got -3)",
    );
  });
});

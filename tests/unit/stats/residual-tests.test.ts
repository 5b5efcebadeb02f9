// Residual tests against independent computations: Breusch–Pagan (Koenker's studentized form) as
// n·R² of the auxiliary regression of r² on X run explicitly with ml-matrix (Koenker 1981), and
// Jarque–Bera from jStat's moment skewness and kurtosis (Jarque & Bera 1987); p-values from jStat's
// χ² distribution. χ² table values are the standard printed ones (from memory, any statistics table).
import jstatModule from "jstat";
import { Matrix, inverse } from "ml-matrix";
import { describe, expect, it } from "vitest";
import { type ModelSpecification, buildDesign, chiSquareUpperTail, fitLeastSquares, jarqueBera } from "@/server/stats";
import { designMatrix } from "./support/direct";
import { createRandom } from "./support/random";

const { jStat } = jstatModule;

const specification: ModelSpecification = {
  outcome: "y",
  intercept: true,
  terms: [
    { kind: "linear", column: "a" },
    { kind: "linear", column: "b" },
    { kind: "log1p", column: "c" },
  ],
};

/** Errors whose spread grows with `a` when `spreading`, constant otherwise; normal or skewed (exponential). */
function data(rowCount: number, seed: number, options: { spreading: boolean; skewed?: boolean }) {
  const random = createRandom(seed);
  const a = Float64Array.from({ length: rowCount }, () => 1 + 9 * random.uniform());
  const b = Float64Array.from({ length: rowCount }, () => random.normal());
  const c = Float64Array.from({ length: rowCount }, () => 50 * random.uniform());
  const y = Float64Array.from({ length: rowCount }, (_, row) => {
    const shock = options.skewed ? -Math.log(1 - random.uniform()) - 1 : random.normal();
    return 10 + 2 * a[row] - b[row] + 3 * Math.log1p(c[row]) + (options.spreading ? 0.4 * a[row] : 2) * shock;
  });
  return { y, a, b, c };
}

/** Koenker's LM by the textbook route: regress r² on X (with its intercept) and take n·R². */
function auxiliaryRegression(x: Matrix, residuals: ArrayLike<number>) {
  const squares = Array.from(residuals, (value) => value * value);
  const z = Matrix.columnVector(squares);
  const beta = inverse(x.transpose().mmul(x)).mmul(x.transpose()).mmul(z);
  const fitted = x.mmul(beta).to1DArray();
  const mean = squares.reduce((sum, value) => sum + value, 0) / squares.length;
  const total = squares.reduce((sum, value) => sum + (value - mean) ** 2, 0);
  const unexplained = squares.reduce((sum, value, row) => sum + (value - fitted[row]) ** 2, 0);
  const statistic = squares.length * (1 - unexplained / total);
  const degreesOfFreedom = x.columns - 1;
  return { statistic, degreesOfFreedom, pValue: 1 - jStat.chisquare.cdf(statistic, degreesOfFreedom) };
}

describe("Breusch–Pagan (Koenker)", () => {
  for (const [label, spreading] of [
    ["spread growing with a channel", true],
    ["constant spread", false],
  ] as const) {
    it(`equals n·R² of the explicit auxiliary regression (${label}), under every covariance choice`, () => {
      // 2,500 rows: three blocks of the diagnostic pass, so the accumulation across blocks counts.
      const design = buildDesign(specification, data(2500, spreading ? 11 : 12, { spreading }));
      const reference = auxiliaryRegression(designMatrix(design), fitLeastSquares(design).residuals);
      for (const covariance of [{ type: "classical" }, { type: "hc3" }, { type: "newey-west" }] as const) {
        const test = fitLeastSquares(design, { covariance }).residualTests.heteroskedasticity!;
        expect(test.degreesOfFreedom).toBe(3);
        expect(Math.abs(test.statistic - reference.statistic) / reference.statistic).toBeLessThan(1e-9);
        expect(test.pValue).toBeCloseTo(reference.pValue, 9);
      }
    });
  }

  it("finds spread that grows with spend, and not where there is none", () => {
    const growing = fitLeastSquares(buildDesign(specification, data(400, 21, { spreading: true }))).residualTests.heteroskedasticity!;
    const constant = fitLeastSquares(buildDesign(specification, data(400, 22, { spreading: false }))).residualTests.heteroskedasticity!;
    expect(growing.pValue).toBeLessThan(1e-6);
    expect(constant.pValue).toBeGreaterThan(0.01);
  });

  it("is left out without an intercept (the auxiliary regression needs a constant)", () => {
    const design = buildDesign({ ...specification, intercept: false }, data(200, 5, { spreading: true }));
    expect(fitLeastSquares(design).residualTests.heteroskedasticity).toBeNull();
  });
});

describe("Jarque–Bera", () => {
  it("matches jStat's skewness and kurtosis of the same residuals and χ²₂'s tail", () => {
    for (const skewed of [false, true]) {
      const fit = fitLeastSquares(buildDesign(specification, data(1000, skewed ? 31 : 32, { spreading: false, skewed })));
      const residuals = Array.from(fit.residuals);
      const skewness = jStat.skewness(residuals);
      const kurtosis = jStat.kurtosis(residuals) + 3;
      const statistic = (residuals.length / 6) * (skewness ** 2 + (kurtosis - 3) ** 2 / 4);
      const test = fit.residualTests.normality!;
      expect(test.skewness).toBeCloseTo(skewness, 10);
      expect(test.kurtosis).toBeCloseTo(kurtosis, 10);
      expect(Math.abs(test.statistic - statistic) / statistic).toBeLessThan(1e-10);
      expect(test.pValue).toBeCloseTo(1 - jStat.chisquare.cdf(statistic, 2), 12);
    }
  });

  it("rejects skewed errors and keeps normal ones", () => {
    const skewed = fitLeastSquares(buildDesign(specification, data(1000, 41, { spreading: false, skewed: true }))).residualTests.normality!;
    const normal = fitLeastSquares(buildDesign(specification, data(1000, 42, { spreading: false }))).residualTests.normality!;
    // Exponential errors: skewness 2, kurtosis 9 (common practice: the standard moments of the exponential).
    expect(skewed.skewness).toBeGreaterThan(1.5);
    expect(skewed.pValue).toBeLessThan(1e-10);
    expect(normal.pValue).toBeGreaterThan(0.01);
  });

  it("is null when every residual is zero", () => {
    expect(jarqueBera(new Float64Array(10))).toBeNull();
  });
});

describe("chiSquareUpperTail", () => {
  it("agrees with jStat's χ² distribution and the printed 5% points", () => {
    for (const degreesOfFreedom of [1, 2, 3, 7, 20]) {
      for (const x of [0.5, 2, 5, 12, 30]) {
        expect(chiSquareUpperTail(x, degreesOfFreedom)).toBeCloseTo(1 - jStat.chisquare.cdf(x, degreesOfFreedom), 10);
      }
    }
    // 95th percentiles of χ² (standard tables, from memory): df 1 → 3.841, df 2 → 5.991, df 5 → 11.070.
    expect(chiSquareUpperTail(3.841, 1)).toBeCloseTo(0.05, 3);
    expect(chiSquareUpperTail(5.991, 2)).toBeCloseTo(0.05, 3);
    expect(chiSquareUpperTail(11.07, 5)).toBeCloseTo(0.05, 3);
    expect(chiSquareUpperTail(0, 3)).toBe(1);
  });
});

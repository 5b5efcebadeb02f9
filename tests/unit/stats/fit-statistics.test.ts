// Whole-model statistics and diagnostics against direct computations from their definitions
// (ml-matrix for linear algebra; leave-one-out refits for externally studentized residuals).
import { Matrix, SingularValueDecomposition } from "ml-matrix";
import { describe, expect, it } from "vitest";
import { type ModelSpecification, buildDesign, fitLeastSquares, fitModel } from "@/server/stats";
import { designMatrix, directLeastSquares, largestRelativeDifference } from "./support/direct";
import { marketingData } from "./support/random";

/** QR route versus the explicit-inverse route on well-conditioned data, relative. */
const independentRouteTolerance = 1e-9;

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
const data = marketingData(60, 99);
const design = buildDesign(specification, data);
const fit = fitLeastSquares(design);
const direct = directLeastSquares(design);
const n = design.rowCount;
const p = design.columnCount;

function relative(actual: number, expected: number): number {
  return Math.abs(actual - expected) / Math.abs(expected);
}

describe("model statistics", () => {
  const rss = direct.residuals.reduce((sum, value) => sum + value * value, 0);
  const mean = data.sales.reduce((sum, value) => sum + value, 0) / n;
  const tss = data.sales.reduce((sum, value) => sum + (value - mean) ** 2, 0);

  it("computes σ, R², adjusted R² and the F test from their definitions", () => {
    expect(relative(fit.residualStandardError, Math.sqrt(rss / (n - p)))).toBeLessThan(independentRouteTolerance);
    expect(relative(fit.rSquared, 1 - rss / tss)).toBeLessThan(independentRouteTolerance);
    expect(relative(fit.adjustedRSquared, 1 - ((rss / (n - p)) / (tss / (n - 1))))).toBeLessThan(independentRouteTolerance);
    expect(relative(fit.fStatistic, ((tss - rss) / (p - 1)) / (rss / (n - p)))).toBeLessThan(independentRouteTolerance);
    expect([fit.fNumeratorDegreesOfFreedom, fit.fDenominatorDegreesOfFreedom]).toEqual([p - 1, n - p]);
    expect(fit.rSquaredCentred).toBe(true);
  });

  it("computes the Gaussian log-likelihood, AIC and BIC as R's logLik/AIC/BIC do (σ counted)", () => {
    const logLikelihood = -(n / 2) * (Math.log(2 * Math.PI) + Math.log(rss / n) + 1);
    expect(relative(fit.logLikelihood, logLikelihood)).toBeLessThan(independentRouteTolerance);
    expect(relative(fit.akaikeInformationCriterion, -2 * logLikelihood + 2 * (p + 1))).toBeLessThan(independentRouteTolerance);
    expect(relative(fit.bayesianInformationCriterion, -2 * logLikelihood + Math.log(n) * (p + 1))).toBeLessThan(
      independentRouteTolerance,
    );
  });

  it("uses the uncentred R² without an intercept, and says so", () => {
    const noIntercept = fitModel({ ...specification, intercept: false }, data);
    const residualSum = noIntercept.residuals.reduce((sum, value) => sum + value * value, 0);
    const uncentredTotal = data.sales.reduce((sum, value) => sum + value * value, 0);
    expect(noIntercept.rSquaredCentred).toBe(false);
    expect(relative(noIntercept.rSquared, 1 - residualSum / uncentredTotal)).toBeLessThan(independentRouteTolerance);
    expect(noIntercept.fNumeratorDegreesOfFreedom).toBe(4);
  });
});

describe("collinearity diagnostics", () => {
  const predictors = ["tv", "radio", "log1p(search)", "price"];
  const columnOf = (term: string) => {
    const index = design.termNames.indexOf(term);
    return Array.from(design.values.subarray(index * n, (index + 1) * n));
  };

  it("gives Pearson correlations of the predictors", () => {
    expect(fit.collinearity.terms).toEqual(predictors);
    const pearson = (a: number[], b: number[]) => {
      const meanA = a.reduce((s, v) => s + v, 0) / a.length;
      const meanB = b.reduce((s, v) => s + v, 0) / b.length;
      let ab = 0;
      let aa = 0;
      let bb = 0;
      a.forEach((value, index) => {
        ab += (value - meanA) * (b[index] - meanB);
        aa += (value - meanA) ** 2;
        bb += (b[index] - meanB) ** 2;
      });
      return ab / Math.sqrt(aa * bb);
    };
    predictors.forEach((first, a) => {
      predictors.forEach((second, b) => {
        expect(fit.collinearity.correlations[a * 4 + b]).toBeCloseTo(pearson(columnOf(first), columnOf(second)), 12);
      });
    });
  });

  it("gives VIFⱼ = 1 / (1 − R²ⱼ) from regressing each predictor on the others", () => {
    predictors.forEach((target, index) => {
      const columns: Record<string, Float64Array> = {};
      predictors.forEach((term, position) => {
        columns[`c${position}`] = Float64Array.from(columnOf(term));
      });
      const auxiliary = fitModel(
        {
          outcome: `c${index}`,
          intercept: true,
          terms: predictors.flatMap((_, position) => (position === index ? [] : [{ kind: "linear" as const, column: `c${position}` }])),
        },
        columns,
      );
      expect(relative(fit.collinearity.varianceInflationFactors[index], 1 / (1 - auxiliary.rSquared))).toBeLessThan(
        independentRouteTolerance,
      );
      expect(target).toBe(predictors[index]);
    });
    expect(fit.collinearity.varianceInflationCentred).toBe(true);
  });

  it("gives the condition number of the design with unit-length columns", () => {
    const normalised = designMatrix(design);
    for (let column = 0; column < p; column++) {
      const norm = normalised.getColumnVector(column).norm();
      for (let row = 0; row < n; row++) normalised.set(row, column, normalised.get(row, column) / norm);
    }
    const singular = new SingularValueDecomposition(normalised).diagonal;
    expect(relative(fit.conditionNumber, Math.max(...singular) / Math.min(...singular))).toBeLessThan(1e-8);
  });

  it("computes correlations without an intercept by a centred pass, and flags uncentred VIFs", () => {
    const noIntercept = fitModel({ ...specification, intercept: false }, data);
    expect(noIntercept.collinearity.varianceInflationCentred).toBe(false);
    expect(largestRelativeDifference(noIntercept.collinearity.correlations, fit.collinearity.correlations)).toBeLessThan(1e-12);
  });
});

describe("observation diagnostics", () => {
  const s = fit.residualStandardError;

  it("gives residuals and leverages of the independent route", () => {
    expect(largestRelativeDifference(fit.residuals, direct.residuals, 1e-6)).toBeLessThan(independentRouteTolerance);
    expect(largestRelativeDifference(fit.leverages, direct.leverages)).toBeLessThan(independentRouteTolerance);
    expect(fit.maxLeverage).toBe(Math.max(...fit.leverages));
    expect(fit.leverages.reduce((sum, value) => sum + value, 0)).toBeCloseTo(p, 10);
  });

  it("gives internally studentized residuals and Cook's distances from their definitions", () => {
    const internal = direct.residuals.map((residual, row) => residual / (s * Math.sqrt(1 - direct.leverages[row])));
    expect(largestRelativeDifference(fit.studentizedResiduals, internal, 1e-6)).toBeLessThan(independentRouteTolerance);
    const cooks = internal.map((value, row) => (value ** 2 / p) * (direct.leverages[row] / (1 - direct.leverages[row])));
    expect(largestRelativeDifference(fit.cooksDistances, cooks, 1e-12)).toBeLessThan(independentRouteTolerance);
  });

  it("gives externally studentized residuals equal to leave-one-out refits: rᵢ / (s₍ᵢ₎ √(1 − hᵢ))", () => {
    for (const row of [0, 17, 42, n - 1]) {
      const keep = (values: Float64Array) => values.filter((_, index) => index !== row);
      const without = fitModel(specification, {
        sales: keep(data.sales),
        tv: keep(data.tv),
        radio: keep(data.radio),
        search: keep(data.search),
        price: keep(data.price),
      });
      const expected = fit.residuals[row] / (without.residualStandardError * Math.sqrt(1 - fit.leverages[row]));
      expect(relative(fit.externallyStudentizedResiduals[row], expected)).toBeLessThan(1e-8);
    }
  });

  it("gives the Durbin–Watson statistic Σ(rᵢ − rᵢ₋₁)² / Σrᵢ²", () => {
    let numerator = 0;
    for (let row = 1; row < n; row++) numerator += (direct.residuals[row] - direct.residuals[row - 1]) ** 2;
    const denominator = direct.residuals.reduce((sum, value) => sum + value * value, 0);
    expect(relative(fit.durbinWatson, numerator / denominator)).toBeLessThan(independentRouteTolerance);
  });

  it("computes the derived arrays once and keeps them", () => {
    expect(fit.cooksDistances).toBe(fit.cooksDistances);
    expect(fit.fittedValues).toBeInstanceOf(Float64Array);
    expect(Matrix.columnVector(Array.from(fit.fittedValues)).rows).toBe(n);
  });
});

describe("accuracy report", () => {
  it("skips refinement on well-conditioned data and says how accurate the plain solve is", () => {
    expect(fit.accuracy.solutionRefinementSteps).toBe(0);
    expect(fit.accuracy.inverseRefinementSteps).toBe(0);
    expect(fit.accuracy.estimatedRelativeError).toBeLessThan(1e-12);
  });

  it("refines on request and lands on the same numbers", () => {
    const refined = fitLeastSquares(design, { refinement: "always" });
    expect(refined.accuracy.solutionRefinementSteps).toBeGreaterThan(0);
    expect(largestRelativeDifference(refined.estimates, fit.estimates)).toBeLessThan(1e-12);
  });
});

// Covariance choices (classical, HC3, Newey–West) against direct formula computations with
// ml-matrix: (XᵀX)⁻¹ X' Ω X (XᵀX)⁻¹ built explicitly from the published definitions
// (MacKinnon & White 1985 for HC3; Newey & West 1987 for the Bartlett-weighted HAC estimator).
import { Matrix } from "ml-matrix";
import { describe, expect, it } from "vitest";
import { type LeastSquaresFit, type ModelSpecification, buildDesign, fitLeastSquares, studentTTwoSidedPValue } from "@/server/stats";
import { directLeastSquares, largestRelativeDifference } from "./support/direct";
import { createRandom } from "./support/random";

/** QR/sandwich route versus explicit inverse route, well-conditioned data. */
const independentRouteTolerance = 1e-9;

const specification: ModelSpecification = {
  outcome: "y",
  intercept: true,
  terms: [
    { kind: "linear", column: "a" },
    { kind: "linear", column: "b" },
    { kind: "linear", column: "c" },
  ],
};

/** Heteroskedastic, autocorrelated errors (AR(1), ρ = 0.6) so the three covariances differ. */
function seriesData(rowCount: number, seed: number) {
  const random = createRandom(seed);
  const a = Float64Array.from({ length: rowCount }, () => random.uniform() * 10);
  const b = Float64Array.from({ length: rowCount }, () => random.normal());
  const c = Float64Array.from({ length: rowCount }, (_, row) => Math.sin(row / 5) + 0.3 * random.normal());
  let error = 0;
  const y = Float64Array.from({ length: rowCount }, (_, row) => {
    error = 0.6 * error + (0.5 + a[row] / 5) * random.normal();
    return 3 + 0.5 * a[row] - 2 * b[row] + c[row] + error;
  });
  return { y, a, b, c };
}

// 2,500 rows span three blocks of the diagnostic pass, so Newey–West's carry-over between
// blocks is exercised.
const design = buildDesign(specification, seriesData(2500, 77));
const direct = directLeastSquares(design);

function flatten(matrix: Matrix): number[] {
  return matrix.to1DArray();
}

function directSandwich(weightsOfScores: (scores: Matrix) => Matrix): Matrix {
  const scores = direct.x.clone();
  for (let row = 0; row < scores.rows; row++) {
    for (let column = 0; column < scores.columns; column++) scores.set(row, column, scores.get(row, column) * direct.residuals[row]);
  }
  return direct.inverseGram.mmul(weightsOfScores(scores)).mmul(direct.inverseGram);
}

function standardErrorsFollow(fit: LeastSquaresFit) {
  fit.coefficients.forEach((row, index) => {
    const variance = fit.covariance[index * fit.rank + index];
    expect(row.standardError).toBeCloseTo(Math.sqrt(variance), 12);
    expect(row.tStatistic).toBeCloseTo(row.estimate / Math.sqrt(variance), 9);
    expect(row.pValue).toBeCloseTo(studentTTwoSidedPValue(row.tStatistic, fit.residualDegreesOfFreedom), 12);
  });
}

describe("classical covariance (the default)", () => {
  const fit = fitLeastSquares(design);
  it("equals s²(XᵀX)⁻¹", () => {
    const expected = flatten(direct.inverseGram.clone().mul(direct.residualVariance));
    expect(largestRelativeDifference(fit.covariance, expected, 1e-12)).toBeLessThan(independentRouteTolerance);
    expect(fit.covarianceType).toBe("classical");
    expect(fit.neweyWestLag).toBeNull();
    standardErrorsFollow(fit);
  });
});

describe("HC3 covariance", () => {
  const fit = fitLeastSquares(design, { covariance: { type: "hc3" } });
  it("equals (XᵀX)⁻¹ Σ xᵢxᵢᵀ rᵢ²/(1 − hᵢ)² (XᵀX)⁻¹", () => {
    const expected = directSandwich((scores) => {
      const weighted = scores.clone();
      for (let row = 0; row < weighted.rows; row++) {
        const factor = 1 / (1 - direct.leverages[row]);
        for (let column = 0; column < weighted.columns; column++) weighted.set(row, column, weighted.get(row, column) * factor);
      }
      return weighted.transpose().mmul(weighted);
    });
    const relative = largestRelativeDifference(fit.covariance, flatten(expected), 1e-12);
    expect(relative).toBeLessThan(independentRouteTolerance);
    expect(fit.covarianceType).toBe("hc3");
    standardErrorsFollow(fit);
  });

  it("uses a Wald F test for the slopes", () => {
    expect(fit.fTestKind).toBe("wald");
    expect(fitLeastSquares(design).fTestKind).toBe("anova");
  });
});

describe("Newey–West covariance", () => {
  for (const lag of [0, 1, 4, 12]) {
    it(`equals the Bartlett-weighted sandwich with lag ${lag}`, () => {
      const fit = fitLeastSquares(design, { covariance: { type: "newey-west", lag } });
      const expected = directSandwich((scores) => {
        let meat = scores.transpose().mmul(scores);
        for (let distance = 1; distance <= lag; distance++) {
          const weight = 1 - distance / (lag + 1);
          const later = scores.subMatrix(distance, scores.rows - 1, 0, scores.columns - 1);
          const earlier = scores.subMatrix(0, scores.rows - 1 - distance, 0, scores.columns - 1);
          const cross = later.transpose().mmul(earlier);
          meat = meat.add(cross.clone().add(cross.transpose()).mul(weight));
        }
        return meat;
      });
      expect(largestRelativeDifference(fit.covariance, flatten(expected), 1e-12)).toBeLessThan(independentRouteTolerance);
      expect(fit.neweyWestLag).toBe(lag);
      standardErrorsFollow(fit);
    });
  }

  it("states the lag it chose when none is given: ⌊4 (n/100)^(2/9)⌋", () => {
    const fit = fitLeastSquares(design, { covariance: { type: "newey-west" } });
    expect(fit.neweyWestLag).toBe(Math.floor(4 * (2500 / 100) ** (2 / 9)));
  });

  it("equals HC0 at lag 0 (no autocorrelation terms)", () => {
    const fit = fitLeastSquares(design, { covariance: { type: "newey-west", lag: 0 } });
    const expected = directSandwich((scores) => scores.transpose().mmul(scores));
    expect(largestRelativeDifference(fit.covariance, flatten(expected), 1e-12)).toBeLessThan(independentRouteTolerance);
  });

  it("rejects a lag that is negative or not below n", () => {
    expect(() => fitLeastSquares(design, { covariance: { type: "newey-west", lag: -1 } })).toThrow(
      "fitLeastSquares requires a Newey-West lag that is an integer from 0 to n - 1 (got -1)",
    );
  });
});

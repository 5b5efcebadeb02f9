// Student's t and F distribution functions.
// Sources: (1) a published t table — NIST/SEMATECH e-Handbook of Statistical Methods, §1.3.6.7.2
// "Critical Values of the Student's t Distribution" (three decimals; values typed from memory,
// so each is checked only to the table's half-unit in the last place); (2) closed forms of the
// t quantile for 1, 2 and 4 degrees of freedom (W. T. Shaw, "Sampling Student's T distribution —
// use of the inverse cumulative distribution function", J. Computational Finance 9, 2006);
// (3) SciPy 1.17.1's scipy.stats.t (fixtures/t-distribution-scipy.json records the command);
// (4) jStat's own studentt.inv / studentt.cdf / centralF.cdf for many df and levels.
import jstatModule from "jstat";
import { describe, expect, it } from "vitest";
import scipyReference from "./fixtures/t-distribution-scipy.json";
import {
  fDistributionUpperTail,
  studentTCriticalValue,
  studentTQuantile,
  studentTTwoSidedPValue,
  studentTUpperTail,
} from "@/server/stats";

const { jStat } = jstatModule;

/** Half a unit in the third decimal: the resolution of a three-decimal table. */
const tableTolerance = 0.0005;
/**
 * Relative accuracy of the t functions measured against closed forms: jStat's incomplete beta
 * stops its continued fraction at a relative change of 3e-7, which leaves up to about 6e-8.
 */
const closedFormTolerance = 1e-7;
/** Against SciPy over a grid of df 1 … 999,980 (measured worst: 5.7e-8 quantile, 2.2e-7 p-value). */
const scipyQuantileTolerance = 1e-7;
const scipyPValueTolerance = 5e-7;
/**
 * Agreement with jStat's own inverse and cdf: the same incomplete beta underneath, but evaluated
 * at different arguments, so each carries its own truncation error of up to ~1e-7.
 */
const jstatTolerance = 1e-6;

const upperTailProbabilities = [0.1, 0.05, 0.025, 0.01, 0.005, 0.001];
// Rows: degrees of freedom → critical values for the upper-tail probabilities above.
const publishedTable: [number, number[]][] = [
  [2, [1.886, 2.92, 4.303, 6.965, 9.925, 22.327]],
  [3, [1.638, 2.353, 3.182, 4.541, 5.841, 10.215]],
  [4, [1.533, 2.132, 2.776, 3.747, 4.604, 7.173]],
  [5, [1.476, 2.015, 2.571, 3.365, 4.032, 5.893]],
  [6, [1.44, 1.943, 2.447, 3.143, 3.707, 5.208]],
  [7, [1.415, 1.895, 2.365, 2.998, 3.499, 4.785]],
  [8, [1.397, 1.86, 2.306, 2.896, 3.355, 4.501]],
  [9, [1.383, 1.833, 2.262, 2.821, 3.25, 4.297]],
  [10, [1.372, 1.812, 2.228, 2.764, 3.169, 4.144]],
  [15, [1.341, 1.753, 2.131, 2.602, 2.947, 3.733]],
  [20, [1.325, 1.725, 2.086, 2.528, 2.845, 3.552]],
  [30, [1.31, 1.697, 2.042, 2.457, 2.75, 3.385]],
  [60, [1.296, 1.671, 2.0, 2.39, 2.66, 3.232]],
  [100, [1.29, 1.66, 1.984, 2.364, 2.626, 3.174]],
];

function closedFormQuantile(probability: number, degreesOfFreedom: 1 | 2 | 4): number {
  if (degreesOfFreedom === 1) return Math.tan(Math.PI * (probability - 0.5));
  if (degreesOfFreedom === 2) return (2 * probability - 1) / Math.sqrt(2 * probability * (1 - probability));
  const alpha = 4 * probability * (1 - probability);
  const q = Math.cos(Math.acos(Math.sqrt(alpha)) / 3) / Math.sqrt(alpha);
  return Math.sign(probability - 0.5) * 2 * Math.sqrt(q - 1);
}

describe("Student t functions against SciPy", () => {
  it("give quantiles and two-sided p-values to the measured accuracy over df 1 … 999,980", () => {
    scipyReference.degreesOfFreedom.forEach((degreesOfFreedom, row) => {
      scipyReference.probabilities.forEach((probability, column) => {
        const expected = scipyReference.quantiles[row][column];
        expect(Math.abs(studentTQuantile(probability, degreesOfFreedom) - expected) / expected).toBeLessThan(
          scipyQuantileTolerance,
        );
      });
      scipyReference.tStatistics.forEach((tStatistic, column) => {
        const expected = scipyReference.twoSidedPValues[row][column];
        expect(Math.abs(studentTTwoSidedPValue(tStatistic, degreesOfFreedom) - expected) / expected).toBeLessThan(
          scipyPValueTolerance,
        );
      });
    });
  });
});

describe("studentTQuantile", () => {
  it("matches the NIST/SEMATECH e-Handbook t table to its three decimals", () => {
    for (const [degreesOfFreedom, row] of publishedTable) {
      row.forEach((tabled, column) => {
        const computed = studentTQuantile(1 - upperTailProbabilities[column], degreesOfFreedom);
        expect({ degreesOfFreedom, tail: upperTailProbabilities[column], difference: Math.abs(computed - tabled) <= tableTolerance }).toEqual({
          degreesOfFreedom,
          tail: upperTailProbabilities[column],
          difference: true,
        });
      });
    }
  });

  it("matches the table's infinite-df row (the normal quantiles) for very large df", () => {
    [1.282, 1.645, 1.96, 2.326, 2.576, 3.09].forEach((tabled, column) => {
      expect(Math.abs(studentTQuantile(1 - upperTailProbabilities[column], 1e8) - tabled)).toBeLessThanOrEqual(tableTolerance);
    });
  });

  it("matches the closed forms for 1, 2 and 4 degrees of freedom", () => {
    for (const degreesOfFreedom of [1, 2, 4] as const) {
      for (const probability of [0.001, 0.025, 0.1, 0.3, 0.55, 0.6, 0.75, 0.9, 0.95, 0.975, 0.99, 0.995, 0.9995, 0.99999]) {
        const exact = closedFormQuantile(probability, degreesOfFreedom);
        const computed = studentTQuantile(probability, degreesOfFreedom);
        expect(Math.abs(computed - exact) / Math.abs(exact)).toBeLessThan(closedFormTolerance);
      }
    }
  });

  it("agrees with jStat's inverse for many df and levels, and is antisymmetric", () => {
    for (const degreesOfFreedom of [1, 2, 3, 5, 7, 11, 17, 25, 40, 71, 100, 250, 1000, 12345, 1e6]) {
      for (const probability of [0.5005, 0.6, 0.8, 0.9, 0.95, 0.975, 0.99, 0.995, 0.999, 0.9999]) {
        const computed = studentTQuantile(probability, degreesOfFreedom);
        const reference = jStat.studentt.inv(probability, degreesOfFreedom);
        // Relative for ordinary quantiles, absolute near the median where t → 0 (at df = 10⁶,
        // p = 0.5005 both jStat and the engine are off by 2e-8 absolute from SciPy).
        expect(Math.abs(computed - reference) / Math.max(1, reference)).toBeLessThan(jstatTolerance);
        expect(studentTQuantile(1 - probability, degreesOfFreedom)).toBeCloseTo(-computed, 9);
      }
    }
    expect(studentTQuantile(0.5, 9)).toBe(0);
  });

  it("is consistent with the tail function: the p-value at the critical value is 1 − level", () => {
    for (const degreesOfFreedom of [3, 30, 300]) {
      for (const level of [0.8, 0.9, 0.95, 0.99]) {
        const critical = studentTCriticalValue(level, degreesOfFreedom);
        expect(studentTTwoSidedPValue(critical, degreesOfFreedom)).toBeCloseTo(1 - level, 12);
      }
    }
  });

  it("rejects probabilities outside (0, 1) and non-positive df", () => {
    expect(() => studentTQuantile(1, 5)).toThrow("studentTQuantile requires a probability strictly between 0 and 1 (got 1)");
    expect(() => studentTQuantile(0.9, 0)).toThrow("studentTQuantile requires positive degrees of freedom (got 0)");
    expect(() => studentTCriticalValue(95, 5)).toThrow("studentTCriticalValue requires a confidence level strictly between 0 and 1 (got 95)");
  });
});

describe("studentTTwoSidedPValue", () => {
  it("matches the closed forms for 1 and 2 degrees of freedom", () => {
    for (const t of [0.01, 0.5, 1, 2, 5, 30, 1000]) {
      const cauchy = 1 - (2 / Math.PI) * Math.atan(t);
      const two = 1 - t / Math.sqrt(2 + t * t);
      expect(Math.abs(studentTTwoSidedPValue(t, 1) - cauchy) / cauchy).toBeLessThan(closedFormTolerance);
      expect(Math.abs(studentTTwoSidedPValue(-t, 2) - two) / two).toBeLessThan(closedFormTolerance);
    }
  });

  it("agrees with jStat's cdf, 2(1 − F(|t|)), where that subtraction is accurate", () => {
    for (const degreesOfFreedom of [1, 4, 9, 30, 120, 5000]) {
      for (const t of [0.1, 0.7, 1.3, 2, 2.9, 4]) {
        const reference = 2 * (1 - jStat.studentt.cdf(t, degreesOfFreedom));
        expect(Math.abs(studentTTwoSidedPValue(t, degreesOfFreedom) - reference) / reference).toBeLessThan(jstatTolerance);
      }
    }
  });

  it("keeps relative accuracy for tiny p-values (no 1 − cdf cancellation)", () => {
    // df = 2: p = 1 − t/√(2 + t²) = 2/(√(2 + t²)(√(2 + t²) + t)), which stays accurate.
    const t = 1e6;
    const exact = 2 / (Math.sqrt(2 + t * t) * (Math.sqrt(2 + t * t) + t));
    expect(Math.abs(studentTTwoSidedPValue(t, 2) - exact) / exact).toBeLessThan(closedFormTolerance);
    expect(studentTTwoSidedPValue(Infinity, 10)).toBe(0);
    expect(studentTTwoSidedPValue(0, 10)).toBe(1);
    expect(studentTUpperTail(-1, 5) + studentTUpperTail(1, 5)).toBeCloseTo(1, 14);
  });
});

describe("fDistributionUpperTail", () => {
  it("agrees with jStat's central F cdf", () => {
    for (const [numerator, denominator] of [[1, 10], [3, 20], [5, 71], [10, 1000]]) {
      for (const f of [0.5, 1, 2.5, 4]) {
        const reference = 1 - jStat.centralF.cdf(f, numerator, denominator);
        expect(Math.abs(fDistributionUpperTail(f, numerator, denominator) - reference) / reference).toBeLessThan(jstatTolerance);
      }
    }
  });

  it("equals the squared-t two-sided p-value for one numerator degree of freedom", () => {
    expect(fDistributionUpperTail(2.3 ** 2, 1, 17)).toBeCloseTo(studentTTwoSidedPValue(2.3, 17), 12);
    expect(fDistributionUpperTail(Infinity, 5, 15)).toBe(0);
  });
});

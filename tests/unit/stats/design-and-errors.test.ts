// Term specification, design matrix construction, and the engine's input errors.
import { describe, expect, it } from "vitest";
import { twoProduct, twoSum } from "@/server/stats/double-double";
import {
  buildDesign,
  evaluateScenarioPoint,
  fitLeastSquares,
  fitModel,
  parseModelSpecification,
  solveLeastSquares,
} from "@/server/stats";

const columns = {
  sales: Float64Array.from([10, 12, 15, 13, 18, 21]),
  tv: Float64Array.from([0, 1, 3, 2, 5, 7]),
  radio: Float64Array.from([4, 3, 3, 5, 2, 1]),
};

describe("buildDesign", () => {
  it("builds a column-major matrix with one column per term, the intercept first", () => {
    const design = buildDesign(
      {
        outcome: "sales",
        intercept: true,
        terms: [
          { kind: "linear", column: "tv" },
          { kind: "log1p", column: "radio" },
          { kind: "interaction", columns: ["tv", "radio"] },
          { kind: "power", column: "tv", exponent: 2 },
          { kind: "control", column: "radio", name: "radio (control)" },
        ],
      },
      columns,
    );
    expect(design.termNames).toEqual(["(Intercept)", "tv", "log1p(radio)", "tv:radio", "tv^2", "radio (control)"]);
    expect([design.rowCount, design.columnCount]).toEqual([6, 6]);
    const column = (index: number) => Array.from(design.values.subarray(index * 6, (index + 1) * 6));
    expect(column(0)).toEqual([1, 1, 1, 1, 1, 1]);
    expect(column(2)).toEqual(Array.from(columns.radio, Math.log1p));
    expect(column(3)).toEqual(Array.from(columns.tv, (value, row) => value * columns.radio[row]));
    expect(column(4)).toEqual(Array.from(columns.tv, (value) => value * value));
    expect(design.termRanges["tv:radio"]).toEqual({ minimum: 0, maximum: 10 });
    expect(design.columnRanges.tv).toEqual({ minimum: 0, maximum: 7 });
  });

  it("keeps the rounding error of powers and interactions as a low-order part", () => {
    const x = Float64Array.from([1.1, -2.3, 3.7]);
    const design = buildDesign(
      { outcome: "y", intercept: false, terms: [{ kind: "power", column: "x", exponent: 3 }, { kind: "linear", column: "x" }] },
      { y: Float64Array.from([1, 2, 4]), x },
    );
    const low = design.lowOrderParts[0] as Float64Array;
    expect(design.lowOrderParts[1]).toBeNull();
    // (high + low) is x³ to about 32 digits: check against exact rational arithmetic in BigInt.
    x.forEach((value, row) => {
      const exact = exactCube(value);
      const high = design.values[row];
      const approximate = toScaledBigInt(high) + toScaledBigInt(low[row]);
      const error = Number(approximate - exact) / Number(exact);
      expect(Math.abs(error)).toBeLessThan(1e-28);
    });
  });

  it("evaluates a scenario point with the same arithmetic as the design rows", () => {
    const specification = {
      outcome: "sales",
      intercept: true,
      terms: [
        { kind: "log1p" as const, column: "tv" },
        { kind: "interaction" as const, columns: ["tv", "radio"] as const },
        { kind: "power" as const, column: "radio", exponent: 3 },
      ],
    };
    const design = buildDesign(specification, columns);
    for (let row = 0; row < 6; row++) {
      const point = evaluateScenarioPoint(specification, { tv: columns.tv[row], radio: columns.radio[row] });
      expect(Array.from(point)).toEqual([0, 1, 2, 3].map((column) => design.values[column * 6 + row]));
    }
  });

  it("accepts plain number arrays as well as Float64Arrays", () => {
    const design = buildDesign({ outcome: "y", intercept: true, terms: [{ kind: "linear", column: "x" }] }, { y: [1, 2, 4], x: [0, 1, 2] });
    expect(design.values).toBeInstanceOf(Float64Array);
  });
});

describe("input errors", () => {
  const simple = { outcome: "sales", intercept: true, terms: [{ kind: "linear" as const, column: "tv" }] };

  it("rejects n ≤ p", () => {
    const design = buildDesign(
      { outcome: "y", intercept: true, terms: [{ kind: "linear", column: "a" }, { kind: "linear", column: "b" }] },
      { y: [1, 2, 3], a: [1, 0, 1], b: [2, 3, 5] },
    );
    expect(() => fitLeastSquares(design)).toThrow("fitLeastSquares requires more observations (n = 3) than terms (p = 3)");
    expect(() => solveLeastSquares(design)).toThrow("solveLeastSquares requires more observations (n = 3) than terms (p = 3)");
  });

  it("rejects non-finite input, naming the column and row", () => {
    expect(() => buildDesign(simple, { ...columns, tv: Float64Array.from([0, 1, Number.NaN, 2, 5, 7]) })).toThrow(
      "buildDesign requires finite values (column 'tv' row 2 is NaN)",
    );
    expect(() => buildDesign(simple, { ...columns, sales: [1, 2, 3, Infinity, 5, 6] })).toThrow(
      "buildDesign requires finite values (column 'sales' row 3 is Infinity)",
    );
    const design = buildDesign(simple, columns);
    design.values[8] = Number.POSITIVE_INFINITY;
    expect(() => fitLeastSquares(design)).toThrow("fitLeastSquares requires finite values ('tv' row 2 is Infinity)");
  });

  it("rejects a constant outcome", () => {
    expect(() => fitModel(simple, { ...columns, sales: new Float64Array(6).fill(5) })).toThrow(
      "fitLeastSquares requires an outcome that varies (all 6 values of 'sales' equal 5)",
    );
  });

  it("rejects missing columns, unequal lengths and log1p of values ≤ −1", () => {
    expect(() => buildDesign(simple, { sales: columns.sales })).toThrow("buildDesign requires a column named 'tv'");
    expect(() => buildDesign(simple, { ...columns, tv: [1, 2] })).toThrow(
      "buildDesign requires columns of equal length ('tv' has 2 rows, 'sales' has 6)",
    );
    expect(() => buildDesign({ ...simple, terms: [{ kind: "log1p", column: "tv" }] }, { ...columns, tv: [0, 1, -1, 2, 5, 7] })).toThrow(
      "buildDesign requires column 'tv' > -1 for log1p (row 2 is -1)",
    );
  });

  it("rejects malformed specifications", () => {
    expect(() => parseModelSpecification({ outcome: "y", intercept: true, terms: [{ kind: "cubic", column: "x" }] })).toThrow(
      "parseModelSpecification requires term 0 kind to be one of linear, control, log1p, power, interaction (got cubic)",
    );
    expect(() =>
      parseModelSpecification({ outcome: "y", intercept: true, terms: [{ kind: "linear", column: "x" }, { kind: "control", column: "x" }] }),
    ).toThrow("parseModelSpecification requires distinct term names ('x' appears twice)");
    expect(() => parseModelSpecification({ outcome: "y", intercept: false, terms: [] })).toThrow(
      "parseModelSpecification requires at least one term or an intercept",
    );
    expect(() => parseModelSpecification({ outcome: "y", intercept: true, terms: [{ kind: "linear", column: "y" }] })).toThrow(
      "parseModelSpecification requires the outcome 'y' not to be a predictor as well",
    );
    expect(() =>
      parseModelSpecification({ outcome: "y", intercept: true, terms: [{ kind: "power", column: "x", exponent: 1.5 }] }),
    ).toThrow("parseModelSpecification requires term 0 (power) exponent to be an integer from 2 to 12 (got 1.5)");
  });

  it("rejects an invalid confidence level", () => {
    expect(() => fitModel(simple, columns, { confidenceLevel: 95 })).toThrow(
      "fitLeastSquares requires a confidence level strictly between 0 and 1 (got 95)",
    );
  });

  it("handles an exact fit: zero residuals, zero standard errors, infinite t and F, and a warning", () => {
    const fit = fitModel(simple, { tv: [0, 1, 2, 3, 4], sales: [1, 3, 5, 7, 9] });
    expect(fit.residualStandardError).toBe(0);
    expect(fit.coefficients[1].standardError).toBe(0);
    expect(fit.coefficients[1].tStatistic).toBe(Infinity);
    expect(fit.coefficients[1].pValue).toBe(0);
    expect(fit.fStatistic).toBe(Infinity);
    expect(fit.warnings).toContain("the fit is exact: residuals are zero, so standard errors are zero");
  });
});

// Exact x³ as a BigInt scaled by 2^300 (enough fractional bits for these doubles).
const scaleBits = 300n;
function toScaledBigInt(value: number): bigint {
  if (value === 0) return 0n;
  const view = new DataView(new ArrayBuffer(8));
  view.setFloat64(0, value);
  const bits = view.getBigUint64(0);
  const sign = bits >> 63n ? -1n : 1n;
  const exponent = Number((bits >> 52n) & 0x7ffn);
  const mantissa = (bits & ((1n << 52n) - 1n)) | (exponent === 0 ? 0n : 1n << 52n);
  const shift = BigInt(Math.max(exponent, 1) - 1075) + scaleBits;
  return sign * (shift >= 0n ? mantissa << shift : mantissa >> -shift);
}
function exactCube(value: number): bigint {
  const scaled = toScaledBigInt(value);
  return (scaled * scaled * scaled) >> (2n * scaleBits);
}

describe("double-double building blocks", () => {
  it("split sums and products exactly: a + b = s + e and a × b = p + e", () => {
    const values = [0.1, 1 / 3, -2.718281828459045, 1e10 + 0.5, 7.000000000000001, -1e-7];
    for (const a of values) {
      for (const b of values) {
        const sum = twoSum(a, b);
        expect(toScaledBigInt(sum.high) + toScaledBigInt(sum.low)).toBe(toScaledBigInt(a) + toScaledBigInt(b));
        const product = twoProduct(a, b);
        expect((toScaledBigInt(product.high) + toScaledBigInt(product.low)) << scaleBits).toBe(
          toScaledBigInt(a) * toScaledBigInt(b),
        );
      }
    }
  });
});

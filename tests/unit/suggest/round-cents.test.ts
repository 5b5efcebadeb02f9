// Largest-remainder rounding: whole cents, inside every bound, exactly on the target, and within a
// cent of each continuous amount when the amounts already met the bounds and the target.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { roundToCents } from "@/server/planning/suggest/round-cents";

const feasibleAmounts = fc
  .array(fc.record({ low: fc.integer({ min: 0, max: 1_000_000 }), width: fc.integer({ min: 0, max: 1_000_000 }), share: fc.double({ min: 0, max: 1, noNaN: true }) }), { minLength: 1, maxLength: 8 })
  .map((channels) => ({
    low: channels.map((c) => c.low),
    high: channels.map((c) => c.low + c.width),
    amounts: channels.map((c) => c.low + c.share * c.width),
  }));

describe("roundToCents", () => {
  it("keeps bounds, hits the rounded total exactly and moves each amount by less than a cent", () => {
    fc.assert(
      fc.property(feasibleAmounts, ({ low, high, amounts }) => {
        const target = Math.round(amounts.reduce((sum, value) => sum + value, 0));
        const rounded = roundToCents(amounts, low, high, target);
        expect(rounded.reduce((sum, value) => sum + value, 0)).toBe(target);
        rounded.forEach((value, j) => {
          expect(Number.isInteger(value)).toBe(true);
          expect(value).toBeGreaterThanOrEqual(low[j]);
          expect(value).toBeLessThanOrEqual(high[j]);
          expect(Math.abs(value - amounts[j])).toBeLessThan(1);
        });
      }),
      { numRuns: 500, seed: 7 },
    );
  });

  it("reaches any target the bounds allow, even far from the amounts", () => {
    expect(roundToCents([0.4, 0.4, 0.4], [0, 0, 0], [10, 10, 10], 25)).toEqual([10, 10, 5]);
    expect(roundToCents([9.6, 9.6, 9.6], [0, 0, 0], [10, 10, 10], 3)).toEqual([0, 0, 3]);
  });

  it("refuses a target outside the bounds", () => {
    expect(() => roundToCents([1, 1], [0, 0], [1, 1], 3)).toThrow(RangeError);
  });
});

import { describe, expect, it } from "vitest";
import { LARGE_SHIFT_SHARE, shiftShare } from "@/ui/scenario/cautions";

describe("shiftShare", () => {
  it("counts money moved between channels once", () => {
    expect(shiftShare({ a: 80, b: 20 }, { a: 100, b: 0 })).toBeCloseTo(0.2, 12);
    expect(shiftShare({ a: 50, b: 50 }, { a: 50, b: 50 })).toBe(0);
  });

  it("counts added or removed money once", () => {
    expect(shiftShare({ a: 130 }, { a: 100 })).toBeCloseTo(0.3, 12);
    expect(shiftShare({ a: 100, b: 30 }, { a: 110, b: 0 })).toBeCloseTo(30 / 110, 12);
  });

  it("is above the caution threshold for a large move and zero without a starting budget", () => {
    expect(shiftShare({ a: 70, b: 30 }, { a: 100, b: 0 })).toBeGreaterThan(LARGE_SHIFT_SHARE);
    expect(shiftShare({ a: 10 }, {})).toBe(0);
  });
});

import { describe, expect, test } from "vitest";
import { linearScale, roundTicks } from "@/ui/charts/linear-scale";

describe("linearScale", () => {
  test("maps the domain onto the range, clamps on request, and copes with an empty domain", () => {
    const scale = linearScale([100, 200], [6, 306]);
    expect(scale(100)).toBe(6);
    expect(scale(150)).toBe(156);
    expect(scale(250)).toBe(456);
    expect(linearScale([100, 200], [6, 306], { clamp: true })(250)).toBe(306);
    expect(linearScale([100, 200], [6, 306], { clamp: true })(0)).toBe(6);
    expect(linearScale([5, 5], [0, 10])(5)).toBe(5);
    expect(scale.ticks(4)).toEqual([100, 120, 140, 160, 180, 200]);
  });
});

describe("roundTicks", () => {
  test("steps of 1, 2 or 5 × a power of ten, about `count` of them, inside the domain", () => {
    expect(roundTicks(0, 100_000, 4)).toEqual([0, 20_000, 40_000, 60_000, 80_000, 100_000]);
    expect(roundTicks(0, 10, 10)).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10]);
    expect(roundTicks(-3.7, 12.2, 4)).toEqual([0, 5, 10]);
    expect(roundTicks(1_234_567, 1_876_543, 4)).toEqual([1_400_000, 1_600_000, 1_800_000]);
  });

  test("small steps print without float noise; a reversed domain gives reversed ticks", () => {
    expect(roundTicks(0, 1, 10)).toEqual([0, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 1]);
    expect(roundTicks(0.01, 0.07, 3)).toEqual([0.02, 0.04, 0.06]);
    expect(roundTicks(10, 0, 2)).toEqual([10, 5, 0]);
  });

  test("nothing for non-finite input or no count; one tick for a point", () => {
    expect(roundTicks(Number.NaN, 1, 4)).toEqual([]);
    expect(roundTicks(0, Infinity, 4)).toEqual([]);
    expect(roundTicks(0, 1, 0)).toEqual([]);
    expect(roundTicks(3, 3, 4)).toEqual([3]);
  });
});

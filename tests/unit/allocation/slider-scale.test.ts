import { describe, expect, it } from "vitest";
import { createAllocationState } from "@/server/planning/allocation";
import { dragStepCents, keyboardDelta, sliderMaxCents } from "@/ui/allocation/slider-scale";

describe("slider scale", () => {
  it("arrows move 1% of the range, PageUp/PageDown and Shift+arrows 10%", () => {
    expect(keyboardDelta("ArrowRight", false, 10_000_000)).toBe(100_000);
    expect(keyboardDelta("ArrowDown", false, 10_000_000)).toBe(-100_000);
    expect(keyboardDelta("PageUp", false, 10_000_000)).toBe(1_000_000);
    expect(keyboardDelta("PageDown", false, 10_000_000)).toBe(-1_000_000);
    expect(keyboardDelta("ArrowLeft", true, 10_000_000)).toBe(-1_000_000);
    expect(keyboardDelta("Home", false, 1)).toBe("min");
    expect(keyboardDelta("End", false, 1)).toBe("max");
    expect(keyboardDelta("a", false, 1)).toBeNull();
    expect(keyboardDelta("ArrowUp", false, 10)).toBe(1);
  });

  it("drags in round steps of about a thousandth of the range", () => {
    expect(dragStepCents(10_000_000)).toBe(10_000);
    expect(dragStepCents(12_345_678)).toBe(10_000);
    expect(dragStepCents(500)).toBe(1);
  });

  it("spans the fixed total, or the ceiling in growing mode", () => {
    const channels = [{ name: "a", label: "A", amountCents: 1000, locked: false }];
    expect(sliderMaxCents(createAllocationState({ channels, horizonPeriods: 1 }))).toBe(1000);
    expect(sliderMaxCents(createAllocationState({ channels, horizonPeriods: 1, mode: "growing", growth: 0.5 }))).toBe(1500);
    expect(sliderMaxCents(createAllocationState({ channels: [], horizonPeriods: 1 }))).toBe(100);
  });
});

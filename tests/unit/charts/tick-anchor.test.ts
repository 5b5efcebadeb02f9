import { describe, expect, test } from "vitest";
import { tickAnchor, tickLabelWidth } from "@/ui/charts/tick-anchor";

describe("tickAnchor", () => {
  const axis = [6, 354] as const;

  test("centres a label with room on both sides", () => {
    expect(tickAnchor(180, "€3.7M", axis)).toBe("middle");
  });

  test("a label that would run past the right end ends at its tick; past the left end starts at it", () => {
    // "€3.9M" is about 33 px wide at 11 px: centred at 340 it would reach 356.5, beyond the axis end at 354.
    expect(tickLabelWidth("€3.9M", 11)).toBeCloseTo(33, 5);
    expect(tickAnchor(340, "€3.9M", axis, 11)).toBe("end");
    expect(tickAnchor(15, "€3.6M", axis, 11)).toBe("start");
  });

  test("the axis may be given in either order", () => {
    expect(tickAnchor(340, "€3.9M", [354, 6], 11)).toBe("end");
  });
});

import { describe, expect, it } from "vitest";
import { defaultReviewedPosition } from "@/ui/compare/review-default";

const open = { signoff: null };
const signed = { signoff: { decision: "signed_off" } };
const declined = { signoff: { decision: "declined" } };

describe("defaultReviewedPosition", () => {
  it("opens on the first undecided version besides the baseline", () => {
    expect(defaultReviewedPosition([open, open, open], 0)).toBe(1);
    expect(defaultReviewedPosition([open, signed, open], 0)).toBe(2);
    expect(defaultReviewedPosition([open, open, open], 1)).toBe(0);
  });

  it("falls back to the first version besides the baseline when all are decided", () => {
    expect(defaultReviewedPosition([signed, declined, signed], 0)).toBe(1);
    expect(defaultReviewedPosition([signed, declined], 1)).toBe(0);
  });

  it("an undecided baseline is not chosen while any other version is there", () => {
    expect(defaultReviewedPosition([signed, signed, signed, open], 3)).toBe(0);
    expect(defaultReviewedPosition([signed, signed, declined, open], 2)).toBe(3);
  });
});

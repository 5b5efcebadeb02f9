// Steady periods and the gaps between them, on invented weekly and numbered histories.
import { describe, expect, it } from "vitest";
import { describeCoverage, periodCoverage } from "@/server/datasets/period-coverage";

const weeks = (count: number, skip: number[] = []) =>
  Array.from({ length: count }, (_, index) => new Date(Date.UTC(2024, 0, 1 + 7 * index)).toISOString().slice(0, 10)).filter((_, index) => !skip.includes(index));

describe("periodCoverage", () => {
  it("a full weekly history: a 7-day step and no gaps", () => {
    const coverage = periodCoverage(weeks(52))!;
    expect(coverage).toEqual({ step: 7, unit: "days", gaps: [], missing: 0 });
    expect(describeCoverage(coverage)).toBe("One row every week (7 days), no gaps.");
  });

  it("finds each run of missing weeks and counts them", () => {
    const coverage = periodCoverage(weeks(52, [10, 30, 31, 32]))!;
    expect(coverage.step).toBe(7);
    expect(coverage.gaps).toEqual([
      { after: "2024-03-04", before: "2024-03-18", missing: 1 },
      { after: "2024-07-22", before: "2024-08-19", missing: 3 },
    ]);
    expect(coverage.missing).toBe(4);
    expect(describeCoverage(coverage)).toMatch(/^One row every week \(7 days\), except 2 gaps \(4 periods missing\): 1 missing between 2024-03-04 and 2024-03-18; 3 missing between 2024-07-22 and 2024-08-19\. Fits treat/);
  });

  it("numbered periods, and too little to judge", () => {
    expect(periodCoverage(["1", "2", "3", "5", "6"])).toEqual({ step: 1, unit: "periods", gaps: [{ after: "3", before: "5", missing: 1 }], missing: 1 });
    expect(periodCoverage(["2024-01-01", "2024-01-08"])).toBeNull();
  });
});

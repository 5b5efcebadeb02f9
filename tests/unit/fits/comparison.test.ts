// Fits side by side, on reports the real engine computed: which figures are ranked (only fits of the
// same rows), the union of terms, terms a fit leaves out, and terms whose estimate shifts when a
// correlated term is dropped (a textbook omitted-variable effect; common practice to flag it).
import { describe, expect, it } from "vitest";
import { compareFits } from "@/server/fits/comparison";
import { computeFit } from "@/server/fits/compute";
import type { FitDto } from "@/server/fits/types";
import type { ModelSpecification } from "@/server/stats";
import { createRandom } from "../stats/support/random";

function data(seed: number) {
  const random = createRandom(seed);
  const n = 120;
  const video = Array.from({ length: n }, () => 10_000 + 20_000 * random.uniform());
  // Display is bought with video: strongly correlated, as in the demo company.
  const display = video.map((value) => 0.5 * value + 2_000 * random.normal());
  const search = Array.from({ length: n }, () => 5_000 + 15_000 * random.uniform());
  const sales = video.map((value, row) => 40_000 + 2 * value + 0.5 * display[row] + 3 * search[row] + 4_000 * random.normal());
  return { sales, video, display, search };
}

function fitDto(id: string, datasetId: string, columns: ReturnType<typeof data>, channels: string[]): FitDto {
  const specification: ModelSpecification = { outcome: "sales", intercept: true, terms: channels.map((column) => ({ kind: "linear" as const, column })) };
  const { report } = computeFit({ specification, columns, level: 0.95, covariance: { type: "classical" }, periodColumn: null, periodLabels: null, units: { sales: "EUR" } });
  return { id, name: `Fit ${id}`, status: "draft", datasetId, datasetName: "History", report } as unknown as FitDto;
}

describe("compareFits", () => {
  const columns = data(3);
  const full = fitDto("a", "d1", columns, ["video", "display", "search"]);
  const withoutVideo = fitDto("b", "d1", columns, ["display", "search"]);

  it("ranks AIC, BIC, σ and adjusted R² only between fits of the same rows, and says which is better", () => {
    const comparison = compareFits([full, withoutVideo]);
    expect(comparison.sameRows).toBe(true);
    const aic = comparison.summary.find((row) => row.key === "aic")!;
    expect(aic.values).toEqual([full.report.aic, withoutVideo.report.aic]);
    expect(aic.best).toBe(full.report.aic < withoutVideo.report.aic ? 0 : 1);
    expect(aic.best).toBe(0); // leaving out a real driver costs fit
    const adjusted = comparison.summary.find((row) => row.key === "adjRSquared")!;
    expect(adjusted.best).toBe(0);
    expect(comparison.summary.find((row) => row.key === "rSquared")!.best).toBeNull(); // R² always favours more terms: not ranked

    const elsewhere = compareFits([full, fitDto("c", "d2", data(4), ["video", "display", "search"])]);
    expect(elsewhere.sameRows).toBe(false);
    expect(elsewhere.summary.filter((row) => row.best !== null)).toEqual([]);
  });

  it("lists every term once in order of appearance, marks terms a fit leaves out, and names terms that take another's credit", () => {
    const comparison = compareFits([withoutVideo, full]);
    expect(comparison.terms.map((row) => row.term)).toEqual(["(Intercept)", "display", "search", "video"]);
    const video = comparison.terms.find((row) => row.term === "video")!;
    expect(video.cells[0]).toBeNull();
    expect(video.cells[1]!.estimate).toBe(full.report.coefficients.find((row) => row.term === "video")!.estimate);
    // Without video, display carries video's association too: its estimate jumps.
    expect(comparison.shiftingTerms).toContain("display");
    expect(comparison.shiftingTerms).not.toContain("search");
    expect(comparison.shiftingTerms).not.toContain("(Intercept)");
  });
});

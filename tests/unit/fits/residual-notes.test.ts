// The fit report's plain words on the residual tests: which remedy is offered under which
// standard errors, and nothing for reports stored before the tests existed. The 5% line is common practice.
import { describe, expect, it } from "vitest";
import type { FitReport } from "@/server/fits/types";
import { normalityNote, unequalVarianceNote } from "@/ui/fits/fit-summary";

const tests = (bpP: number, jbP: number): NonNullable<FitReport["residualTests"]> => ({
  heteroskedasticity: { statistic: 20, df: 7, pValue: bpP },
  normality: { statistic: 9, pValue: jbP, skewness: 0.8, kurtosis: 4.1 },
});
const classical = { type: "classical" as const, lag: null };

describe("unequalVarianceNote", () => {
  it("under classical standard errors, a small p-value suggests HC3 and warns about prediction intervals", () => {
    const note = unequalVarianceNote({ residualTests: tests(0.003, 0.5), covariance: classical })!;
    expect(note.tone).toBe("warning");
    expect(note.text).toMatch(/p-value 0\.003/);
    expect(note.text).toMatch(/refit with HC3/);
    expect(note.text).toMatch(/Prediction intervals still assume one spread/);
  });

  it("under HC3 or Newey–West, says the standard errors already allow for it", () => {
    expect(unequalVarianceNote({ residualTests: tests(0.003, 0.5), covariance: { type: "hc3", lag: null } })!.text).toMatch(/HC3 standard errors allow for it/);
    expect(unequalVarianceNote({ residualTests: tests(0.003, 0.5), covariance: { type: "newey-west", lag: 4 } })!.text).toMatch(/Newey–West standard errors allow for it/);
  });

  it("at 5% or more, no sign; without the test (older reports, no intercept), nothing", () => {
    expect(unequalVarianceNote({ residualTests: tests(0.05, 0.5), covariance: classical })!.tone).toBe("ok");
    expect(unequalVarianceNote({ covariance: classical })).toBeNull();
    expect(unequalVarianceNote({ residualTests: { heteroskedasticity: null, normality: null }, covariance: classical })).toBeNull();
  });
});

describe("normalityNote", () => {
  it("names skewness and kurtosis against the normal's 0 and 3, and warns about the prediction intervals' ends", () => {
    const note = normalityNote({ residualTests: tests(0.5, 0.01) })!;
    expect(note.tone).toBe("warning");
    expect(note.text).toMatch(/skewness 0\.80, kurtosis 4\.10; normal errors have 0 and 3/);
    expect(note.text).toMatch(/prediction intervals rely on it/);
    expect(normalityNote({ residualTests: tests(0.5, 0.2) })!.tone).toBe("ok");
    expect(normalityNote({})).toBeNull();
  });
});

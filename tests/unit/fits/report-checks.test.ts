// The reviewer's run-down on real reports: the demo history's fit (video and display bought together,
// display's estimate negative) and the same history with one bad row typed in. Thresholds (VIF 10,
// Cook's distance 1, 5% p-values) are common practice.
import { describe, expect, it } from "vitest";
import { periodCoverage } from "@/server/datasets/period-coverage";
import { computeFit } from "@/server/fits/compute";
import type { FitReport } from "@/server/fits/types";
import { demoChannels, demoControl, generateDemoHistory } from "@/seed/history";
import { checksSummary, reportChecks } from "@/ui/fits/report-checks";

const spend = demoChannels.map((channel) => channel.column);

function demoReport(edit?: (columns: Record<string, number[]>) => void): FitReport {
  const rows = generateDemoHistory();
  const columns: Record<string, number[]> = {};
  for (const name of [...spend, demoControl.column, "sales_eur"]) columns[name] = rows.map((row) => row[name as keyof typeof row] as number);
  edit?.(columns);
  return computeFit({
    specification: { outcome: "sales_eur", intercept: true, terms: [...spend.map((column) => ({ kind: "linear" as const, column })), { kind: "control" as const, column: demoControl.column }] },
    columns,
    level: 0.95,
    covariance: { type: "classical" },
    periodColumn: "week_start",
    periodLabels: rows.map((row) => row.week_start),
    units: { sales_eur: "EUR" },
  }).report;
}

const byKey = (report: FitReport) => Object.fromEntries(reportChecks(report, spend, "en-IE").map((check) => [check.key, check]));

describe("reportChecks", () => {
  it("on the demo fit: collinearity and display's negative estimate to look at, the rest fine", () => {
    const checks = byKey(demoReport());
    expect(checks.collinearity).toMatchObject({ status: "look", anchor: "#collinearity" });
    expect(checks.collinearity.text).toMatch(/video_eur \(VIF 18\.\d\), display_eur \(VIF 18\.\d\) above 10/);
    expect(checks["spend-signs"].status).toBe("look");
    expect(checks["spend-signs"].text).toMatch(/^display_eur \(-0\.\d+, interval -3\.\d+ to 2\.\d+\)/);
    for (const key of ["periods", "autocorrelation", "variance", "normality", "holdout", "influence"]) expect(checks[key].status, key).toBe("ok");
    expect(checks.holdout.text).toMatch(/of the latest 13 fell inside/);
  });

  it("names a row that alone moves the estimates (Cook's distance above 1)", () => {
    const checks = byKey(
      demoReport((columns) => {
        // A typing slip: ten times the usual search spend and a tenth of the sales in one week.
        columns.search_eur[40] *= 10;
        columns.sales_eur[40] /= 10;
      }),
    );
    expect(checks.influence.status).toBe("look");
    expect(checks.influence.text).toMatch(/\(data row 41\), above 1/);
  });

  it("points at missing weeks, which the time-order figures take no account of", () => {
    const labels = generateDemoHistory().map((row) => row.week_start);
    const gapped = periodCoverage([...labels.slice(0, 50), ...labels.slice(53)]);
    const checks = byKey({ ...demoReport(), periodCoverage: gapped });
    expect(checks.periods.status).toBe("look");
    expect(checks.periods.text).toBe(
      `3 periods are missing in 1 gap (first after ${labels[49]}): Durbin–Watson, Newey–West and the held-out check take neighbouring rows as neighbouring periods.`,
    );
    expect(byKey({ ...demoReport(), periodCoverage: null }).periods).toBeUndefined(); // no period column: nothing to say
  });

  it("says a check is missing on a report stored before it existed", () => {
    const { residualTests: _residualTests, holdout: _holdout, periodCoverage: _coverage, ...older } = demoReport();
    const checks = byKey(older as FitReport);
    expect(checks.periods.status).toBe("unknown");
    expect(checks.variance.status).toBe("unknown");
    expect(checks.normality.status).toBe("unknown");
    expect(checks.holdout.status).toBe("unknown");
    expect(checks.autocorrelation.status).toBe("ok");
  });
});

describe("checksSummary", () => {
  const checks = (...statuses: ("ok" | "look" | "unknown")[]) => statuses.map((status) => ({ status }));

  it("counts the checks to look at, before approving while undecided", () => {
    expect(checksSummary(checks("ok", "look", "unknown", "look"), false)).toBe("2 things to look at before approving.");
    expect(checksSummary(checks("look", "ok"), false)).toBe("1 thing to look at before approving.");
  });

  it("speaks of reading the numbers once the fit is approved or retired", () => {
    expect(checksSummary(checks("look", "look"), true)).toBe("2 things to keep in mind when reading this fit's numbers.");
  });

  it("says nothing stands out when no check needs a look, whatever the status", () => {
    expect(checksSummary(checks("ok", "unknown"), false)).toBe("Nothing stands out in these checks.");
    expect(checksSummary(checks("ok"), true)).toBe("Nothing stands out in these checks.");
  });
});

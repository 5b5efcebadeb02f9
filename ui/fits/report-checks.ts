// The checks a reviewer runs down before approving a fit, each from numbers the report already has,
// in plain words with the section to read. Thresholds are common practice: VIF 5 and 10, Cook's
// distance 1, p-values 5%.
import type { FitReport } from "@/server/fits/types";
import { collinearityWarnings } from "./collinearity-section";
import { durbinWatsonNote, normalityNote, unequalVarianceNote } from "./fit-summary";
import { formatNumber } from "./format";

export type ReportCheck = {
  key: "collinearity" | "periods" | "autocorrelation" | "variance" | "normality" | "holdout" | "influence" | "spend-signs";
  label: string;
  /** "look": something to read before approving; "unknown": the report predates the check. */
  status: "ok" | "look" | "unknown";
  text: string;
  /** Anchor of the report section with the details. */
  anchor: string;
};

const fromNote = (note: { tone: "ok" | "warning"; text: string } | null): Pick<ReportCheck, "status" | "text"> =>
  note ? { status: note.tone === "warning" ? "look" : "ok", text: note.text } : { status: "unknown", text: "Not computed for this fit: refit it to see this check." };

export function reportChecks(report: FitReport, spendColumns: readonly string[], locale: string): ReportCheck[] {
  const checks: ReportCheck[] = [];

  const collinear = collinearityWarnings(report);
  const serious = collinear.filter((warning) => warning.level === 10);
  checks.push({
    key: "collinearity",
    label: "Collinearity",
    anchor: "#collinearity",
    ...(collinear.length === 0
      ? { status: "ok", text: "No variance inflation factor above 5." }
      : {
          status: "look",
          text: `${(serious.length > 0 ? serious : collinear).map((warning) => `${warning.term} (VIF ${formatNumber(warning.vif, locale, 3)})`).join(", ")} ${
            serious.length > 0 ? "above 10" : "above 5"
          }: their separate estimates are unstable; read their split with care.`,
        }),
  });

  const coverage = report.periodCoverage;
  if (coverage !== null) {
    checks.push({
      key: "periods",
      label: "Periods",
      anchor: "#diagnostics",
      ...(coverage === undefined
        ? { status: "unknown", text: "Not computed for this fit: refit it to see this check." }
        : coverage.gaps.length === 0
          ? { status: "ok", text: "One row per period, no gaps." }
          : {
              status: "look",
              text: `${coverage.missing} ${coverage.missing === 1 ? "period is" : "periods are"} missing in ${coverage.gaps.length} ${coverage.gaps.length === 1 ? "gap" : "gaps"} (first after ${coverage.gaps[0].after}): Durbin–Watson, Newey–West and the held-out check take neighbouring rows as neighbouring periods.`,
            }),
    });
  }
  checks.push({ key: "autocorrelation", label: "Autocorrelation", anchor: "#summary", ...fromNote(durbinWatsonNote(report)) });
  checks.push({ key: "variance", label: "Unequal variance", anchor: "#summary", ...fromNote(unequalVarianceNote(report)) });
  checks.push({ key: "normality", label: "Normal errors", anchor: "#summary", ...fromNote(normalityNote(report)) });

  const holdout = report.holdout;
  checks.push({
    key: "holdout",
    label: "Held-out periods",
    anchor: "#holdout",
    ...(!holdout
      ? { status: "unknown", text: "Not computed for this fit: refit it to see this check." }
      : holdout.status === "skipped"
        ? { status: "unknown", text: `Not run: ${holdout.reason}` }
        : {
            status: holdout.fewerInsideThanExpected ? "look" : "ok",
            text: `${holdout.inside} of the latest ${holdout.periods} fell inside the prediction intervals of a refit without them${
              holdout.fewerInsideThanExpected ? ": fewer than such intervals should hold." : "."
            }`,
          }),
  });

  const maxCooks = report.diagnostics.maxCooks;
  const points = report.diagnostics.points;
  const worst = maxCooks === null ? -1 : points.cooks.findIndex((value) => value === maxCooks);
  const where = worst >= 0 ? ` (data row ${points.row[worst]})` : "";
  checks.push({
    key: "influence",
    label: "Influential rows",
    anchor: "#diagnostics",
    ...(maxCooks !== null && maxCooks > 1
      ? { status: "look", text: `The largest Cook's distance is ${formatNumber(maxCooks, locale, 3)}${where}, above 1: that row alone moves the estimates. Check it for an error or an event the model should know about.` }
      : { status: "ok", text: `No row has a Cook's distance above 1 (largest ${formatNumber(maxCooks, locale, 2)}${where}).` }),
  });

  const negative = report.coefficients.filter(
    (row) => (row.kind === "linear" || row.kind === "log1p") && row.columns.some((column) => spendColumns.includes(column)) && row.estimate !== null && row.estimate < 0,
  );
  checks.push({
    key: "spend-signs",
    label: "Spend with a negative estimate",
    anchor: "#coefficients",
    ...(negative.length === 0
      ? { status: "ok", text: "Every spend channel's estimate is positive or zero." }
      : {
          status: "look",
          text: `${negative
            .map((row) => `${row.term} (${formatNumber(row.estimate, locale, 3)}, interval ${formatNumber(row.ciLow, locale, 3)} to ${formatNumber(row.ciHigh, locale, 3)})`)
            .join(", ")}: more spend going with lower sales usually means collinearity or a missing control, seldom a real effect.`,
        }),
  });

  return checks;
}

/** The run-down's first line: how many checks to look at, before approving or, once decided, when reading the numbers. */
export function checksSummary(checks: readonly Pick<ReportCheck, "status">[], decided: boolean): string {
  const toLook = checks.filter((check) => check.status === "look").length;
  if (toLook === 0) return "Nothing stands out in these checks.";
  const things = `${toLook} ${toLook === 1 ? "thing" : "things"}`;
  return decided ? `${things} to keep in mind when reading this fit's numbers.` : `${things} to look at before approving.`;
}

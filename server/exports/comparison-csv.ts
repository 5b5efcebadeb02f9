import "server-only";
import type { ComparisonDto } from "@/server/comparisons/types";
import { type CsvCell, toCsv } from "@/server/datasets/csv-export";
import type { Money } from "./format";

/**
 * A comparison as CSV, one row per version (its column position first), with the exact numbers of
 * the view: spend per channel and total, the predicted horizon total with its confidence and
 * prediction intervals, the difference from the baseline with its own interval (empty when the fits
 * differ), warnings, the fit and its approval, the sign-off. Cells go through the datasets module's
 * `toCsv`, which writes numbers as numbers and makes text that starts with = + - @ inert.
 */
export function comparisonCsv(comparison: ComparisonDto, money: Money): string {
  const channelHeaders = comparison.channels.map((channel) => `Spend: ${channel.label} (${money.currency})`);
  const header: CsvCell[] = [
    "Position",
    "Baseline",
    "Scenario",
    "Scenario id",
    "Version",
    "Version note",
    "Saved by",
    "Saved at",
    "Horizon",
    "Period",
    "Mode",
    ...channelHeaders,
    `Total spend (${money.currency})`,
    "Outcome",
    "Outcome unit",
    "Predicted total",
    "Interval level",
    "Confidence interval low",
    "Confidence interval high",
    "Prediction interval low",
    "Prediction interval high",
    "Difference from baseline",
    "Difference interval low",
    "Difference interval high",
    "Difference note",
    "Warnings",
    "Fit",
    "Fit id",
    "Fit status",
    "Fit approved by",
    "Fit approved at",
    "Sign-off",
    "Signed off or declined by",
    "Decided at",
    "Reason",
  ];
  const rows: CsvCell[][] = comparison.columns.map((column) => {
    const difference = column.difference;
    return [
      column.position + 1,
      column.position === comparison.baselinePosition ? "yes" : "no",
      column.scenarioName,
      column.scenarioId,
      column.version,
      column.note,
      column.savedByName,
      column.savedAt,
      column.horizon,
      column.periodNoun,
      column.mode,
      ...comparison.channels.map((channel) => column.allocation[channel.name] ?? null),
      column.totalSpend,
      column.outcomeShape.label,
      column.outcomeShape.unit,
      column.outcome.mean,
      column.level,
      column.outcome.confidence[0],
      column.outcome.confidence[1],
      column.outcome.prediction[0],
      column.outcome.prediction[1],
      difference.kind === "joint" ? difference.mean : difference.kind === "baseline" ? 0 : null,
      difference.kind === "joint" ? difference.confidence[0] : null,
      difference.kind === "joint" ? difference.confidence[1] : null,
      difference.kind === "none" ? difference.reason : difference.kind === "baseline" ? "Baseline" : difference.horizonsDiffer ? "Horizons differ" : "",
      column.warnings.map((warning) => warning.message).join(" | "),
      column.fit.name,
      column.fit.id,
      column.fit.status,
      column.fit.approvedByName,
      column.fit.approvedAt,
      column.signoff ? (column.signoff.decision === "signed_off" ? "Signed off" : "Declined") : "Not signed off",
      column.signoff?.decidedByName ?? null,
      column.signoff?.decidedAt ?? null,
      column.signoff?.reason || null,
    ];
  });
  return toCsv([header, ...rows], { bom: true });
}

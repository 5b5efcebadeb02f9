import Link from "next/link";
import type { ComparisonColumnDto, ComparisonDto } from "@/server/comparisons/types";
import type { MoneyLocale } from "@/server/planning/allocation";
import { IntervalRow, intervalDomain } from "@/ui/charts/interval-row";
import { formatMoney } from "@/ui/scenario/format";
import { dateText, levelText, outcomeText, signedOutcomeText } from "./format";
import { SignoffBadge } from "./signoff-badge";
import { textLinkClass } from "@/ui/button-class";

const fitStatusWords: Record<string, string> = {
  approved: "approved",
  retired: "retired",
  draft: "draft",
  in_review: "in review",
  changes_requested: "changes requested",
};

function channelWarning(column: ComparisonColumnDto, channel: string): string | null {
  const warning = column.warnings.find((item) => item.kind === "outside-range" && item.column === channel);
  return warning ? warning.message : null;
}

const th = "py-2 pr-4 text-left align-top text-xs font-medium text-slate-600";
const td = "py-2 pr-4 align-top";

/**
 * The versions as columns: spend per channel and total, the predicted horizon total with both
 * intervals (numbers and the drawing on one scale), the difference from the baseline with its own
 * interval (or why there is none), warnings (ember edge and the sentence, never colour alone), the fit
 * and its approval, the sign-off.
 */
export function ComparisonTable({ comparison, money }: { comparison: ComparisonDto; money: MoneyLocale }) {
  const { columns } = comparison;
  const baseline = columns[comparison.baselinePosition];
  const outcomeLabel = columns[0].outcomeShape.label;
  const domain = intervalDomain(columns.flatMap((column) => [...column.outcome.prediction, column.outcome.mean]), null);
  const money0 = (amount: number) => formatMoney(amount, money);
  return (
    <div className="overflow-x-auto print:overflow-visible">
      <table className="num w-full min-w-[44rem] border-collapse text-sm" data-testid="comparison-table">
        <thead>
          <tr className="border-b border-slate-200">
            <th scope="col" className={`${th} w-48`}>
              <span className="sr-only">Measure</span>
            </th>
            {columns.map((column) => (
              <th key={column.position} scope="col" className={`${th} text-sm`} data-testid="comparison-column" data-version={column.version}>
                <div className="space-y-1">
                  <Link href={`/scenarios/${column.scenarioId}?version=${column.version}#review`} className="font-semibold text-river hover:underline">
                    {column.scenarioName}
                  </Link>{" "}
                  <span className="font-semibold text-river">v{column.version}</span>
                  {column.position === comparison.baselinePosition ? (
                    <span className="ml-2 rounded-full bg-river px-2 py-0.5 text-xs font-semibold text-white">Baseline</span>
                  ) : null}
                  <div>
                    <SignoffBadge signoff={column.signoff} version={column.version} locale={money.locale} />
                  </div>
                  <p className="font-normal text-slate-600">
                    Saved by {column.savedByName ?? "—"}, {dateText(column.savedAt, money.locale)}
                  </p>
                  {column.note ? <p className="font-normal italic text-slate-600">“{column.note}”</p> : null}
                  {column.latestVersion > column.version && !columns.some((other) => other.scenarioId === column.scenarioId && other.version === column.latestVersion) ? (
                    <p className="font-normal text-slate-700">A later version ({column.latestVersion}) of this scenario exists.</p>
                  ) : null}
                </div>
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          <tr>
            <th scope="rowgroup" colSpan={columns.length + 1} className="pb-1 pt-4 text-left text-xs font-semibold uppercase tracking-wide text-river">
              Spend over the horizon ({money.currency})
            </th>
          </tr>
          {comparison.channels.map((channel) => (
            <tr key={channel.name} className="border-t border-slate-100" data-testid="spend-row" data-channel={channel.name}>
              <th scope="row" className={th}>
                {channel.label}
              </th>
              {columns.map((column) => {
                const warning = channelWarning(column, channel.name);
                const amount = column.allocation[channel.name];
                return (
                  <td key={column.position} className={`${td} ${warning ? "border-l-4 border-ember pl-2" : ""}`}>
                    {amount === undefined ? "—" : money0(amount)}
                    {warning ? <span className="block text-xs text-[#9f3f2c]">Beyond observed range</span> : null}
                  </td>
                );
              })}
            </tr>
          ))}
          <tr className="border-t border-slate-300 font-semibold">
            <th scope="row" className={`${th} font-semibold text-slate-800`}>
              Total spend
            </th>
            {columns.map((column) => (
              <td key={column.position} className={td} data-testid="total-spend">
                {money0(column.totalSpend)}
                <span className="block text-xs font-normal text-slate-600">
                  over {column.horizon} {column.periodNoun}s ({column.mode === "fixed" ? "fixed total" : "growing total"})
                </span>
              </td>
            ))}
          </tr>

          <tr>
            <th scope="rowgroup" colSpan={columns.length + 1} className="pb-1 pt-5 text-left text-xs font-semibold uppercase tracking-wide text-river">
              Predicted {outcomeLabel.toLowerCase()} over the horizon
            </th>
          </tr>
          <tr className="border-t border-slate-100">
            <th scope="row" className={th}>
              Expected total
            </th>
            {columns.map((column) => (
              <td key={column.position} className={td} data-testid="predicted-total" data-value={column.outcome.mean}>
                <span className="text-lg font-semibold text-river">{outcomeText(column.outcome.mean, column.outcomeShape, money)}</span>
                <IntervalRow
                  domain={domain}
                  point={column.outcome.mean}
                  confidence={column.outcome.confidence}
                  prediction={column.outcome.prediction}
                  reference={baseline.outcome.mean}
                  width={190}
                  height={24}
                  tone={column.warnings.length > 0 ? "warning" : "normal"}
                  label={`${column.scenarioName} v${column.version}: ${outcomeText(column.outcome.mean, column.outcomeShape, money)}`}
                />
              </td>
            ))}
          </tr>
          <tr className="border-t border-slate-100">
            <th scope="row" className={th}>
              Confidence interval
              <span className="block font-normal">the expected total</span>
            </th>
            {columns.map((column) => (
              <td key={column.position} className={td} data-testid="confidence-interval">
                {levelText(column.level)}: {outcomeText(column.outcome.confidence[0], column.outcomeShape, money)} to {outcomeText(column.outcome.confidence[1], column.outcomeShape, money)}
              </td>
            ))}
          </tr>
          <tr className="border-t border-slate-100">
            <th scope="row" className={th}>
              Prediction interval
              <span className="block font-normal">what may actually happen</span>
            </th>
            {columns.map((column) => (
              <td key={column.position} className={td} data-testid="prediction-interval">
                {levelText(column.level)}: {outcomeText(column.outcome.prediction[0], column.outcomeShape, money)} to {outcomeText(column.outcome.prediction[1], column.outcomeShape, money)}
              </td>
            ))}
          </tr>
          <tr className="border-t border-slate-100">
            <th scope="row" className={th}>
              Difference from the baseline
              <span className="block font-normal">
                {baseline.scenarioName} v{baseline.version}, expected totals
              </span>
            </th>
            {columns.map((column) => {
              const difference = column.difference;
              return (
                <td key={column.position} className={td} data-testid="difference" data-kind={difference.kind}>
                  {difference.kind === "baseline" ? (
                    <span className="text-slate-600">Baseline</span>
                  ) : difference.kind === "none" ? (
                    <span className="text-slate-800">{difference.reason}</span>
                  ) : (
                    <>
                      <span className="font-semibold">{signedOutcomeText(difference.mean, column.outcomeShape, money)}</span>
                      <span className="block text-xs text-slate-600">
                        {levelText(difference.level)} confidence interval {signedOutcomeText(difference.confidence[0], column.outcomeShape, money)} to{" "}
                        {signedOutcomeText(difference.confidence[1], column.outcomeShape, money)}
                        {difference.confidence[0] < 0 && difference.confidence[1] > 0 ? ": it includes no difference at all" : ""}
                        {difference.horizonsDiffer ? " (the horizons differ)" : ""}
                      </span>
                    </>
                  )}
                </td>
              );
            })}
          </tr>

          <tr>
            <th scope="rowgroup" colSpan={columns.length + 1} className="pb-1 pt-5 text-left text-xs font-semibold uppercase tracking-wide text-river">
              Warnings, fit and sign-off
            </th>
          </tr>
          <tr className="border-t border-slate-100">
            <th scope="row" className={th}>
              Warnings
            </th>
            {columns.map((column) => (
              <td key={column.position} className={`${td} ${column.warnings.length > 0 ? "border-l-4 border-ember pl-2" : ""}`} data-testid="warnings">
                {column.warnings.length === 0 ? (
                  <span className="text-slate-600">None: every channel inside the spend it was fitted on.</span>
                ) : (
                  <ul className="space-y-1 text-xs text-slate-900">
                    {column.warnings.map((warning, index) => (
                      <li key={index}>
                        <strong className="font-semibold text-[#9f3f2c]">{warning.kind === "outside-range" ? "Beyond observed range" : "Unseen combination"}:</strong> {warning.message}
                      </li>
                    ))}
                    <li className="text-slate-600">The model has no data here; treat the number as a guess.</li>
                  </ul>
                )}
              </td>
            ))}
          </tr>
          <tr className="border-t border-slate-100">
            <th scope="row" className={th}>
              Fit
            </th>
            {columns.map((column) => (
              <td key={column.position} className={td} data-testid="fit">
                <Link href={`/fits/${column.fit.id}`} className={textLinkClass}>
                  {column.fit.name}
                </Link>{" "}
                <span className="text-xs text-slate-600">({fitStatusWords[column.fit.status] ?? column.fit.status})</span>
                <span className="block text-xs text-slate-700">
                  {column.fit.approvedByName ? `Approved by ${column.fit.approvedByName} on ${dateText(column.fit.approvedAt, money.locale, true)}` : "Not approved"}
                </span>
              </td>
            ))}
          </tr>
        </tbody>
      </table>
    </div>
  );
}

import type { FitReport } from "@/server/fits/types";
import { formatInUnit, formatPercent } from "./format";

/**
 * The held-out check of a fit report: the latest rows predicted by a refit without them, against
 * their prediction intervals. Reports stored before the check existed show a line saying so.
 */
export function HoldoutSection({ report, locale }: { report: FitReport; locale: string }) {
  const check = report.holdout;
  if (!check) {
    return <p className="text-sm text-slate-700">This fit was built before the held-out check existed; refit it to see one.</p>;
  }
  if (check.status === "skipped") {
    return (
      <p className="text-sm text-slate-700" data-testid="holdout-skipped">
        No held-out check: {check.reason}
      </p>
    );
  }
  const unit = report.units[report.outcome] ?? null;
  const money = (value: number) => formatInUnit(value, unit, locale, 4);
  const levelText = `${Math.round(check.level * 1000) / 10}%`;
  const expected = Math.round(check.periods * check.level * 10) / 10;
  const order = report.periodColumn ? `in ${report.periodColumn} order` : "in file order";
  return (
    <div>
      <p className="text-sm text-slate-800" data-testid="holdout-summary">
        Refitted on the first {check.trainedOn.toLocaleString(locale)} rows ({order}), the model predicted the latest {check.periods}:{" "}
        <strong>
          {check.inside} of {check.periods}
        </strong>{" "}
        actual values fell inside their {levelText} prediction intervals (about {expected.toLocaleString(locale)} expected). Mean absolute error{" "}
        {money(check.meanAbsoluteError)}
        {check.meanAbsolutePercentageError === null ? "" : ` (${formatPercent(check.meanAbsolutePercentageError, locale)} of the actual values)`}; root mean squared
        error {money(check.rootMeanSquaredError)}.
      </p>
      {check.fewerInsideThanExpected ? (
        <p className="mt-2 rounded-md border-l-4 border-ember bg-white px-3 py-2 text-sm text-slate-900" data-testid="holdout-warning">
          <strong className="text-ember">Fewer inside than the intervals promise: </strong>
          intervals of this level would rarely do this badly. The latest rows differ from the history the model learned from, or its intervals are too narrow;
          read the intervals of plans on this fit with care.
        </p>
      ) : null}
      <table className="num mt-3 w-full text-sm" data-testid="holdout-table">
        <thead>
          <tr className="text-left text-xs text-slate-600">
            <th className="py-1 pr-4 font-medium">{report.periodColumn ?? "Row"}</th>
            <th className="py-1 pr-4 text-right font-medium">Actual</th>
            <th className="py-1 pr-4 text-right font-medium">Predicted</th>
            <th className="py-1 pr-4 text-right font-medium">{levelText} prediction interval</th>
            <th className="py-1 font-medium">Inside</th>
          </tr>
        </thead>
        <tbody>
          {check.rows.map((row, index) => (
            <tr key={row.label ?? index} className="border-t border-slate-100" data-testid="holdout-row" data-inside={row.inside}>
              <td className="py-1.5 pr-4">{row.label ?? check.trainedOn + index + 1}</td>
              <td className="py-1.5 pr-4 text-right">{money(row.actual)}</td>
              <td className="py-1.5 pr-4 text-right">{money(row.predicted)}</td>
              <td className="py-1.5 pr-4 text-right">
                {money(row.lower)} to {money(row.upper)}
              </td>
              <td className={`py-1.5 ${row.inside ? "text-slate-700" : "font-medium text-ember"}`}>
                {row.inside ? "yes" : row.actual > row.upper ? "no, above" : "no, below"}
                {row.extrapolating ? <span className="ml-1 text-xs text-slate-600">(beyond the earlier rows)</span> : null}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      <p className="mt-2 text-xs text-slate-600">
        A guide to how far the intervals hold on periods the model has not seen, not a guarantee: the coming quarter&apos;s market may differ again.
      </p>
    </div>
  );
}

import { IntervalRow, intervalDomain } from "@/ui/charts";
import type { CoefficientRow, FitReport } from "@/server/fits/types";
import { formatNumber, formatPValue, unitLabel } from "./format";

/** What one unit of the term means, e.g. "EUR of sales per EUR of search_eur". */
function perUnit(row: CoefficientRow, report: FitReport): string {
  const outcomeUnit = unitLabel(report.units[report.outcome]);
  const unitOf = (column: string) => report.units[column] ?? "unit";
  switch (row.kind) {
    case "intercept":
      return `${outcomeUnit} when every term is 0`;
    case "linear":
    case "control":
      return `${outcomeUnit} per ${unitOf(row.columns[0])}`;
    case "log1p":
      return `${outcomeUnit} per unit of log(1 + ${row.columns[0]})`;
    case "interaction":
      return `${outcomeUnit} per ${unitOf(row.columns[0])} × ${unitOf(row.columns[1])}`;
    default:
      return outcomeUnit;
  }
}

/** Rows whose estimates share a unit share the interval scale, so their intervals compare by eye. */
function domainKey(row: CoefficientRow, report: FitReport): string | null {
  if (row.kind === "linear") return `linear:${report.units[row.columns[0]] ?? ""}`;
  return null;
}

export function CoefficientTable({ report, locale }: { report: FitReport; locale: string }) {
  const levelPercent = Math.round(report.level * 1000) / 10;
  const groups = new Map<string, CoefficientRow[]>();
  for (const row of report.coefficients) {
    const key = domainKey(row, report);
    if (key) groups.set(key, [...(groups.get(key) ?? []), row]);
  }
  const domainOf = (row: CoefficientRow) => {
    const key = domainKey(row, report);
    const rows = key ? groups.get(key)! : [row];
    return intervalDomain(rows.flatMap((r) => [r.ciLow, r.ciHigh, r.estimate]), 0);
  };
  return (
    <div className="overflow-x-auto">
      <table className="w-full min-w-[900px] text-sm" data-testid="coefficient-table">
        <thead>
          <tr className="border-b border-slate-300 text-left text-xs uppercase tracking-wide text-slate-600">
            <th scope="col" className="py-2 pr-3 font-semibold">Term</th>
            <th scope="col" className="py-2 pr-3 text-right font-semibold">Estimate</th>
            <th scope="col" className="py-2 pr-3 text-right font-semibold">Std. error</th>
            <th scope="col" className="py-2 pr-3 text-right font-semibold">t</th>
            <th scope="col" className="py-2 pr-3 text-right font-semibold">p-value</th>
            <th scope="col" className="py-2 pr-3 text-right font-semibold">{levelPercent}% interval</th>
            <th scope="col" className="py-2 pr-3 text-right font-semibold">VIF</th>
            <th scope="col" className="py-2 font-semibold">
              Interval <span className="normal-case tracking-normal text-slate-600">(dashed line: zero)</span>
            </th>
          </tr>
        </thead>
        <tbody>
          {report.coefficients.map((row) => {
            const vifWarning = row.vif !== null && row.vif > 5;
            return (
              <tr key={row.term} className={`border-b border-slate-100 align-middle ${vifWarning ? "border-l-4 border-l-ember" : ""}`} data-term={row.term}>
                <th scope="row" className="py-2 pr-3 text-left font-medium text-slate-900">
                  <span className="font-mono text-[13px]">{row.term}</span>
                  <span className="block text-xs font-normal text-slate-600">{perUnit(row, report)}</span>
                </th>
                <td className="num py-2 pr-3 text-right">{formatNumber(row.estimate, locale)}</td>
                <td className="num py-2 pr-3 text-right">{formatNumber(row.stdError, locale, 3)}</td>
                <td className="num py-2 pr-3 text-right">{formatNumber(row.tStatistic, locale, 3)}</td>
                <td className="num py-2 pr-3 text-right">{formatPValue(row.pValue)}</td>
                <td className="num whitespace-nowrap py-2 pr-3 text-right">
                  {formatNumber(row.ciLow, locale, 3)} to {formatNumber(row.ciHigh, locale, 3)}
                </td>
                <td className={`num py-2 pr-3 text-right ${vifWarning ? "font-semibold text-ember" : ""}`}>
                  {row.vif === null ? "—" : formatNumber(row.vif, locale, 3)}
                </td>
                <td className="py-1">
                  <IntervalRow
                    domain={domainOf(row)}
                    point={row.estimate}
                    confidence={row.ciLow !== null && row.ciHigh !== null ? [row.ciLow, row.ciHigh] : null}
                    reference={0}
                    label={`${row.term}: estimate ${formatNumber(row.estimate, locale)}, ${levelPercent}% interval ${formatNumber(row.ciLow, locale, 3)} to ${formatNumber(row.ciHigh, locale, 3)}`}
                  />
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
      <p className="mt-2 text-xs text-slate-600">
        Intervals: {levelPercent}% confidence intervals under {covarianceName(report.covariance)} standard errors, Student&apos;s t with{" "}
        {report.dfResidual} degrees of freedom. Spend channels in the same unit share one scale; other rows each have their own. p-values are
        two-sided.
      </p>
    </div>
  );
}

export function covarianceName(covariance: FitReport["covariance"]): string {
  if (covariance.type === "hc3") return "HC3 (heteroskedasticity-robust)";
  if (covariance.type === "newey-west") return `Newey–West (lag ${covariance.lag ?? "auto"})`;
  return "classical";
}

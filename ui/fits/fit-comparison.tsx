import Link from "next/link";
import type { FitComparison, SummaryRow } from "@/server/fits/comparison";
import { formatInUnit, formatNumber, formatPValue } from "./format";
import { FitStatusBadge } from "./status";
import { textLinkClass } from "@/ui/button-class";

function summaryValue(row: SummaryRow, value: number | null, unit: string | null, locale: string): string {
  if (value === null) return "—";
  switch (row.format) {
    case "count":
      return value.toLocaleString(locale);
    case "p-value":
      return formatPValue(value);
    case "unit":
      return formatInUnit(value, unit, locale, 4);
    default:
      return formatNumber(value, locale, 5);
  }
}

/** Whole-model figures of 2–4 fits, one column each; the best is marked with a word where ranking is fair. */
export function FitComparisonSummary({ comparison, locale }: { comparison: FitComparison; locale: string }) {
  return (
    <div className="overflow-x-auto">
      <table className="num w-full text-sm" data-testid="fit-comparison-summary">
        <thead>
          <tr className="text-left text-xs text-slate-600">
            <th className="py-1 pr-4 font-medium">Figure</th>
            {comparison.fits.map((fit) => (
              <th key={fit.id} className="py-1 pr-4 text-right align-bottom font-medium">
                <Link href={`/fits/${fit.id}`} className={textLinkClass}>
                  {fit.name}
                </Link>
                <span className="mt-1 block">
                  <FitStatusBadge status={fit.status} />
                </span>
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {comparison.summary.map((row) => (
            <tr key={row.key} className="border-t border-slate-100" data-testid={`summary-${row.key}`}>
              <th scope="row" className="py-1.5 pr-4 text-left font-normal text-slate-700">
                {row.label}
                {row.better ? <span className="ml-1 text-xs text-slate-600">({row.better} is better)</span> : null}
              </th>
              {row.values.map((value, index) => (
                <td key={comparison.fits[index].id} className={`py-1.5 pr-4 text-right ${row.best === index ? "font-semibold text-river" : ""}`} data-best={row.best === index}>
                  {summaryValue(row, value, comparison.fits[index].outcomeUnit, locale)}
                  {row.best === index ? <span className="ml-1 text-xs font-medium">best</span> : null}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

/** Every term's estimate and interval in each fit; a term a fit leaves out says so; shifting terms are named. */
export function FitComparisonTerms({ comparison, locale }: { comparison: FitComparison; locale: string }) {
  const shifting = new Set(comparison.shiftingTerms);
  return (
    <div className="overflow-x-auto">
      <table className="num w-full text-sm" data-testid="fit-comparison-terms">
        <thead>
          <tr className="text-left text-xs text-slate-600">
            <th className="py-1 pr-4 font-medium">Term</th>
            {comparison.fits.map((fit) => (
              <th key={fit.id} className="py-1 pr-4 text-right font-medium">
                {fit.name}
                <span className="block font-normal">estimate ({Math.round(fit.level * 1000) / 10}% interval)</span>
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {comparison.terms.map((row) => (
            <tr key={row.term} className="border-t border-slate-100" data-testid="term-row" data-term={row.term} data-shifting={shifting.has(row.term)}>
              <th scope="row" className={`py-1.5 pr-4 text-left font-normal ${shifting.has(row.term) ? "border-l-4 border-ember pl-2" : ""}`}>
                <code className="text-slate-900">{row.term}</code>
                {shifting.has(row.term) ? <span className="ml-2 text-xs font-medium text-ember">shifts between fits</span> : null}
              </th>
              {row.cells.map((cell, index) => (
                <td key={comparison.fits[index].id} className="py-1.5 pr-4 text-right align-top">
                  {cell === null ? (
                    <span className="text-slate-600">not in this fit</span>
                  ) : (
                    <>
                      <span className="font-medium text-slate-900">{formatNumber(cell.estimate, locale, 4)}</span>
                      <span className="block text-xs text-slate-600">
                        {formatNumber(cell.ciLow, locale, 3)} to {formatNumber(cell.ciHigh, locale, 3)} · p {formatPValue(cell.pValue)}
                      </span>
                    </>
                  )}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

import { CorrelationGrid } from "@/ui/charts";
import type { FitReport } from "@/server/fits/types";
import { formatNumber } from "./format";

export type CollinearityWarning = { term: string; vif: number; level: 5 | 10; partner: string | null; correlation: number | null };

/** Terms whose VIF passes 5 or 10 (common-practice thresholds), each with the term it moves with most. */
export function collinearityWarnings(report: FitReport): CollinearityWarning[] {
  const { terms, vif, correlations } = report.collinearity;
  const warnings: CollinearityWarning[] = [];
  terms.forEach((term, index) => {
    const value = vif[index];
    if (!(value > 5)) return;
    let partner: string | null = null;
    let correlation: number | null = null;
    correlations[index]?.forEach((r, other) => {
      if (other !== index && Number.isFinite(r) && (correlation === null || Math.abs(r) > Math.abs(correlation))) {
        partner = terms[other];
        correlation = r;
      }
    });
    warnings.push({ term, vif: value, level: value > 10 ? 10 : 5, partner, correlation });
  });
  return warnings.sort((a, b) => b.vif - a.vif);
}

const thresholdWords = (level: 5 | 10) =>
  level === 10 ? "a common-practice threshold for serious collinearity" : "a common-practice threshold worth a look";

/** Two terms that are each other's closest partner make one warning, not two. */
function pairWarnings(warnings: CollinearityWarning[]): { first: CollinearityWarning; second: CollinearityWarning | null }[] {
  const used = new Set<string>();
  const result: { first: CollinearityWarning; second: CollinearityWarning | null }[] = [];
  for (const warning of warnings) {
    if (used.has(warning.term)) continue;
    used.add(warning.term);
    const partner = warnings.find((other) => other.term === warning.partner && other.partner === warning.term && !used.has(other.term)) ?? null;
    if (partner) used.add(partner.term);
    result.push({ first: warning, second: partner });
  }
  return result;
}

export function CollinearitySection({ report, locale }: { report: FitReport; locale: string }) {
  const warnings = collinearityWarnings(report);
  const { terms, correlations, centred } = report.collinearity;
  return (
    <div className="space-y-4">
      {warnings.length > 0 ? (
        <ul className="space-y-2" data-testid="collinearity-warnings">
          {pairWarnings(warnings).map(({ first, second }) => (
            <li
              key={first.term}
              data-testid="collinearity-warning"
              data-term={first.term}
              data-partner={second?.term ?? first.partner ?? undefined}
              className="rounded-md border border-ember/40 border-l-4 border-l-ember bg-white px-3 py-2 text-sm text-slate-900"
            >
              <strong className="text-ember">{first.level === 10 ? "Strong collinearity: " : "Collinearity: "}</strong>
              {second ? (
                <>
                  <span className="font-mono">{first.term}</span> and <span className="font-mono">{second.term}</span> move together (r ={" "}
                  <span className="num">{(first.correlation ?? 0).toFixed(2)}</span>). Their variance inflation factors are{" "}
                  <span className="num">{formatNumber(first.vif, locale, 3)}</span> and <span className="num">{formatNumber(second.vif, locale, 3)}</span>, above{" "}
                  {first.level} ({thresholdWords(first.level)}).
                </>
              ) : (
                <>
                  <span className="font-mono">{first.term}</span> has a variance inflation factor of <span className="num">{formatNumber(first.vif, locale, 3)}</span>, above{" "}
                  {first.level} ({thresholdWords(first.level)}).
                  {first.partner !== null && first.correlation !== null ? (
                    <>
                      {" "}
                      It moves most with <span className="font-mono">{first.partner}</span> (r = <span className="num">{first.correlation.toFixed(2)}</span>).
                    </>
                  ) : null}
                </>
              )}{" "}
              The data cannot tell {second ? "their" : "its"} separate effects apart well: each estimate is unstable and its interval wide, even when the combined effect is
              well measured. Read the split with care, or drop one of them and say so.
            </li>
          ))}
        </ul>
      ) : (
        <p className="text-sm text-slate-700">No variance inflation factor exceeds 5 (a common-practice threshold): the terms are not strongly collinear.</p>
      )}
      {terms.length > 1 ? (
        <CorrelationGrid
          labels={terms}
          values={correlations}
          caption={`Correlations between the terms over the ${report.n.toLocaleString(locale)} fitted rows${centred ? "" : " (without intercept, VIFs are uncentred)"}.`}
        />
      ) : null}
    </div>
  );
}

import type { FitReport } from "@/server/fits/types";
import { covarianceName } from "./coefficient-table";
import { formatInUnit, formatNumber, formatPValue } from "./format";

/** Plain words about Durbin–Watson: near 2 is fine; well below 2 means neighbouring errors move together. */
export function durbinWatsonNote(report: Pick<FitReport, "durbinWatson" | "periodColumn" | "covariance">): { tone: "ok" | "warning"; text: string } | null {
  const dw = report.durbinWatson;
  if (dw === null) return null;
  const order = report.periodColumn ? `week to week (rows in ${report.periodColumn} order)` : "from one row to the next (file order: the data has no period column)";
  const remedy =
    report.covariance.type === "newey-west"
      ? "This fit already uses Newey–West standard errors, which allow for it."
      : "Classical standard errors are then too small and p-values too optimistic: refit with Newey–West standard errors.";
  if (dw < 1.5) {
    return { tone: "warning", text: `Durbin–Watson is ${dw.toFixed(2)}, well below 2: the errors look positively autocorrelated ${order}. ${remedy}` };
  }
  if (dw > 2.5) {
    return { tone: "warning", text: `Durbin–Watson is ${dw.toFixed(2)}, well above 2: the errors look negatively autocorrelated ${order}. ${remedy}` };
  }
  return { tone: "ok", text: `Durbin–Watson is ${dw.toFixed(2)}, close to 2: no sign that the errors are autocorrelated ${order}.` };
}

function Stat({ label, value, hint, testId }: { label: string; value: string; hint?: string; testId?: string }) {
  return (
    <div className="rounded-md border border-slate-200 bg-silt/40 px-3 py-2">
      <dt className="text-xs font-medium uppercase tracking-wide text-slate-600">{label}</dt>
      <dd className="num mt-0.5 text-lg font-semibold text-river" data-testid={testId}>
        {value}
      </dd>
      {hint ? <dd className="text-xs text-slate-600">{hint}</dd> : null}
    </div>
  );
}

export function FitSummary({ report, locale }: { report: FitReport; locale: string }) {
  const outcomeUnit = report.units[report.outcome] ?? null;
  const dw = durbinWatsonNote(report);
  return (
    <div>
      <dl className="grid grid-cols-2 gap-3 sm:grid-cols-3 lg:grid-cols-4">
        <Stat label="R²" value={formatNumber(report.rSquared, locale, 4)} hint={report.rSquaredUncentred ? "Uncentred (no intercept): not comparable with a centred R²" : "Share of the outcome's variation the model accounts for"} testId="r-squared" />
        <Stat label="Adjusted R²" value={formatNumber(report.adjRSquared, locale, 4)} hint="R² penalised for the number of terms" />
        <Stat label="Residual std. error" value={formatInUnit(report.sigma, outcomeUnit, locale, 4)} hint={`On ${report.dfResidual} degrees of freedom`} />
        <Stat
          label={`F statistic${report.fTestKind === "wald" ? " (Wald)" : ""}`}
          value={formatNumber(report.fStatistic, locale, 4)}
          hint={`On ${report.fDf[0]} and ${report.fDf[1]} df; p-value ${formatPValue(report.fPValue)}`}
        />
        <Stat label="Observations (n)" value={report.n.toLocaleString(locale)} hint={`${report.parameterCount} coefficients estimated`} />
        <Stat label="Durbin–Watson" value={report.durbinWatson === null ? "—" : report.durbinWatson.toFixed(3)} hint="Near 2: no first-order autocorrelation" testId="durbin-watson" />
        <Stat label="Log-likelihood" value={formatNumber(report.logLik, locale, 6)} hint={`AIC ${formatNumber(report.aic, locale, 6)} · BIC ${formatNumber(report.bic, locale, 6)}`} />
        <Stat label="Condition number" value={formatNumber(report.conditionNumber, locale, 3)} hint="Of the design with unit-length columns" />
      </dl>
      <p className="mt-3 text-sm text-slate-700">
        Standard errors: {covarianceName(report.covariance)}. Confidence level {Math.round(report.level * 1000) / 10}%.
      </p>
      {dw ? (
        <p
          data-testid="durbin-watson-note"
          className={`mt-2 rounded-md border-l-4 px-3 py-2 text-sm ${dw.tone === "warning" ? "border-ember bg-white text-slate-900" : "border-reed bg-white text-slate-700"}`}
        >
          {dw.tone === "warning" ? <strong className="text-ember">Autocorrelation: </strong> : null}
          {dw.text}
        </p>
      ) : null}
      {report.warnings.length > 0 ? (
        <ul className="mt-2 list-disc pl-5 text-sm text-ember">
          {report.warnings.map((warning) => (
            <li key={warning}>{warning}</li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}

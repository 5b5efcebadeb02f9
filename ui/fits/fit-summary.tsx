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

/** A p-value below this reads as evidence against the assumption (common practice: 5%). */
const evidenceThreshold = 0.05;

/** Plain words about Breusch–Pagan: does the spread of the errors change with the regressors? */
export function unequalVarianceNote(report: Pick<FitReport, "residualTests" | "covariance">): { tone: "ok" | "warning"; text: string } | null {
  const test = report.residualTests?.heteroskedasticity;
  if (!test) return null;
  const p = formatPValue(test.pValue);
  if (test.pValue >= evidenceThreshold) {
    return { tone: "ok", text: `Breusch–Pagan p-value ${p}: no sign that the spread of the errors changes with the regressors.` };
  }
  const remedy =
    report.covariance.type === "classical"
      ? "Classical standard errors assume one spread for every row, so they and the p-values may be off: refit with HC3 standard errors."
      : `This fit's ${report.covariance.type === "hc3" ? "HC3" : "Newey–West"} standard errors allow for it.`;
  return {
    tone: "warning",
    text: `Breusch–Pagan p-value ${p}: the spread of the errors changes with the regressors (unequal variance). ${remedy} Prediction intervals still assume one spread: where spend is high they may be too narrow.`,
  };
}

/** Plain words about Jarque–Bera: are the errors near normal? */
export function normalityNote(report: Pick<FitReport, "residualTests">): { tone: "ok" | "warning"; text: string } | null {
  const test = report.residualTests?.normality;
  if (!test) return null;
  const shape = `skewness ${test.skewness.toFixed(2)}, kurtosis ${test.kurtosis.toFixed(2)}; normal errors have 0 and 3`;
  if (test.pValue >= evidenceThreshold) {
    return { tone: "ok", text: `Jarque–Bera p-value ${formatPValue(test.pValue)}: no sign that the errors are not normal (${shape}).` };
  }
  return {
    tone: "warning",
    text: `Jarque–Bera p-value ${formatPValue(test.pValue)}: the errors are not normal (${shape}). Coefficient intervals rely on normality less as the number of rows grows; prediction intervals rely on it at any size, so read their ends with care.`,
  };
}

function Note({ note, label, testId }: { note: { tone: "ok" | "warning"; text: string }; label: string; testId: string }) {
  return (
    <p
      data-testid={testId}
      data-tone={note.tone}
      className={`mt-2 rounded-md border-l-4 px-3 py-2 text-sm ${note.tone === "warning" ? "border-ember bg-white text-slate-900" : "border-reed bg-white text-slate-700"}`}
    >
      {note.tone === "warning" ? <strong className="text-ember">{label}: </strong> : null}
      {note.text}
    </p>
  );
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
  const unequalVariance = unequalVarianceNote(report);
  const normality = normalityNote(report);
  const bp = report.residualTests?.heteroskedasticity ?? null;
  const jb = report.residualTests?.normality ?? null;
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
        <Stat label="Log-likelihood" value={formatNumber(report.logLik, locale, 6)} hint={`AIC ${formatNumber(report.aic, locale, 6)} · BIC ${formatNumber(report.bic, locale, 6)}`} />
        <Stat label="Condition number" value={formatNumber(report.conditionNumber, locale, 3)} hint="Of the design with unit-length columns" />
      </dl>
      <p className="mt-3 text-sm text-slate-700">
        Standard errors: {covarianceName(report.covariance)}. Confidence level {Math.round(report.level * 1000) / 10}%.
      </p>
      <h3 className="mt-5 text-sm font-semibold text-river">Residual checks</h3>
      <p className="text-sm text-slate-700">Whether the errors look like what the standard errors and intervals assume.</p>
      <dl className="mt-2 grid grid-cols-1 gap-3 sm:grid-cols-3" data-testid="residual-checks">
        <Stat label="Durbin–Watson" value={report.durbinWatson === null ? "—" : report.durbinWatson.toFixed(3)} hint="Near 2: no first-order autocorrelation" testId="durbin-watson" />
        <Stat
          label="Breusch–Pagan"
          value={bp ? formatNumber(bp.statistic, locale, 4) : "—"}
          hint={bp ? `Unequal variance: χ² on ${bp.df} df, p-value ${formatPValue(bp.pValue)} (studentized)` : report.residualTests ? "Needs an intercept" : "Not computed for this fit"}
          testId="breusch-pagan"
        />
        <Stat
          label="Jarque–Bera"
          value={jb ? formatNumber(jb.statistic, locale, 4) : "—"}
          hint={jb ? `Normal errors: χ² on 2 df, p-value ${formatPValue(jb.pValue)}` : "Not computed for this fit"}
          testId="jarque-bera"
        />
      </dl>
      {dw ? <Note note={dw} label="Autocorrelation" testId="durbin-watson-note" /> : null}
      {unequalVariance ? <Note note={unequalVariance} label="Unequal variance" testId="breusch-pagan-note" /> : null}
      {normality ? <Note note={normality} label="Not normal" testId="jarque-bera-note" /> : null}
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

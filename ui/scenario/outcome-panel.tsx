"use client";

import { useRef } from "react";
import type { MoneyLocale } from "@/server/planning/allocation";
import { type PlanShape, periodsWord } from "@/server/predict/plan-shape";
import type { ScenarioOutcome, ScenarioWarning } from "@/server/predict/scenario-outcome";
import { IntervalRow, intervalDomain } from "@/ui/charts/interval-row";
import type { HeldOutSummary } from "@/server/fits/types";
import { Caution, LARGE_SHIFT_SHARE, cautionText } from "./cautions";
import { formatOutcome, formatOutcomeCompact, formatPercent, formatSignedOutcome } from "./format";
import { OutcomeInterval, stableDomain } from "./outcome-interval";
import type { PredictionSource } from "./use-scenario-prediction";

export interface OutcomePanelProps {
  outcome: ScenarioOutcome | null;
  /** "local": a reader without fit:predict (finance); the same engine as the server, run here, no confirmation to wait for. */
  source: PredictionSource;
  fetching: boolean;
  error: string | null;
  shape: PlanShape;
  money: MoneyLocale;
  /** Starting plan's expected total, for the reference line. */
  baselineTotal: number | null;
  baselineDescription: string;
  /** Share of the starting budget this plan moves (see shiftShare). */
  shift: number;
  /** The fit's held-out check, when it has one. */
  heldOut?: HeldOutSummary | null;
}

function WarningList({ warnings }: { warnings: readonly ScenarioWarning[] }) {
  if (warnings.length === 0) return null;
  return (
    <div data-testid="outcome-warnings" role="status" className="space-y-2 rounded-md border-l-4 border-ember bg-white px-3 py-2">
      <ul className="space-y-1.5 text-sm text-slate-800">
        {warnings.map((warning) => (
          <li key={warning.kind === "outside-range" ? warning.column : "combination"} data-warning={warning.kind}>
            <span className="font-semibold text-[#9f3f2c]">{warning.kind === "outside-range" ? "Beyond observed range: " : "Unseen combination: "}</span>
            {warning.message}
          </li>
        ))}
      </ul>
      <p className="text-xs font-medium text-[#9f3f2c]">{cautionText.extrapolation}</p>
    </div>
  );
}

/**
 * The right side of the scenario screen: the horizon total with its two bands, the average period,
 * the difference from the starting plan with its own interval, warnings, contributions and the
 * cautions next to the numbers they qualify.
 */
function sourceLabel(source: PredictionSource, fetching: boolean): string {
  if (source === "server") return "Confirmed by the server";
  if (source === "local") return "Computed in this browser from the approved fit";
  return fetching ? "Preview · confirming…" : "Preview in this browser";
}

export function OutcomePanel({ outcome, source, fetching, error, shape, money, baselineTotal, baselineDescription, shift, heldOut = null }: OutcomePanelProps) {
  const domainRef = useRef<[number, number] | null>(null);
  const differenceDomainRef = useRef<[number, number] | null>(null);
  if (!outcome) {
    return (
      <section aria-label="Predicted outcome" className="rounded-lg border border-slate-200 bg-white p-5">
        <p className="text-sm text-slate-700">{error ?? "Enter a plan to see its predicted outcome."}</p>
      </section>
    );
  }
  const total = outcome.horizonTotal;
  const domain = (domainRef.current = stableDomain(domainRef.current, [total]));
  const fmt = (value: number) => formatOutcome(value, shape, money);
  const percent = formatPercent(outcome.level, money.locale);
  const warned = outcome.warnings.length > 0;
  const period = shape.periodNoun;
  const difference = outcome.difference;
  const differenceDomain = difference
    ? (differenceDomainRef.current = stableDomain(differenceDomainRef.current, [{ mean: difference.mean, confidence: difference.confidence, prediction: difference.confidence }]))
    : null;

  return (
    <section aria-label="Predicted outcome" className="space-y-5 rounded-lg border border-slate-200 bg-white p-5 shadow-sm" data-testid="outcome-panel" data-source={source}>
      <div>
        <div className="flex flex-wrap items-baseline justify-between gap-2">
          <h2 className="text-lg font-semibold text-river">
            Predicted {shape.outcome.label.toLowerCase()} over {periodsWord(outcome.horizon, period)}
          </h2>
          <span
            data-testid="prediction-source"
            className={`rounded-full px-2 py-0.5 text-xs font-medium ${source === "server" ? "bg-shallows-pale text-river" : "bg-slate-100 text-slate-600"}`}
          >
            {sourceLabel(source, fetching)}
          </span>
        </div>
        <p className="num mt-1 text-3xl font-semibold text-river" data-testid="horizon-total" data-value={total.mean}>
          {fmt(total.mean)}
        </p>
        <OutcomeInterval
          interval={total}
          domain={domain}
          reference={baselineTotal}
          tone={warned ? "warning" : "normal"}
          label={`Predicted total ${fmt(total.mean)}; ${percent} confidence interval ${fmt(total.confidence[0])} to ${fmt(total.confidence[1])}; ${percent} prediction interval ${fmt(total.prediction[0])} to ${fmt(total.prediction[1])}`}
          formatTick={(value) => formatOutcomeCompact(value, shape, money)}
          markRedraw
        />
        <ul className="num mt-3 space-y-1.5 text-sm">
          <li className="flex items-center justify-between gap-3">
            <span className="flex items-center gap-2 text-slate-600">
              <span aria-hidden="true" className="inline-block h-2.5 w-5 rounded-sm bg-shallows-mid" /> Expected total, {percent} confidence
            </span>
            <span data-testid="total-confidence">
              {fmt(total.confidence[0])} – {fmt(total.confidence[1])}
            </span>
          </li>
          <li className="flex items-center justify-between gap-3">
            <span className="flex items-center gap-2 text-slate-600">
              <span aria-hidden="true" className="inline-block h-2.5 w-5 rounded-sm bg-shallows-pale" /> Realised total, {percent} prediction
            </span>
            <span data-testid="total-prediction">
              {fmt(total.prediction[0])} – {fmt(total.prediction[1])}
            </span>
          </li>
          <li data-testid="per-period" className="border-t border-slate-100 pt-1.5">
            <span className="flex justify-between gap-3">
              <span className="text-slate-600">Average {period}</span>
              <span className="font-medium">{fmt(outcome.perPeriod.mean)}</span>
            </span>
            <span className="block text-right text-xs text-slate-600">
              expected {fmt(outcome.perPeriod.confidence[0])} – {fmt(outcome.perPeriod.confidence[1])} · one {period} {fmt(outcome.perPeriod.prediction[0])} –{" "}
              {fmt(outcome.perPeriod.prediction[1])}
            </span>
          </li>
        </ul>
        <Caution>{cautionText.modelHolds} The realised total also varies with what the model does not see, which the pale band includes.</Caution>
        {heldOut ? (
          <Caution tone={heldOut.fewerInsideThanExpected ? "strong" : "quiet"} testId="held-out-note">
            Checked on held-out {period}s: refitted without the latest {heldOut.periods}, this fit&apos;s {formatPercent(heldOut.level, money.locale)} prediction
            intervals held {heldOut.inside} of them.
            {heldOut.fewerInsideThanExpected ? " That is fewer than such intervals should: the recent market differs from the history, so read this interval as too narrow." : ""}
          </Caution>
        ) : null}
      </div>

      <WarningList warnings={outcome.warnings} />

      {difference && differenceDomain && difference.confidence[1] - difference.confidence[0] === 0 && difference.mean === 0 ? (
        <div>
          <h3 className="text-sm font-semibold text-river">Difference from the starting plan</h3>
          <p className="text-sm text-slate-600" data-testid="difference" data-value={0}>
            None yet: this is the starting plan ({baselineDescription}). Move a channel to see the difference with its own interval.
          </p>
        </div>
      ) : difference && differenceDomain ? (
        <div>
          <h3 className="text-sm font-semibold text-river">Difference from the starting plan</h3>
          <p className="num text-xl font-semibold text-river" data-testid="difference" data-value={difference.mean}>
            {formatSignedOutcome(difference.mean, shape, money)}
            <span className="ml-2 text-sm font-normal text-slate-600">
              ({percent} confidence {formatSignedOutcome(difference.confidence[0], shape, money)} to {formatSignedOutcome(difference.confidence[1], shape, money)})
            </span>
          </p>
          <OutcomeInterval
            interval={{ mean: difference.mean, confidence: difference.confidence, prediction: difference.confidence }}
            domain={intervalDomain([differenceDomain[0], differenceDomain[1]], 0)}
            reference={0}
            label={`Difference from the starting plan ${formatSignedOutcome(difference.mean, shape, money)}, ${percent} confidence interval ${formatSignedOutcome(difference.confidence[0], shape, money)} to ${formatSignedOutcome(difference.confidence[1], shape, money)}`}
            formatTick={(value) => formatOutcomeCompact(value, shape, money)}
          />
          <Caution>
            Against: {baselineDescription} (expected {fmt(difference.baselineTotal)}). The interval comes from the fit&apos;s covariance: both plans share the same
            estimates, so it is narrower than the two totals&apos; intervals side by side.
          </Caution>
        </div>
      ) : null}

      {shift > LARGE_SHIFT_SHARE ? (
        <Caution tone="strong" testId="large-shift-caution">
          This plan moves {formatPercent(shift, money.locale)} of the starting budget. {cautionText.testFirst}
        </Caution>
      ) : null}

      <div>
        <h3 className="text-sm font-semibold text-river">What each term adds (association)</h3>
        <table className="num mt-2 w-full text-sm" data-testid="contributions">
          <thead>
            <tr className="text-left text-xs text-slate-600">
              <th className="font-medium">Term</th>
              <th className="text-right font-medium">Over the horizon</th>
              <th className="text-right font-medium">Per {period}</th>
            </tr>
          </thead>
          <tbody>
            {outcome.contributions.map((contribution) => (
              <tr key={contribution.term} className="border-t border-slate-100">
                <td className="py-1">{contribution.label}</td>
                <td className="py-1 text-right">{formatSignedOutcome(contribution.value, shape, money)}</td>
                <td className="py-1 text-right text-slate-600">{formatSignedOutcome(contribution.perPeriod, shape, money)}</td>
              </tr>
            ))}
          </tbody>
        </table>
        <Caution>Coefficient × the plan&apos;s value of each term. {cautionText.association}</Caution>
      </div>
      {error ? (
        <p role="alert" className="text-sm text-ember">
          The server could not confirm this prediction: {error}
        </p>
      ) : null}
    </section>
  );
}

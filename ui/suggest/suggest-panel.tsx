"use client";

import { useId, useState } from "react";
import type { MoneyLocale } from "@/server/planning/allocation";
import { type PlanShape, periodsWord } from "@/server/predict/plan-shape";
import { intervalDomain } from "@/ui/charts/interval-row";
import { Caution, cautionText } from "@/ui/scenario/cautions";
import { formatMoney, formatOutcome, formatOutcomeCompact, formatPercent, formatSignedOutcome } from "@/ui/scenario/format";
import { OutcomeInterval } from "@/ui/scenario/outcome-interval";
import { type AllocationStore, useAllocationStore } from "@/ui/stores/allocation-store";
import { applyDraftToStore, fetchSuggestion, type SuggestOptions, type SuggestResponse, SuggestError, suggestRequestBody } from "./api";

export interface SuggestPanelProps {
  fitId: string;
  store: AllocationStore;
  controls: Record<string, number>;
  shape: PlanShape;
  money: MoneyLocale;
  /** Planners may load the draft into the plan (and then save it); others only look. */
  canWrite: boolean;
}

type Draft = { response: SuggestResponse; requestKey: string };

const methodWords: Record<SuggestResponse["solver"], string> = {
  "linear-programme": "a linear programme",
  "water-filling": "water-filling on the budget (KKT)",
  barrier: "a convex interior-point solve",
  "multi-start-barrier": "several local searches",
  none: "the constraints alone (nothing left to choose)",
};

/**
 * "Suggest a split": asks the server for the split the fit predicts does best under the plan's total,
 * locks and bounds, inside the observed ranges and the data's hull, and shows it as an unsaved draft
 * beside the current plan — gain with the interval of the difference, binding constraints in plain
 * words, exact or local optimum, and the caution. "Use this draft" puts it into the plan as one
 * undoable edit; only Save version stores it.
 */
export function SuggestPanel({ fitId, store, controls, shape, money, canWrite }: SuggestPanelProps) {
  const allocation = useAllocationStore(store, (state) => state.allocation);
  const [options, setOptions] = useState<SuggestOptions>({ keepInsideObservedRange: true, keepInsideHull: true });
  const [draft, setDraft] = useState<Draft | null>(null);
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<SuggestError | Error | null>(null);
  const [used, setUsed] = useState<string | null>(null);
  const headingId = useId();
  const body = suggestRequestBody(allocation, controls, options);
  const requestKey = JSON.stringify(body);
  const stale = draft !== null && draft.requestKey !== requestKey;

  const ask = async () => {
    setBusy(true);
    setProblem(null);
    setUsed(null);
    try {
      setDraft({ response: await fetchSuggestion(fitId, body), requestKey });
    } catch (error) {
      setDraft(null);
      setProblem(error instanceof Error ? error : new Error(String(error)));
    } finally {
      setBusy(false);
    }
  };

  const use = () => {
    if (!draft) return;
    applyDraftToStore(store, draft.response);
    setDraft(null);
    setUsed("The suggested split is now your plan, not saved yet: Undo (Ctrl+Z) brings back the previous split; Save version keeps it.");
  };

  const fmt = (value: number) => formatOutcome(value, shape, money);
  const response = draft?.response ?? null;
  const percent = response ? formatPercent(response.level, money.locale) : "";

  return (
    <section aria-labelledby={headingId} data-testid="suggest-panel" className="space-y-3 rounded-lg border border-slate-200 bg-white p-4 shadow-sm">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <div>
          <h2 id={headingId} className="text-lg font-semibold text-river">
            Suggested split
          </h2>
          <p className="text-sm text-slate-600">The split of this plan&apos;s budget the fit predicts does best, keeping your locks and bounds.</p>
        </div>
        <div className="flex flex-wrap items-center gap-4">
          <label className="flex items-center gap-1.5 text-sm text-slate-700">
            <input
              type="checkbox"
              checked={options.keepInsideObservedRange}
              onChange={(event) => setOptions((current) => ({ ...current, keepInsideObservedRange: event.currentTarget.checked }))}
              className="accent-shallows"
            />
            Inside observed ranges
          </label>
          <label className="flex items-center gap-1.5 text-sm text-slate-700">
            <input
              type="checkbox"
              checked={options.keepInsideHull}
              onChange={(event) => setOptions((current) => ({ ...current, keepInsideHull: event.currentTarget.checked }))}
              className="accent-shallows"
            />
            Only combinations like past {shape.periodNoun}s
          </label>
          <button
            type="button"
            onClick={ask}
            disabled={busy}
            className="rounded-md bg-shallows px-4 py-2 text-sm font-medium text-white hover:bg-river focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-river disabled:opacity-60"
          >
            {busy ? "Suggesting…" : response ? "Suggest again" : "Suggest a split"}
          </button>
        </div>
      </div>

      <div aria-live="polite">
        {problem ? (
          <div role="alert" data-testid="suggest-problem" className="rounded-md border-l-4 border-ember bg-ember/10 px-3 py-2 text-sm text-slate-900">
            <p className="font-medium">No suggestion: {problem.message}</p>
            {problem instanceof SuggestError && problem.details.length > 1 ? (
              <ul className="mt-1 list-disc pl-5">
                {problem.details.slice(1).map((detail, index) => (
                  <li key={index}>{detail.message}</li>
                ))}
              </ul>
            ) : null}
          </div>
        ) : null}
        {used ? (
          <p role="status" data-testid="suggest-used" className="rounded-md border-l-4 border-reed bg-reed/10 px-3 py-2 text-sm">
            {used}
          </p>
        ) : null}
      </div>

      {response ? (
        <div data-testid="suggest-draft" data-method={response.method} className="space-y-4 border-t border-slate-100 pt-3">
          <p className="rounded-md bg-silt px-3 py-2 text-sm text-slate-800">
            <strong>Unsaved draft.</strong> Your plan is unchanged until you use this draft, and nothing is kept until you save a version.
            {stale ? <span data-testid="suggest-stale"> Your plan changed after this suggestion was made: suggest again to compare with it.</span> : null}
          </p>
          <div className="grid gap-5 lg:grid-cols-[minmax(0,1fr)_minmax(0,26rem)]">
            <table className="num w-full text-sm" data-testid="suggest-table">
              <caption className="sr-only">Current plan and suggested split per channel, {money.currency} over {periodsWord(allocation.horizonPeriods, shape.periodNoun)}</caption>
              <thead>
                <tr className="text-left text-xs text-slate-600">
                  <th className="font-medium">Channel</th>
                  <th className="text-right font-medium">Current plan ({money.currency})</th>
                  <th className="text-right font-medium">Suggested ({money.currency})</th>
                  <th className="text-right font-medium">Change</th>
                </tr>
              </thead>
              <tbody>
                {response.channels.map((channel) => (
                  <tr key={channel.name} className="border-t border-slate-100" data-draft-channel={channel.name} data-amount={channel.amount}>
                    <td className="py-1.5">
                      {channel.label}
                      {channel.locked ? <span className="ml-1.5 text-xs text-slate-600">(locked)</span> : null}
                    </td>
                    <td className="py-1.5 text-right text-slate-600">{formatMoney(channel.current, money)}</td>
                    <td className="py-1.5 text-right font-medium">{formatMoney(channel.amount, money)}</td>
                    <td className={`py-1.5 text-right ${channel.change > 0 ? "text-river" : channel.change < 0 ? "text-[#9f3f2c]" : "text-slate-600"}`}>
                      {channel.change === 0 ? "—" : `${channel.change > 0 ? "+" : "−"}${formatMoney(Math.abs(channel.change), money)}`}
                    </td>
                  </tr>
                ))}
                <tr className="border-t border-slate-300 font-medium">
                  <td className="py-1.5">Total</td>
                  <td className="py-1.5 text-right">{formatMoney(response.channels.reduce((sum, channel) => sum + channel.current, 0), money)}</td>
                  <td className="py-1.5 text-right" data-testid="suggest-total" data-value={response.total}>
                    {formatMoney(response.total, money)}
                  </td>
                  <td />
                </tr>
              </tbody>
            </table>

            <div className="space-y-3">
              <OutcomeCompare response={response} shape={shape} money={money} percent={percent} />
              <div>
                <h3 className="text-sm font-semibold text-river">Predicted gain over the current plan</h3>
                <p className="num text-xl font-semibold text-river" data-testid="suggest-gain" data-value={response.gain.mean}>
                  {formatSignedOutcome(response.gain.mean, shape, money)}{" "}
                  <span className="ml-1 text-sm font-normal text-slate-600">
                    ({percent} confidence {formatSignedOutcome(response.gain.confidence[0], shape, money)} to {formatSignedOutcome(response.gain.confidence[1], shape, money)})
                  </span>
                </p>
                <OutcomeInterval
                  interval={{ mean: response.gain.mean, confidence: response.gain.confidence, prediction: response.gain.confidence }}
                  domain={intervalDomain([response.gain.confidence[0], response.gain.confidence[1]], 0)}
                  reference={0}
                  label={`Predicted gain ${formatSignedOutcome(response.gain.mean, shape, money)}, ${percent} confidence interval of the difference ${formatSignedOutcome(response.gain.confidence[0], shape, money)} to ${formatSignedOutcome(response.gain.confidence[1], shape, money)}`}
                  formatTick={(value) => formatOutcomeCompact(value, shape, money)}
                />
                <Caution>
                  The interval is of the difference itself, from the fit&apos;s covariance (both plans share the same estimates). {cautionText.modelHolds}
                </Caution>
              </div>
            </div>
          </div>

          <p className="text-sm text-slate-800" data-testid="suggest-method">
            {response.method === "exact" ? (
              <>
                <strong>Best plan under these constraints</strong> (exact, by {methodWords[response.solver]}).
              </>
            ) : (
              <>
                <strong>Local optimum:</strong> best found from {response.starts ?? "several"} starts; not guaranteed best.
              </>
            )}
          </p>

          {response.binding.length > 0 ? (
            <div>
              <h3 className="text-sm font-semibold text-river">What holds the suggestion where it is</h3>
              <ul className="mt-1 list-disc space-y-1 pl-5 text-sm text-slate-800" data-testid="suggest-binding">
                {response.binding.map((constraint, index) => (
                  <li key={`${constraint.kind}-${constraint.channel ?? index}`} data-kind={constraint.kind}>
                    {constraint.message}
                  </li>
                ))}
              </ul>
            </div>
          ) : null}
          {response.notes.length > 0 ? (
            <ul className="space-y-1 text-sm text-slate-700" data-testid="suggest-notes">
              {response.notes.map((note) => (
                <li key={note}>{note}</li>
              ))}
            </ul>
          ) : null}
          {response.prediction.warnings.length > 0 ? (
            <p className="rounded-md border-l-4 border-ember bg-white px-3 py-2 text-sm">
              {response.prediction.warnings.map((warning) => warning.message).join(" ")} {cautionText.extrapolation}
            </p>
          ) : null}

          <Caution tone="strong" testId="suggest-caution">
            {response.caution} {cautionText.association}
          </Caution>

          <div className="flex flex-wrap gap-3">
            {canWrite ? (
              <button
                type="button"
                onClick={use}
                disabled={stale}
                className="rounded-md bg-shallows px-4 py-2 text-sm font-medium text-white hover:bg-river focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-river disabled:opacity-60"
              >
                Use this draft
              </button>
            ) : null}
            <button
              type="button"
              onClick={() => setDraft(null)}
              className="rounded-md border border-slate-300 bg-white px-4 py-2 text-sm font-medium text-slate-700 hover:bg-slate-50 focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-river"
            >
              Discard draft
            </button>
          </div>
        </div>
      ) : null}
    </section>
  );
}

function OutcomeCompare({ response, shape, money, percent }: { response: SuggestResponse; shape: PlanShape; money: MoneyLocale; percent: string }) {
  const fmt = (value: number) => formatOutcome(value, shape, money);
  const suggested = response.prediction.horizonTotal;
  const current = response.current;
  const domain = intervalDomain([...current.prediction, ...suggested.prediction], null);
  const rows = [
    { key: "current", name: "Current plan", interval: current },
    { key: "suggested", name: "Suggested split", interval: suggested },
  ];
  return (
    <div>
      <h3 className="text-sm font-semibold text-river">
        Predicted {shape.outcome.label.toLowerCase()} over {periodsWord(response.prediction.horizon, shape.periodNoun)}
      </h3>
      {rows.map((row) => (
        <div key={row.key} data-testid={`suggest-outcome-${row.key}`} data-value={row.interval.mean}>
          <p className="num flex justify-between text-sm">
            <span className="text-slate-600">{row.name}</span>
            <span className="font-medium">{fmt(row.interval.mean)}</span>
          </p>
          <OutcomeInterval
            interval={row.interval}
            domain={domain}
            label={`${row.name}: ${fmt(row.interval.mean)}; ${percent} confidence ${fmt(row.interval.confidence[0])} to ${fmt(row.interval.confidence[1])}; ${percent} prediction ${fmt(row.interval.prediction[0])} to ${fmt(row.interval.prediction[1])}`}
            formatTick={(value) => formatOutcomeCompact(value, shape, money)}
          />
        </div>
      ))}
    </div>
  );
}

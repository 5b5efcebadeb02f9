"use client";

import { memo, useDeferredValue, useMemo } from "react";
import type { AllocationState, MoneyLocale } from "@/server/planning/allocation";
import { responseCurve } from "@/server/planning/response-curves";
import type { PlanShape } from "@/server/predict/plan-shape";
import { planPeriods } from "@/server/predict/scenario-outcome";
import type { FitRecord } from "@/server/stats";
import { Caution, cautionText } from "@/ui/scenario/cautions";
import { formatMoney, formatPercent, outcomeIsMoney } from "@/ui/scenario/format";
import { useDebouncedValue } from "@/ui/scenario/use-scenario-prediction";
import { type AllocationStore, useAllocationStore } from "@/ui/stores/allocation-store";
import { formatSlope, ResponseCurveChart } from "./response-curve-chart";

/** Wait after the last move before the curves are recomputed (they are secondary to the outcome). */
export const CURVES_DEBOUNCE_MS = 300;
/** Points per curve. */
const POINTS = 41;

export interface ResponseCurvesSectionProps {
  record: FitRecord;
  shape: PlanShape;
  store: AllocationStore;
  controls: Record<string, number>;
  money: MoneyLocale;
}

function currencySymbol(money: MoneyLocale): string {
  return new Intl.NumberFormat(money.locale, { style: "currency", currency: money.currency }).formatToParts(0).find((part) => part.type === "currency")?.value ?? money.currency;
}

/**
 * "Response curves": for each channel, the predicted horizon outcome as its spend varies with the
 * other channels held at the plan, computed in this browser from the fit record the page already has
 * (the same pure code the server would run; no API call), with the marginal return at the plan.
 */
export function ResponseCurvesSection({ record, shape, store, controls, money }: ResponseCurvesSectionProps) {
  const live = useAllocationStore(store, (state) => state.allocation);
  // Curves follow the plan after it settles, at low priority, so moving a slider stays instant.
  const allocation = useDeferredValue(useDebouncedValue(live, CURVES_DEBOUNCE_MS));
  const symbol = currencySymbol(money);
  const units = useMemo(
    () => ({
      outcome: outcomeIsMoney(shape) ? `${symbol} of ${shape.outcome.label.toLowerCase()}` : (shape.outcome.unit ?? shape.outcome.label.toLowerCase()),
      spend: symbol,
    }),
    [shape, symbol],
  );
  return (
    <section aria-labelledby="response-curves-heading" data-testid="response-curves" className="space-y-3 rounded-lg border border-slate-200 bg-white p-4 shadow-sm">
      <div>
        <h2 id="response-curves-heading" className="text-lg font-semibold text-river">
          Response curves
        </h2>
        <p className="text-sm text-slate-600">
          Predicted {shape.outcome.label.toLowerCase()} over the horizon as one channel&apos;s spend changes and the others stay at this plan. Line: expected total;
          band: {formatPercent(record.confidenceLevel, money.locale)} confidence; shaded: the spend the fit has seen; dot and dashed line: this plan.
        </p>
      </div>
      <div className="grid gap-4 sm:grid-cols-2 xl:grid-cols-3">
        {allocation.channels.map((channel) => (
          <MemoChannelCurve key={channel.name} channel={channel.name} record={record} shape={shape} allocation={allocation} controls={controls} money={money} units={units} />
        ))}
      </div>
      <Caution>
        Marginal return: the slope of the curve at this plan — the expected change in {shape.outcome.label.toLowerCase()} for one more {symbol} of that channel&apos;s spend over
        the horizon. {cautionText.association} {cautionText.modelHolds}
      </Caution>
    </section>
  );
}

type ChannelCurveProps = {
  channel: string;
  record: FitRecord;
  shape: PlanShape;
  allocation: AllocationState;
  controls: Record<string, number>;
  money: MoneyLocale;
  units: { outcome: string; spend: string };
};

const MemoChannelCurve = memo(ChannelCurve);

function ChannelCurve({ channel, record, shape, allocation, controls, money, units }: ChannelCurveProps) {
  const result = useMemo(() => {
    try {
      const plan = { allocation: Object.fromEntries(allocation.channels.map((entry) => [entry.name, entry.amountCents / 100])), controls, horizon: allocation.horizonPeriods };
      return { curve: responseCurve({ record, allocation, channel, controlPeriods: planPeriods(shape, plan), pointCount: POINTS, units }), error: null };
    } catch (error) {
      return { curve: null, error: error instanceof Error ? error.message : String(error) };
    }
  }, [record, shape, allocation, controls, channel, units]);
  const label = allocation.channels.find((entry) => entry.name === channel)?.label ?? channel;
  if (!result.curve) {
    return (
      <figure className="text-sm text-slate-600">
        <figcaption className="font-medium text-river">{label}</figcaption>
        <p>No curve for this plan: {result.error}</p>
      </figure>
    );
  }
  const curve = result.curve;
  const slope = curve.marginalReturn;
  const percent = formatPercent(slope.confidenceLevel, money.locale);
  return (
    <figure data-testid="response-curve" data-curve-channel={channel} data-marginal={slope.value} data-plan-cents={curve.current.amountCents} className="space-y-1">
      <figcaption className="flex items-baseline justify-between gap-2">
        <span className="font-medium text-river">{curve.label}</span>
        <span className="num text-xs text-slate-600">plan {formatMoney(curve.current.amountCents / 100, money)}</span>
      </figcaption>
      <ResponseCurveChart curve={curve} shape={shape} money={money} />
      <p className="num text-sm text-slate-800" data-testid="marginal-return">
        Marginal return at the plan: <strong>{formatSlope(slope.value, money.locale)}</strong>{" "}
        <span className="text-slate-600">
          ({percent} confidence {formatSlope(slope.confidence[0], money.locale)} to {formatSlope(slope.confidence[1], money.locale)}) {slope.unit}, association
        </span>
      </p>
    </figure>
  );
}

"use client";

import { useId, useMemo } from "react";
import { observedPosition } from "@/server/planning/allocation";
import { BoundsDisclosure } from "./bounds-disclosure";
import { ChannelAmountInput } from "./channel-amount-input";
import { ChannelSlider } from "./channel-slider";
import { LockToggle } from "./lock-toggle";
import { ObservedRangeStrip } from "./observed-range-strip";
import { sliderMaxCents } from "./slider-scale";
import { useAllocation, useMoney, type AllocationComponentProps } from "./store-context";

export interface ChannelRowProps extends AllocationComponentProps {
  channel: string;
  /**
   * The "Beyond observed range" sentence. A string replaces the row's own sentence (the prediction
   * layer's wording); `null` hides it; undefined lets the row compute it from the observed range.
   */
  rangeWarning?: string | null;
  /** Word for one period of the fit, e.g. "week". */
  periodNoun?: string;
  /** Show the floor/ceiling disclosure (default true). */
  showBounds?: boolean;
}

/**
 * One channel: label, slider, typed amount, lock, observed-range strip, optional bounds. Outside its
 * observed range the row gets an ember edge and a sentence (never colour alone).
 */
export function ChannelRow({ channel, rangeWarning, periodNoun, showBounds = true, store, money: moneyProp }: ChannelRowProps) {
  const labelId = useId();
  const money = useMoney(store, moneyProp);
  const row = useAllocation((state) => state.allocation.channels.find((c) => c.name === channel), store);
  const horizon = useAllocation((state) => state.allocation.horizonPeriods, store);
  const maxCents = useAllocation((state) => sliderMaxCents(state.allocation), store);
  const reason = useAllocation((state) => (state.lastReason?.channel === channel ? state.lastReason : null), store);
  const position = useMemo(() => (row ? observedPosition(row, horizon, money) : null), [row, horizon, money]);
  if (!row || !position) return null;

  const sentence = rangeWarning === undefined ? position.sentence : rangeWarning;
  const warned = Boolean(sentence);
  const scaleMax = Math.max(maxCents, row.amountCents);

  return (
    <div
      role="group"
      aria-labelledby={labelId}
      data-channel={channel}
      data-warning={warned ? "outside-range" : undefined}
      className={`rounded-md border-l-4 bg-white px-4 py-3 shadow-sm ${warned ? "border-ember" : "border-transparent"}`}
    >
      <div className="flex flex-wrap items-center gap-x-4 gap-y-2">
        <span id={labelId} className="w-28 shrink-0 font-medium text-river">
          {row.label}
        </span>
        <div className="min-w-40 flex-1">
          <ChannelSlider channel={channel} maxCents={scaleMax} store={store} money={money} />
          <ObservedRangeStrip
            position={position}
            amountCents={row.amountCents}
            maxCents={scaleMax}
            horizonPeriods={horizon}
            money={money}
            periodNoun={periodNoun}
          />
        </div>
        <ChannelAmountInput channel={channel} className="w-36" store={store} money={money} />
        <LockToggle channel={channel} store={store} />
      </div>
      {warned ? (
        <p className="mt-2 text-sm text-slate-800">
          <span className="font-semibold text-[#9f3f2c]">Beyond observed range: </span>
          {sentence}
        </p>
      ) : null}
      {/* Always mounted so screen readers announce the sentence when it appears. */}
      <p role="status" className={reason ? "mt-2 text-sm text-slate-700" : "sr-only"}>
        {reason?.message ?? ""}
      </p>
      {showBounds ? <BoundsDisclosure channel={channel} className="mt-2" store={store} money={money} /> : null}
    </div>
  );
}

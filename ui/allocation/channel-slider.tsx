"use client";

import * as Slider from "@radix-ui/react-slider";
import { useRef, type KeyboardEvent } from "react";
import { formatCents } from "@/server/planning/allocation";
import { dragStepCents, keyboardDelta, sliderMaxCents } from "./slider-scale";
import { useAllocation, useAllocationReadOnly, useAllocationStoreApi, useMoney, type AllocationComponentProps } from "./store-context";

export interface ChannelSliderProps extends AllocationComponentProps {
  /** Channel name (the model's term). */
  channel: string;
  /** Upper end of the slider in cents; defaults to the shared scale (total or ceiling). */
  maxCents?: number;
  className?: string;
}

/**
 * A channel's horizon spend as a radix slider. A drag is one undo step (begin/end gesture); the
 * keyboard moves 1% of the range per arrow and 10% per PageUp/PageDown, a held key being one step.
 * The store decides the value, so the thumb stops where the allocation rules stop it.
 */
export function ChannelSlider({ channel, maxCents, className, store: storeProp, money: moneyProp }: ChannelSliderProps) {
  const store = useAllocationStoreApi(storeProp);
  const money = useMoney(storeProp, moneyProp);
  const row = useAllocation((state) => state.allocation.channels.find((c) => c.name === channel), storeProp);
  const sharedMax = useAllocation((state) => sliderMaxCents(state.allocation), storeProp);
  // The gesture is store-wide; only the slider that opened it may close it (focus moving from one
  // slider's thumb to another's blurs the first one while the second is already dragging).
  const gestureOpen = useRef(false);
  const readOnly = useAllocationReadOnly();
  if (!row) return null;

  // A read-only plan (no scenario:write) never moves, by pointer or keyboard; locked rows are disabled too.
  const beginGesture = () => {
    if (readOnly) return;
    gestureOpen.current = true;
    store.getState().beginGesture();
  };
  const endGesture = () => {
    if (!gestureOpen.current) return;
    gestureOpen.current = false;
    store.getState().endGesture();
  };

  const max = Math.max(maxCents ?? sharedMax, row.amountCents);
  const range = max;

  const onKeyDown = (event: KeyboardEvent<HTMLSpanElement>) => {
    if (readOnly) return;
    const delta = keyboardDelta(event.key, event.shiftKey, range);
    if (delta === null) return;
    // Prevent radix's own stepping (it skips its handler when default is prevented) so the step is
    // a share of the range rather than the fine drag step.
    event.preventDefault();
    const current = store.getState().allocation.channels.find((c) => c.name === channel);
    if (!current) return;
    beginGesture();
    const next = delta === "min" ? 0 : delta === "max" ? max : current.amountCents + delta;
    store.getState().move(channel, Math.min(max, Math.max(0, next)));
  };
  return (
    <Slider.Root
      className={`relative flex h-6 w-full touch-none select-none items-center ${className ?? ""}`}
      min={0}
      max={max}
      step={dragStepCents(range)}
      value={[row.amountCents]}
      disabled={row.locked || readOnly}
      onPointerDown={beginGesture}
      onValueChange={([value]) => {
        if (!readOnly) store.getState().move(channel, value);
      }}
      onValueCommit={endGesture}
      onPointerUp={endGesture}
      onLostPointerCapture={endGesture}
      onKeyDown={onKeyDown}
      onKeyUp={endGesture}
      onBlur={endGesture}
    >
      <Slider.Track className="relative h-1.5 grow rounded-full bg-slate-300 data-[disabled]:bg-slate-200">
        <Slider.Range className="absolute h-full rounded-full bg-shallows data-[disabled]:bg-slate-400" />
      </Slider.Track>
      <Slider.Thumb
        aria-label={`${row.label} spend for the horizon`}
        aria-disabled={row.locked || readOnly || undefined}
        aria-valuetext={formatCents(row.amountCents, money)}
        className="block size-5 rounded-full border-2 border-white bg-river shadow outline-none focus-visible:ring-4 focus-visible:ring-shallows/50 data-[disabled]:bg-slate-400"
      />
    </Slider.Root>
  );
}

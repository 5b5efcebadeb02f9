"use client";

import { useLayoutEffect, useRef, useState } from "react";
import { IntervalRow } from "@/ui/charts/interval-row";
import { BottomAxis } from "@/ui/charts/bottom-axis";
import { linearScale } from "@/ui/charts/linear-scale";
import type { OutcomeInterval as Interval } from "@/server/predict/scenario-outcome";

/** Performance mark set each time the outcome's interval drawing changes (the latency benchmark reads it). */
export const INTERVAL_REDRAWN_MARK = "interval-redrawn";

export interface OutcomeIntervalProps {
  interval: Interval;
  domain: readonly [number, number];
  /** Dashed reference line, e.g. the starting plan's total. */
  reference?: number | null;
  /** Accessible description of the drawing. */
  label: string;
  tone?: "normal" | "warning";
  /** Formats axis ticks. */
  formatTick: (value: number) => string;
  /** Fixed width in pixels; by default the drawing fills its container. */
  width?: number;
  /** Set the redraw performance mark (only the main outcome drawing does). */
  markRedraw?: boolean;
}

/**
 * The outcome drawn the Tributary way (ui/charts IntervalRow): the pale shallows band is the
 * prediction interval, the darker band inside it the confidence interval, the solid tick the point;
 * with an axis in the outcome's unit below it.
 */
export function OutcomeInterval({ interval, domain, reference, label, tone = "normal", formatTick, width: fixedWidth, markRedraw = false }: OutcomeIntervalProps) {
  const drawn = useRef<string | null>(null);
  const box = useRef<HTMLDivElement>(null);
  const [measured, setMeasured] = useState(360);
  useLayoutEffect(() => {
    const element = box.current;
    if (!element || fixedWidth !== undefined) return;
    const update = () => setMeasured(Math.max(160, Math.floor(element.clientWidth)));
    update();
    const observer = new ResizeObserver(update);
    observer.observe(element);
    return () => observer.disconnect();
  }, [fixedWidth]);
  const width = fixedWidth ?? measured;
  const key = `${interval.mean}|${interval.confidence.join()}|${interval.prediction.join()}|${domain.join()}`;
  useLayoutEffect(() => {
    if (markRedraw && drawn.current !== key && typeof performance !== "undefined") performance.mark(INTERVAL_REDRAWN_MARK);
    drawn.current = key;
  }, [key, markRedraw]);
  const padding = 6;
  const scale = linearScale(domain, [padding, width - padding]);
  return (
    <div ref={box} data-testid={markRedraw ? "outcome-interval" : undefined} data-mean={interval.mean} className="w-full overflow-hidden">
      <IntervalRow
        domain={domain}
        point={interval.mean}
        confidence={interval.confidence}
        prediction={interval.prediction}
        reference={reference ?? null}
        width={width}
        height={34}
        label={label}
        tone={tone}
      />
      <svg width={width} height={24} aria-hidden="true" className="block">
        <BottomAxis top={1} scale={scale} numTicks={4} tickFormat={formatTick} tickLength={4} />
      </svg>
    </div>
  );
}

/**
 * A domain that holds still while the plan moves a little and widens when an interval would leave
 * it, so the bands visibly move instead of the axis.
 */
export function stableDomain(previous: readonly [number, number] | null, intervals: readonly Interval[]): [number, number] {
  const low = Math.min(...intervals.map((interval) => interval.prediction[0]));
  const high = Math.max(...intervals.map((interval) => interval.prediction[1]));
  if (previous && low >= previous[0] && high <= previous[1] && high - low > (previous[1] - previous[0]) * 0.3) return [previous[0], previous[1]];
  const air = Math.max((high - low) * 0.35, Math.abs(high) * 0.01, 1);
  return [low - air, high + air];
}

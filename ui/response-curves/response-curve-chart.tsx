"use client";

import { AxisBottom, AxisLeft } from "@visx/axis";
import { scaleLinear } from "@visx/scale";
import { Area, LinePath } from "@visx/shape";
import { type KeyboardEvent, useId, useState } from "react";
import { centsToAmount, type MoneyLocale } from "@/server/planning/allocation";
import type { ResponseCurve } from "@/server/planning/response-curves";
import type { PlanShape } from "@/server/predict/plan-shape";
import { chartColors, tickLabelProps } from "@/ui/charts/palette";
import { formatMoney, formatOutcome, formatOutcomeCompact, formatPercent } from "@/ui/scenario/format";

export interface ResponseCurveChartProps {
  curve: ResponseCurve;
  shape: PlanShape;
  money: MoneyLocale;
  width?: number;
  height?: number;
}

const margin = { top: 10, right: 22, bottom: 30, left: 52 };

function compactMoney(amount: number, money: MoneyLocale): string {
  return new Intl.NumberFormat(money.locale, { style: "currency", currency: money.currency, notation: "compact", maximumSignificantDigits: 3 }).format(amount);
}

/** "2.31" — enough digits to read a slope, not more than its interval supports. */
export function formatSlope(value: number, locale: string): string {
  const digits = Math.abs(value) >= 10 ? 1 : 2;
  return new Intl.NumberFormat(locale, { maximumFractionDigits: digits, minimumFractionDigits: digits }).format(value).replace("-", "−");
}

/**
 * One channel's response curve: the predicted horizon total (line) with its confidence band as the
 * channel's spend varies and the others stay at the plan; the spend the fit saw shaded; the plan's
 * amount marked. Focusable: ←/→ (Home/End) walk the curve and read each point aloud.
 */
export function ResponseCurveChart({ curve, shape, money, width = 300, height = 170 }: ResponseCurveChartProps) {
  const [cursor, setCursor] = useState<number | null>(null);
  const readoutId = useId();
  const points = curve.points;
  const x = (cents: number) => centsToAmount(cents);
  const innerWidth = width - margin.left - margin.right;
  const innerHeight = height - margin.top - margin.bottom;
  const xScale = scaleLinear<number>({ domain: [0, x(points[points.length - 1].amountCents)], range: [0, innerWidth] });
  const low = Math.min(...points.map((point) => point.confidence[0]), curve.current.confidence[0]);
  const high = Math.max(...points.map((point) => point.confidence[1]), curve.current.confidence[1]);
  const air = (high - low) * 0.06 || Math.abs(high) * 0.05 || 1;
  const yScale = scaleLinear<number>({ domain: [low - air, high + air], range: [innerHeight, 0], nice: true });
  const fmt = (value: number) => formatOutcome(value, shape, money);
  const percent = formatPercent(curve.marginalReturn.confidenceLevel, money.locale);
  const nearestToPlan = points.reduce((best, point, index) => (Math.abs(point.amountCents - curve.current.amountCents) < Math.abs(points[best].amountCents - curve.current.amountCents) ? index : best), 0);
  const active = cursor === null ? null : points[cursor];
  const describe = (point: (typeof points)[number]) =>
    `${curve.label} at ${formatMoney(x(point.amountCents), money)}: predicted ${fmt(point.mean)} (${percent} confidence ${fmt(point.confidence[0])} to ${fmt(point.confidence[1])})` +
    (point.beyondObservedRange ? ", beyond observed range" : point.unseenCombination ? ", unseen combination" : "");
  const observed = curve.observed;
  const summary =
    `Response curve of ${curve.label}: predicted ${shape.outcome.label.toLowerCase()} over the horizon as ${curve.label} spend goes from ` +
    `${formatMoney(0, money)} to ${formatMoney(x(points[points.length - 1].amountCents), money)}, other channels held at the plan. ` +
    (observed ? `Observed range ${formatMoney(x(observed.minCents), money)} to ${formatMoney(x(observed.maxCents), money)}. ` : "") +
    `At the plan (${formatMoney(x(curve.current.amountCents), money)}): ${fmt(curve.current.mean)}. Use the arrow keys to read points.`;

  const onKeyDown = (event: KeyboardEvent<SVGSVGElement>) => {
    const last = points.length - 1;
    const from = cursor ?? nearestToPlan;
    const next =
      event.key === "ArrowRight" || event.key === "ArrowUp" ? Math.min(last, from + 1)
      : event.key === "ArrowLeft" || event.key === "ArrowDown" ? Math.max(0, from - 1)
      : event.key === "Home" ? 0
      : event.key === "End" ? last
      : null;
    if (next === null) return;
    event.preventDefault();
    setCursor(next);
  };

  return (
    <div>
      <svg
        width={width}
        height={height}
        role="img"
        aria-label={summary}
        aria-describedby={readoutId}
        tabIndex={0}
        onKeyDown={onKeyDown}
        onFocus={() => setCursor((current) => current ?? nearestToPlan)}
        onBlur={() => setCursor(null)}
        className="block rounded focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-shallows"
      >
        <g transform={`translate(${margin.left},${margin.top})`}>
          {observed ? (
            <rect
              x={xScale(x(observed.minCents))}
              y={0}
              width={Math.max(1, xScale(x(observed.maxCents)) - xScale(x(observed.minCents)))}
              height={innerHeight}
              fill="#e9e3d3"
              data-testid="observed-range"
            />
          ) : null}
          {observed ? (
            <text x={xScale(x(observed.minCents)) + 3} y={10} fontSize={10} fill={chartColors.axis}>
              observed
            </text>
          ) : null}
          <Area
            data={points}
            x={(point) => xScale(x(point.amountCents))}
            y0={(point) => yScale(point.confidence[0])}
            y1={(point) => yScale(point.confidence[1])}
            fill={chartColors.shallowsMid}
            fillOpacity={0.7}
          />
          <LinePath data={points} x={(point) => xScale(x(point.amountCents))} y={(point) => yScale(point.mean)} stroke={chartColors.river} strokeWidth={2} />
          <line
            x1={xScale(x(curve.current.amountCents))}
            x2={xScale(x(curve.current.amountCents))}
            y1={0}
            y2={innerHeight}
            stroke={chartColors.ember}
            strokeDasharray="3 2"
            strokeWidth={1.5}
          />
          <circle cx={xScale(x(curve.current.amountCents))} cy={yScale(curve.current.mean)} r={4} fill={chartColors.ember} stroke="white" strokeWidth={1.5} />
          {active ? <circle cx={xScale(x(active.amountCents))} cy={yScale(active.mean)} r={5} fill="none" stroke={chartColors.river} strokeWidth={2} /> : null}
          <AxisLeft
            scale={yScale}
            numTicks={4}
            tickFormat={(value) => formatOutcomeCompact(Number(value), shape, money)}
            stroke={chartColors.grid}
            tickStroke={chartColors.grid}
            tickLabelProps={() => ({ ...tickLabelProps, textAnchor: "end" as const, dx: -4, dy: 3 })}
          />
          <AxisBottom
            top={innerHeight}
            scale={xScale}
            numTicks={4}
            tickFormat={(value) => compactMoney(Number(value), money)}
            stroke={chartColors.grid}
            tickStroke={chartColors.grid}
            tickLabelProps={() => ({ ...tickLabelProps, textAnchor: "middle" as const })}
          />
        </g>
      </svg>
      <p id={readoutId} aria-live="polite" className="num min-h-5 text-xs text-slate-700">
        {active ? describe(active) : null}
      </p>
    </div>
  );
}

"use client";

import { formatCentsCompact, type MoneyLocale, type ObservedPosition } from "@/server/planning/allocation";

export interface ObservedRangeStripProps {
  /** Where the channel sits against its observed range (from `observedPosition`). */
  position: ObservedPosition;
  amountCents: number;
  /** Right end of the strip in cents: the same scale as the slider above it. */
  maxCents: number;
  horizonPeriods: number;
  money: MoneyLocale;
  /** Word for one period of the fit ("week"); plural adds "s" unless `periodPlural` is given. */
  periodNoun?: string;
  periodPlural?: string;
  className?: string;
}

const pct = (cents: number, max: number) => `${Math.min(100, Math.max(0, (cents / max) * 100))}%`;

/**
 * A thin bar under the slider: the band is the spend the fit saw (per-period min–max × the horizon's
 * periods), the tick is the current amount. The caption states the range and the conversion in words,
 * so nothing depends on colour.
 */
export function ObservedRangeStrip({
  position,
  amountCents,
  maxCents,
  horizonPeriods,
  money,
  periodNoun = "period",
  periodPlural,
  className,
}: ObservedRangeStripProps) {
  if (position.minCents === undefined || position.maxCents === undefined) {
    return <p className={`text-xs text-slate-600 ${className ?? ""}`}>No observed range for this channel.</p>;
  }
  const outside = position.status === "above" || position.status === "below";
  const periods = horizonPeriods === 1 ? `1 ${periodNoun}` : `${horizonPeriods} ${periodPlural ?? `${periodNoun}s`}`;
  const perPeriodMin = formatCentsCompact(Math.round(position.minCents / horizonPeriods), money);
  const perPeriodMax = formatCentsCompact(Math.round(position.maxCents / horizonPeriods), money);
  return (
    <div className={className}>
      {/* Inset by half the slider thumb (size-5) so positions line up with radix's in-bounds thumb. */}
      <div aria-hidden="true" className="relative mx-2.5 h-3">
        <div className="absolute inset-x-0 top-1 h-1 rounded-full bg-slate-200" />
        <div
          className="absolute top-1 h-1 rounded-full bg-shallows-mid"
          style={{ left: pct(position.minCents, maxCents), width: `calc(${pct(position.maxCents, maxCents)} - ${pct(position.minCents, maxCents)})` }}
        />
        <div
          className={`absolute top-0 h-3 w-0.5 -translate-x-1/2 ${outside ? "bg-ember" : "bg-river"}`}
          style={{ left: pct(amountCents, maxCents) }}
        />
      </div>
      <p className="num text-xs text-slate-600">
        Observed {formatCentsCompact(position.minCents, money)}–{formatCentsCompact(position.maxCents, money)} over {periods} (
        {perPeriodMin}–{perPeriodMax} per {periodNoun} × {horizonPeriods})
      </p>
    </div>
  );
}

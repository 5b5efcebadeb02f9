import { observedRangeForHorizon } from "./horizon";
import { formatCentsCompact, type MoneyLocale } from "./money";
import type { AllocationChannel } from "./types";

/** Where a channel's horizon amount sits relative to the spend the fit saw (scaled to the horizon). */
export interface ObservedPosition {
  status: "inside" | "above" | "below" | "unknown";
  /** Observed range for the horizon, in cents (per-period range × periods). */
  minCents?: number;
  maxCents?: number;
  /** How far outside, in cents (0 inside). */
  beyondCents: number;
  /** Plain sentence for a channel outside its range, e.g. "Podcast at €41K is 18% above the most it ever had (€35K)". */
  sentence?: string;
}

function percent(part: number, whole: number): string {
  const value = Math.round((part / whole) * 100);
  return value < 1 ? "less than 1%" : `${value}%`;
}

/**
 * Compares a channel's amount with its observed range for the horizon. The range is per period in
 * the data, so it is multiplied by the horizon's periods (spend is assumed spread evenly).
 */
export function observedPosition(channel: AllocationChannel, horizonPeriods: number, money: MoneyLocale): ObservedPosition {
  const range = observedRangeForHorizon(channel.observed, horizonPeriods);
  if (!range) return { status: "unknown", beyondCents: 0 };
  const amount = channel.amountCents;
  const fmt = (cents: number) => formatCentsCompact(cents, money);
  if (amount > range.maxCents) {
    const how = range.maxCents > 0 ? `${percent(amount - range.maxCents, range.maxCents)} above` : "above";
    return {
      status: "above",
      ...range,
      beyondCents: amount - range.maxCents,
      sentence: `${channel.label} at ${fmt(amount)} is ${how} the most it ever had (${fmt(range.maxCents)}).`,
    };
  }
  if (amount < range.minCents) {
    // "100% below" reads oddly for a channel switched off; say it plainly.
    const how = amount === 0 ? "below" : `${percent(range.minCents - amount, range.minCents)} below`;
    return {
      status: "below",
      ...range,
      beyondCents: range.minCents - amount,
      sentence: `${channel.label} at ${fmt(amount)} is ${how} the least it ever had (${fmt(range.minCents)}).`,
    };
  }
  return { status: "inside", ...range, beyondCents: 0 };
}

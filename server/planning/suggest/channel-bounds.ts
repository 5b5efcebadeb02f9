/**
 * Each channel's allowed horizon amount in whole cents, and which rule sets each end — the
 * optimiser's box, and the words for a channel that ends up against it.
 *
 * Low end: the largest of zero, the planner's floor and (when kept) the least spend seen per
 * period × H. High end: the smallest of the planner's ceiling and the most seen per period × H;
 * when neither exists, whatever the total leaves after the others' low ends. A locked channel's
 * ends are its current amount. Observed ends are rounded *inward* to a whole cent and then checked
 * with the scenario screen's own arithmetic (cents → currency ÷ H), so a suggestion at its end is
 * never reported "Beyond observed range" by a floating-point hair.
 */
import type { AllocationState } from "@/server/planning/allocation";
import type { FitRecord } from "@/server/stats";
import { perPeriodSpend } from "./period-groups";

export type LowSource = "locked" | "floor" | "observed-min" | "zero";
export type HighSource = "locked" | "ceiling" | "observed-max" | "total";

export interface ChannelBound {
  lowCents: number;
  highCents: number;
  lowSource: LowSource;
  highSource: HighSource;
  /** Spend per period the fit saw, in currency units (null when the record has no range). */
  observed: { minimum: number; maximum: number } | null;
}

export interface BoundsProblem {
  path: string;
  message: string;
}

/** Smallest whole cent whose per-period spend is at least `minimum`. */
function centsAtLeast(minimum: number, horizonPeriods: number): number {
  let cents = Math.max(0, Math.ceil(minimum * horizonPeriods * 100));
  while (perPeriodSpend(cents, horizonPeriods) < minimum) cents += 1;
  while (cents > 0 && perPeriodSpend(cents - 1, horizonPeriods) >= minimum) cents -= 1;
  return cents;
}

/** Largest whole cent whose per-period spend is at most `maximum`. */
function centsAtMost(maximum: number, horizonPeriods: number): number {
  let cents = Math.floor(maximum * horizonPeriods * 100);
  while (perPeriodSpend(cents, horizonPeriods) > maximum) cents -= 1;
  while (perPeriodSpend(cents + 1, horizonPeriods) <= maximum) cents += 1;
  return cents;
}

/**
 * The box of every channel, or the reasons there is none. `budgetCents` is the fixed total, or the
 * growing ceiling. Cost: O(n).
 */
export function channelBounds(
  state: AllocationState,
  record: FitRecord,
  keepInsideObservedRange: boolean,
  budgetCents: number,
): { bounds: ChannelBound[]; problems: BoundsProblem[] } {
  const problems: BoundsProblem[] = [];
  const H = state.horizonPeriods;
  const bounds = state.channels.map((channel): ChannelBound => {
    const range = record.columnRanges[channel.name];
    const observed = range ? { minimum: range.minimum, maximum: range.maximum } : null;
    if (channel.locked) {
      return { lowCents: channel.amountCents, highCents: channel.amountCents, lowSource: "locked", highSource: "locked", observed };
    }
    let lowCents = 0;
    let lowSource: LowSource = "zero";
    let highCents = Infinity;
    let highSource: HighSource = "total";
    if (channel.floorCents !== undefined && channel.floorCents > lowCents) [lowCents, lowSource] = [channel.floorCents, "floor"];
    if (channel.ceilingCents !== undefined) [highCents, highSource] = [channel.ceilingCents, "ceiling"];
    if (keepInsideObservedRange && observed) {
      const observedLow = centsAtLeast(observed.minimum, H);
      const observedHigh = centsAtMost(observed.maximum, H);
      if (observedLow > lowCents) [lowCents, lowSource] = [observedLow, "observed-min"];
      if (observedHigh < highCents) [highCents, highSource] = [observedHigh, "observed-max"];
    }
    if (lowCents > highCents) {
      problems.push({
        path: `channels.${channel.name}`,
        message:
          `${channel.label} has no room: it must get at least ${lowCents / 100} (${lowSource.replace("-", " ")}) ` +
          `but at most ${highCents / 100} (${highSource.replace("-", " ")}). Change its bounds, or let the plan leave the observed range.`,
      });
    }
    return { lowCents, highCents, lowSource, highSource, observed };
  });
  if (problems.length > 0) return { bounds, problems };
  // Without an upper bound a channel can take at most what the total leaves after the others' floors.
  const lowSum = bounds.reduce((sum, bound) => sum + bound.lowCents, 0);
  for (const bound of bounds) {
    if (bound.lowSource === "locked") continue;
    const implied = budgetCents - (lowSum - bound.lowCents);
    if (implied < bound.highCents) [bound.highCents, bound.highSource] = [Math.max(bound.lowCents, implied), "total"];
  }
  return { bounds, problems };
}

import type { AllocationChannel, AllocationMode, AllocationState, ClampReason } from "./types";

/** Lowest amount a channel may hold: its floor, and never below zero. */
export function lowOf(channel: AllocationChannel): number {
  return Math.max(0, channel.floorCents ?? 0);
}

/** Highest amount a channel may hold (Infinity without a ceiling). */
export function highOf(channel: AllocationChannel): number {
  return channel.ceilingCents ?? Infinity;
}

/** Sum of the channels' amounts, in cents. */
export function sumCents(channels: readonly AllocationChannel[]): number {
  let sum = 0;
  for (const channel of channels) sum += channel.amountCents;
  return sum;
}

/** Index of a channel by name, or -1. */
export function channelIndex(state: AllocationState, name: string): number {
  return state.channels.findIndex((channel) => channel.name === name);
}

/** Reason returned when an edit names a channel that is not in the allocation. */
export function unknownChannel(name: string): ClampReason {
  return { kind: "invalid", message: `There is no channel called "${name}".`, channel: name };
}

/**
 * Returns a copy of `state` with new amounts (indexed like `state.channels`), keeping unchanged
 * channel objects so React selectors on untouched rows do not re-render.
 */
export function withAmounts(state: AllocationState, amounts: readonly number[], totalCents?: number): AllocationState {
  let changed = false;
  const channels = state.channels.map((channel, index) => {
    if (channel.amountCents === amounts[index]) return channel;
    changed = true;
    return { ...channel, amountCents: amounts[index] };
  });
  const total = totalCents ?? sumCents(channels);
  if (!changed && total === state.totalCents) return state;
  return { ...state, channels, totalCents: total };
}

/** Input for {@link createAllocationState}. */
export interface AllocationInit {
  mode?: AllocationMode;
  channels: readonly AllocationChannel[];
  horizonPeriods: number;
  /** Growing mode ceiling in cents; if absent, `growth` decides it. */
  ceilingCents?: number;
  /** Growing mode growth over the base total (0.1 = +10%); default 0.1. */
  growth?: number;
}

/**
 * Builds a consistent state from a starting allocation: total = base total = sum of the amounts,
 * ceiling = base × (1 + growth) unless given (and never below the total).
 */
export function createAllocationState(init: AllocationInit): AllocationState {
  if (!Number.isInteger(init.horizonPeriods) || init.horizonPeriods <= 0) {
    throw new RangeError(`The horizon must be a whole number of periods above 0 (got ${init.horizonPeriods})`);
  }
  for (const channel of init.channels) {
    if (!Number.isInteger(channel.amountCents)) throw new RangeError(`${channel.label}: amounts are whole cents`);
  }
  const total = sumCents(init.channels);
  const ceiling = init.ceilingCents ?? Math.round(total * (1 + (init.growth ?? 0.1)));
  return {
    mode: init.mode ?? "fixed",
    channels: init.channels.map((channel) => ({ ...channel })),
    totalCents: total,
    baseTotalCents: total,
    ceilingCents: Math.max(ceiling, total),
    horizonPeriods: init.horizonPeriods,
  };
}

import { rebalanceFixedTotal } from "./fixed-total";
import { adjustGrowingTotal } from "./growing-total";
import { plainCentsFormatter } from "./money";
import { channelIndex, highOf, lowOf, unknownChannel } from "./state";
import type { AllocationMode, AllocationResult, AllocationState, EditOptions } from "./types";

/** Moves one channel with the rule of the state's mode (fixed or growing total). */
export function moveChannel(
  state: AllocationState,
  channelName: string,
  requestedCents: number,
  options: EditOptions = {},
): AllocationResult {
  return state.mode === "fixed"
    ? rebalanceFixedTotal(state, channelName, requestedCents, options)
    : adjustGrowingTotal(state, channelName, requestedCents, options);
}

/** Locks or unlocks a channel (a locked channel is held still while others move). */
export function setLocked(state: AllocationState, channelName: string, locked: boolean): AllocationResult {
  const index = channelIndex(state, channelName);
  if (index < 0) return { state, reason: unknownChannel(channelName) };
  if (state.channels[index].locked === locked) return { state };
  const channels = state.channels.map((channel, i) => (i === index ? { ...channel, locked } : channel));
  return { state: { ...state, channels } };
}

/** Flips a channel's lock. */
export function toggleLock(state: AllocationState, channelName: string): AllocationResult {
  const index = channelIndex(state, channelName);
  if (index < 0) return { state, reason: unknownChannel(channelName) };
  return setLocked(state, channelName, !state.channels[index].locked);
}

/** New bounds for a channel; a missing field means "no bound". */
export interface ChannelBounds {
  floorCents?: number;
  ceilingCents?: number;
}

/**
 * Replaces a channel's floor and ceiling. If its amount falls outside the new bounds, it is moved to
 * the nearest bound with the mode's rule (the others absorb the change); if that is impossible — the
 * channel is locked or the others cannot absorb it — nothing changes and the reason says why.
 */
export function setBounds(
  state: AllocationState,
  channelName: string,
  bounds: ChannelBounds,
  options: EditOptions = {},
): AllocationResult {
  const format = options.format ?? plainCentsFormatter;
  const index = channelIndex(state, channelName);
  if (index < 0) return { state, reason: unknownChannel(channelName) };
  const channel = state.channels[index];
  const { floorCents, ceilingCents } = bounds;
  const invalid = (message: string): AllocationResult => ({ state, reason: { kind: "invalid", message, channel: channelName } });

  for (const [word, value] of [["floor", floorCents], ["ceiling", ceilingCents]] as const) {
    if (value === undefined) continue;
    if (!Number.isInteger(value)) return invalid(`${channel.label}'s ${word} must be an amount in whole cents.`);
    if (value < 0) return invalid(`${channel.label}'s ${word} can't be negative.`);
  }
  if (floorCents !== undefined && ceilingCents !== undefined && floorCents > ceilingCents) {
    return invalid(`${channel.label}'s floor (${format(floorCents)}) is above its ceiling (${format(ceilingCents)}).`);
  }
  if (channel.floorCents === floorCents && channel.ceilingCents === ceilingCents) return { state };

  const bounded = { ...channel, floorCents, ceilingCents };
  const withBounds: AllocationState = {
    ...state,
    channels: state.channels.map((c, i) => (i === index ? bounded : c)),
  };
  const amount = channel.amountCents;
  if (amount >= lowOf(bounded) && amount <= highOf(bounded)) return { state: withBounds };

  const nearest = amount < lowOf(bounded) ? lowOf(bounded) : highOf(bounded);
  if (channel.locked) {
    return invalid(`${channel.label} is locked at ${format(amount)}, outside those bounds; unlock it first.`);
  }
  // Moving with the mode's rule keeps the fixed total (or the ceiling) intact while meeting the bound.
  const moved = moveChannel(withBounds, channelName, nearest, options);
  if (moved.state.channels[index].amountCents !== nearest) {
    const why = moved.reason?.message ?? "";
    return invalid(`${channel.label} can't be moved to ${format(nearest)} to meet those bounds. ${why}`.trim());
  }
  return { state: moved.state };
}

/**
 * Switches between fixed and growing total. Amounts never change; the base total and ceiling are
 * kept (they belong to the scenario), except that the ceiling is raised to the total if a fixed-mode
 * edit took the total above it.
 */
export function setMode(state: AllocationState, mode: AllocationMode): AllocationResult {
  if (state.mode === mode) return { state };
  return { state: { ...state, mode, ceilingCents: Math.max(state.ceilingCents, state.totalCents) } };
}

import { lockedMessage, ownBoundMessage } from "./reasons";
import { plainCentsFormatter } from "./money";
import { channelIndex, highOf, lowOf, unknownChannel } from "./state";
import type { AllocationChannel, AllocationResult, AllocationState, CentsFormatter, ClampReason, EditOptions } from "./types";

/** A move that may go ahead: the channel, its index, the clamped target and why it was clamped. */
export type MoveStart = {
  format: CentsFormatter;
  index: number;
  channel: AllocationChannel;
  targetCents: number;
  reason?: ClampReason;
};

/**
 * The start every mode's move shares: find the channel, then clamp the request to its own bounds.
 * Returns the finished result instead when the move cannot start (unknown channel, locked, not an amount).
 */
export function beginMove(
  state: AllocationState,
  channelName: string,
  requestedCents: number,
  options: EditOptions,
): { done: AllocationResult } | { move: MoveStart } {
  const format = options.format ?? plainCentsFormatter;
  const index = channelIndex(state, channelName);
  if (index < 0) return { done: { state, reason: unknownChannel(channelName) } };
  const channel = state.channels[index];
  const own = clampToOwnBounds(channel, requestedCents, format);
  if (!own.ok) return { done: { state, reason: own.reason } };
  return { move: { format, index, channel, targetCents: own.targetCents, reason: own.reason } };
}

/**
 * First step of every move: a locked channel refuses, and a request is rounded to whole cents and
 * clamped to the channel's own floor/ceiling (and zero).
 */
export function clampToOwnBounds(
  channel: AllocationChannel,
  requestedCents: number,
  format: CentsFormatter,
): { ok: false; reason: ClampReason } | { ok: true; targetCents: number; reason?: ClampReason } {
  if (channel.locked) {
    return { ok: false, reason: { kind: "channel-locked", message: lockedMessage(channel.label), channel: channel.name } };
  }
  if (!Number.isFinite(requestedCents)) {
    return { ok: false, reason: { kind: "invalid", message: `${channel.label}: that is not an amount.`, channel: channel.name } };
  }
  const requested = Math.round(requestedCents);
  const low = lowOf(channel);
  const high = highOf(channel);
  if (requested < low) {
    const kind = requested < 0 && low === 0 ? "negative" : "own-floor";
    return { ok: true, targetCents: low, reason: { kind, message: ownBoundMessage(channel.label, kind, low, format), channel: channel.name } };
  }
  if (requested > high) {
    return {
      ok: true,
      targetCents: high,
      reason: { kind: "own-ceiling", message: ownBoundMessage(channel.label, "own-ceiling", high, format), channel: channel.name },
    };
  }
  return { ok: true, targetCents: requested };
}

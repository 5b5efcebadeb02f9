import { lockedMessage, ownBoundMessage } from "./reasons";
import { highOf, lowOf } from "./state";
import type { AllocationChannel, CentsFormatter, ClampReason } from "./types";

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

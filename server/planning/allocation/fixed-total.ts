import { capacity, distributeProportionally, type Slot } from "./distribute";
import { plainCentsFormatter } from "./money";
import { beginMove } from "./own-bounds";
import { describeBlockers, findBlockers, othersExhaustedMessage } from "./reasons";
import { highOf, lowOf, withAmounts } from "./state";
import type { AllocationChannel, AllocationResult, AllocationState, ClampReason, EditOptions } from "./types";

/** The unlocked channels other than `exceptIndex`, as redistribution slots. */
export function unlockedSlots(
  channels: readonly AllocationChannel[],
  exceptIndex: number | null,
): { index: number; slot: Slot }[] {
  const out: { index: number; slot: Slot }[] = [];
  channels.forEach((channel, index) => {
    if (index === exceptIndex || channel.locked) return;
    out.push({ index, slot: { amountCents: channel.amountCents, lowCents: lowOf(channel), highCents: highOf(channel) } });
  });
  return out;
}

/**
 * Moves money between channels so that `totalCents` stays exactly the same: one channel is set to
 * `requestedCents` and the unlocked others absorb the difference in proportion to their current
 * amounts (equally if they are all at zero), each within its floor/ceiling and never below zero.
 *
 * When the others cannot absorb the whole change, the channel stops at the feasible extreme and the
 * result carries a `reason` ("Only €1,200 can move: Search and Video are at their floors, Radio is
 * locked."). A locked channel is never changed.
 *
 * @param requestedCents the channel's new amount for the horizon, in cents (rounded to a whole cent).
 * @returns the next state (the same object when nothing changed) and, if cut short, why.
 */
export function rebalanceFixedTotal(
  state: AllocationState,
  channelName: string,
  requestedCents: number,
  options: EditOptions = {},
): AllocationResult {
  const begun = beginMove(state, channelName, requestedCents, options);
  if ("done" in begun) return begun.done;
  const { format, index, channel } = begun.move;
  let target = begun.move.targetCents;
  let reason: ClampReason | undefined = begun.move.reason;
  const others = unlockedSlots(state.channels, index);
  const slots = others.map((other) => other.slot);
  const othersDelta = channel.amountCents - target;
  const othersDirection: 1 | -1 = othersDelta > 0 ? 1 : -1;
  const room = capacity(slots, othersDirection);

  let applied = othersDelta;
  if (Math.abs(othersDelta) > room) {
    applied = othersDirection * room;
    target = channel.amountCents - applied;
  }

  const moved = distributeProportionally(slots, applied);
  const amounts = state.channels.map((c) => c.amountCents);
  amounts[index] = target;
  others.forEach((other, k) => (amounts[other.index] = moved[k]));

  if (applied !== othersDelta) {
    const blockers = findBlockers(state.channels, index, others, amounts, othersDirection);
    reason = {
      kind: "others-exhausted",
      channel: channel.name,
      movedCents: Math.abs(applied),
      blockers,
      message: othersExhaustedMessage({
        label: channel.label,
        movedCents: Math.abs(applied),
        limitCents: target,
        up: othersDirection < 0,
        causes: [describeBlockers(blockers)],
        format,
      }),
    };
  }
  // The total is unchanged by construction; passing it keeps that explicit.
  return { state: withAmounts(state, amounts, state.totalCents), reason };
}

/**
 * Changes the total and scales the unlocked channels proportionally to reach it, each within its
 * bounds (locked channels keep their amounts). If the unlocked channels cannot reach it, the total
 * stops at the nearest reachable value with a reason. In growing mode the total also stays at or
 * below the ceiling.
 */
export function setTotal(state: AllocationState, requestedTotalCents: number, options: EditOptions = {}): AllocationResult {
  const format = options.format ?? plainCentsFormatter;
  if (!Number.isFinite(requestedTotalCents)) {
    return { state, reason: { kind: "invalid", message: "That is not an amount." } };
  }
  let requested = Math.round(requestedTotalCents);
  let reason: ClampReason | undefined;
  if (requested < 0) {
    requested = 0;
    reason = { kind: "negative", message: "The total can't be negative." };
  }
  if (state.mode === "growing" && requested > state.ceilingCents) {
    requested = state.ceilingCents;
    reason = { kind: "total-ceiling", message: `The total can't go above the ceiling (${format(state.ceilingCents)}).` };
  }

  const slotsWithIndex = unlockedSlots(state.channels, null);
  const slots = slotsWithIndex.map((entry) => entry.slot);
  const delta = requested - state.totalCents;
  const direction: 1 | -1 = delta > 0 ? 1 : -1;
  const room = capacity(slots, direction);
  let applied = delta;
  if (Math.abs(delta) > room) applied = direction * room;

  const moved = distributeProportionally(slots, applied);
  const amounts = state.channels.map((c) => c.amountCents);
  slotsWithIndex.forEach((entry, k) => (amounts[entry.index] = moved[k]));
  const total = state.totalCents + applied;

  if (applied !== delta) {
    const blockers = findBlockers(state.channels, null, slotsWithIndex, amounts, direction);
    reason = {
      kind: "total-bounds",
      movedCents: Math.abs(applied),
      blockers,
      message: `The total can only go ${direction > 0 ? "up" : "down"} to ${format(total)}: ${describeBlockers(blockers)}.`,
    };
  }
  return { state: withAmounts(state, amounts, total), reason };
}

import { capacity, distributeProportionally } from "./distribute";
import { unlockedSlots } from "./fixed-total";
import { plainCentsFormatter } from "./money";
import { beginMove } from "./own-bounds";
import { describeBlockers, findBlockers, othersExhaustedMessage } from "./reasons";
import { withAmounts } from "./state";
import type { AllocationResult, AllocationState, ClampReason, EditOptions } from "./types";

/** Money the total can still grow by before it reaches the ceiling (never negative). */
export function headroomCents(state: AllocationState): number {
  return Math.max(0, state.ceilingCents - state.totalCents);
}

/** The growth the ceiling allows over the base total (0.1 = +10%); 0 when the base is 0. */
export function growthOf(state: AllocationState): number {
  return state.baseTotalCents > 0 ? state.ceilingCents / state.baseTotalCents - 1 : 0;
}

/**
 * Growing-total move. Lowering a channel lowers the total (no other channel rises). Raising it uses
 * the headroom under the ceiling first; once the total is at the ceiling the rest is taken from the
 * unlocked others in proportion to their amounts, exactly like the fixed-total rule. Bounds hold, and
 * a request that cannot be met stops at the feasible extreme with a reason.
 *
 * @param requestedCents the channel's new amount for the horizon, in cents.
 */
export function adjustGrowingTotal(
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
  const amounts = state.channels.map((c) => c.amountCents);
  const delta = target - channel.amountCents;

  if (delta <= 0) {
    amounts[index] = target;
    return { state: withAmounts(state, amounts, state.totalCents + delta), reason };
  }

  const fromHeadroom = Math.min(delta, headroomCents(state));
  const others = unlockedSlots(state.channels, index);
  const slots = others.map((other) => other.slot);
  const wanted = delta - fromHeadroom;
  const taken = Math.min(wanted, capacity(slots, -1));
  target = channel.amountCents + fromHeadroom + taken;

  const moved = distributeProportionally(slots, -taken);
  others.forEach((other, k) => (amounts[other.index] = moved[k]));
  amounts[index] = target;

  if (taken < wanted) {
    const blockers = findBlockers(state.channels, index, others, amounts, -1);
    const causes = [`the total is at its ceiling (${format(state.ceilingCents)})`];
    if (others.length > 0 || blockers.length > 0) causes.push(describeBlockers(blockers));
    reason = {
      kind: "total-ceiling",
      channel: channel.name,
      movedCents: fromHeadroom + taken,
      blockers,
      message: othersExhaustedMessage({
        label: channel.label,
        movedCents: fromHeadroom + taken,
        limitCents: target,
        up: true,
        causes,
        format,
        movedWord: `more can go to ${channel.label}`,
      }),
    };
  }
  return { state: withAmounts(state, amounts, state.totalCents + fromHeadroom), reason };
}

/**
 * Sets the growing-mode ceiling directly. It never goes below the current total: the planner lowers
 * channels first, so no amount changes behind their back.
 */
export function setCeiling(state: AllocationState, ceilingCents: number, options: EditOptions = {}): AllocationResult {
  const format = options.format ?? plainCentsFormatter;
  if (!Number.isFinite(ceilingCents)) return { state, reason: { kind: "invalid", message: "That is not an amount." } };
  let ceiling = Math.round(ceilingCents);
  let reason: ClampReason | undefined;
  if (ceiling < state.totalCents) {
    ceiling = state.totalCents;
    reason = {
      kind: "total-ceiling",
      message: `The ceiling can't be below the current total (${format(state.totalCents)}); lower a channel first.`,
    };
  }
  if (ceiling === state.ceilingCents) return { state, reason };
  return { state: { ...state, ceilingCents: ceiling }, reason };
}

/** Sets the ceiling as growth over the base total: ceiling = base × (1 + growth), rounded to the cent. */
export function setGrowth(state: AllocationState, growth: number, options: EditOptions = {}): AllocationResult {
  if (!Number.isFinite(growth)) return { state, reason: { kind: "invalid", message: "That is not a percentage." } };
  return setCeiling(state, Math.round(state.baseTotalCents * (1 + growth)), options);
}

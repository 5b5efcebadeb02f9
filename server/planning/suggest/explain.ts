/** The plain sentences of a suggestion: which constraints bind, how to read it, and the caution. */
import type { AllocationState, CentsFormatter } from "@/server/planning/allocation";
import type { ChannelBound } from "./channel-bounds";
import type { BindingConstraint } from "./types";

/** Always shown beside a suggestion (design notes, "Cautions"). */
export const suggestionCaution =
  "A fit of past spend is not proof that moving money causes the gain; test the shift on part of the budget first.";

export interface BindingContext {
  state: AllocationState;
  bounds: readonly ChannelBound[];
  amountsCents: readonly number[];
  hull: { binding: boolean; leverage: number; maxTrainingLeverage: number };
  format: CentsFormatter;
  periodNoun: string;
}

/** Whole cents of a per-period currency amount, for "(€31K per week)". */
function perPeriodCents(amount: number): number {
  return Math.round(amount * 100);
}

function channelBinding(context: BindingContext, index: number): BindingConstraint | null {
  const channel = context.state.channels[index];
  const bound = context.bounds[index];
  const amount = context.amountsCents[index];
  const { format, periodNoun } = context;
  const name = channel.name;
  if (channel.locked) return { kind: "locked", channel: name, message: `${channel.label} is locked at ${format(amount)}.` };
  if (amount >= bound.highCents && bound.highSource === "ceiling") {
    return { kind: "ceiling", channel: name, message: `${channel.label} is at its ceiling (${format(bound.highCents)}).` };
  }
  if (amount >= bound.highCents && bound.highSource === "observed-max" && bound.observed) {
    return {
      kind: "observed-max",
      channel: name,
      message: `${channel.label} is at the top of the spend it has been seen at (${format(perPeriodCents(bound.observed.maximum))} per ${periodNoun}).`,
    };
  }
  if (amount > bound.lowCents) return null;
  if (bound.lowSource === "floor") return { kind: "floor", channel: name, message: `${channel.label} is at its floor (${format(bound.lowCents)}).` };
  if (bound.lowSource === "observed-min" && bound.observed) {
    return {
      kind: "observed-min",
      channel: name,
      message: `${channel.label} is at the least it has been seen at (${format(perPeriodCents(bound.observed.minimum))} per ${periodNoun}).`,
    };
  }
  return { kind: "zero", channel: name, message: `${channel.label} gets nothing: spend can't go below zero.` };
}

/** Every constraint the suggestion stands against, channels first in plan order. */
export function bindingConstraints(context: BindingContext): BindingConstraint[] {
  const binding: BindingConstraint[] = [];
  context.state.channels.forEach((_, index) => {
    const found = channelBinding(context, index);
    if (found) binding.push(found);
  });
  const total = context.amountsCents.reduce((sum, value) => sum + value, 0);
  const { state, format, periodNoun, hull } = context;
  if (state.mode === "fixed") binding.push({ kind: "total-fixed", message: `The whole fixed total (${format(state.totalCents)}) is spent.` });
  else if (total >= state.ceilingCents) binding.push({ kind: "total-ceiling", message: `The total is at the ceiling (${format(state.ceilingCents)}).` });
  if (hull.binding) {
    binding.push({
      kind: "hull",
      message:
        `The plan is at the edge of the combinations of spend seen in the history ` +
        `(leverage ${hull.leverage.toPrecision(3)}, the largest of any past ${periodNoun}).`,
    });
  }
  return binding;
}

/** The sentence for a growing total that stops under its ceiling, or null. */
export function headroomNote(state: AllocationState, totalCents: number, everyChannelFull: boolean, format: CentsFormatter): string | null {
  if (state.mode !== "growing" || totalCents >= state.ceilingCents) return null;
  const under = `The total stays ${format(state.ceilingCents - totalCents)} under the ceiling`;
  if (everyChannelFull) return `${under}: every channel is at its upper limit or locked.`;
  return `${under}: the fit does not predict a gain from spending more on the channels that still have room.`;
}

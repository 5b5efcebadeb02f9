/** A suggestion as an allocation state: the unsaved draft the scenario screen opens beside the current plan. */
import type { AllocationState } from "@/server/planning/allocation";
import type { Suggestion } from "./types";

/**
 * The state with the suggested amounts; everything else (mode, locks, bounds, ceiling, base total)
 * is the planner's and stays. The total becomes the suggestion's sum, which a fixed total keeps.
 *
 * @throws if the suggestion names channels the state does not have (it was made for another plan)
 */
export function applySuggestion(state: AllocationState, suggestion: Suggestion): AllocationState {
  const channels = state.channels.map((channel) => {
    const amountCents = suggestion.allocation[channel.name];
    if (amountCents === undefined) throw new Error(`applySuggestion requires an amount for channel '${channel.name}'`);
    return amountCents === channel.amountCents ? channel : { ...channel, amountCents };
  });
  return { ...state, channels, totalCents: channels.reduce((sum, channel) => sum + channel.amountCents, 0) };
}

import type { SuggestResponse } from "@/app/api/fits/[id]/suggest/schema";
import { type AllocationState, allocationPerHorizon, amountToCents, centsToAmount } from "@/server/planning/allocation";
import { type AllocationStore, DEFAULT_HISTORY_LIMIT } from "@/ui/stores/allocation-store";

export type { SuggestResponse };

/** Rules of the suggestion the planner can switch (both on by default). */
export interface SuggestOptions {
  keepInsideObservedRange: boolean;
  keepInsideHull: boolean;
}

/** The request for the plan on screen: its amounts, mode, total or ceiling, locks and bounds. */
export function suggestRequestBody(allocation: AllocationState, controls: Record<string, number>, options: SuggestOptions) {
  const floors: Record<string, number> = {};
  const ceilings: Record<string, number> = {};
  for (const channel of allocation.channels) {
    if (channel.floorCents !== undefined) floors[channel.name] = centsToAmount(channel.floorCents);
    if (channel.ceilingCents !== undefined) ceilings[channel.name] = centsToAmount(channel.ceilingCents);
  }
  return {
    allocation: allocationPerHorizon(allocation),
    controls,
    horizon: allocation.horizonPeriods,
    mode: allocation.mode,
    ...(allocation.mode === "fixed" ? { total: centsToAmount(allocation.totalCents) } : { ceiling: centsToAmount(allocation.ceilingCents) }),
    locks: allocation.channels.filter((channel) => channel.locked).map((channel) => channel.name),
    floors,
    ceilings,
    ...options,
  };
}

export class SuggestError extends Error {
  constructor(
    message: string,
    readonly status: number,
    readonly details: { path?: string; message: string }[],
  ) {
    super(message);
  }
}

export async function fetchSuggestion(fitId: string, body: unknown, signal?: AbortSignal): Promise<SuggestResponse> {
  const response = await fetch(`/api/fits/${fitId}/suggest`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(body), signal });
  const json = (await response.json().catch(() => ({}))) as SuggestResponse & { error?: string; details?: { path?: string; message: string }[] };
  if (!response.ok) throw new SuggestError(json.error ?? `No suggestion could be made (${response.status}).`, response.status, json.details ?? []);
  return json;
}

/** The allocation with the draft's amounts; mode, locks, bounds and ceiling stay the planner's. */
export function draftAllocation(state: AllocationState, draft: SuggestResponse): AllocationState {
  const channels = state.channels.map((channel) => {
    const amount = draft.allocation[channel.name];
    if (amount === undefined) throw new Error(`The draft has no amount for ${channel.label}; ask for a new suggestion.`);
    const amountCents = amountToCents(amount);
    return amountCents === channel.amountCents ? channel : { ...channel, amountCents };
  });
  return { ...state, channels, totalCents: channels.reduce((sum, channel) => sum + channel.amountCents, 0) };
}

/**
 * Loads the draft into the allocation store as one ordinary, undoable edit (unlike `load`, which
 * opens a saved version and clears the history). Nothing is saved: the planner's Save version does that.
 */
export function applyDraftToStore(store: AllocationStore, draft: SuggestResponse): void {
  const state = store.getState();
  state.endGesture();
  const { allocation, past } = store.getState();
  const next = draftAllocation(allocation, draft);
  store.setState({ allocation: next, past: [...past, allocation].slice(-DEFAULT_HISTORY_LIMIT), future: [], lastMessage: null, lastReason: null });
}

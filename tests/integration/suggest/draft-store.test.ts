// "Use this draft": the suggested amounts enter the allocation store as one undoable edit; mode, locks,
// bounds and ceiling stay the planner's; nothing else (a saved version) is touched.
import { describe, expect, it } from "vitest";
import { createAllocationState } from "@/server/planning/allocation";
import { applyDraftToStore, draftAllocation, suggestRequestBody, type SuggestResponse } from "@/ui/suggest/api";
import { createAllocationStore } from "@/ui/stores/allocation-store";

const money = { currency: "EUR", locale: "en-IE" };
const start = () =>
  createAllocationState({
    mode: "growing",
    horizonPeriods: 13,
    ceilingCents: 40_000_00,
    channels: [
      { name: "search_eur", label: "Search", amountCents: 20_000_00, locked: false, floorCents: 5_000_00 },
      { name: "email_eur", label: "Email", amountCents: 10_000_00, locked: true },
      { name: "podcast_eur", label: "Podcast", amountCents: 5_000_00, locked: false, ceilingCents: 9_000_00 },
    ],
  });
const draft = { allocation: { search_eur: 24_000.5, email_eur: 10_000, podcast_eur: 4_000 } } as unknown as SuggestResponse;

describe("the suggestion as a draft in the allocation store", () => {
  it("the request carries the plan's mode, ceiling, locks and bounds", () => {
    expect(suggestRequestBody(start(), { promo_week: 2 }, { keepInsideObservedRange: true, keepInsideHull: false })).toEqual({
      allocation: { search_eur: 20_000, email_eur: 10_000, podcast_eur: 5_000 },
      controls: { promo_week: 2 },
      horizon: 13,
      mode: "growing",
      ceiling: 40_000,
      locks: ["email_eur"],
      floors: { search_eur: 5_000 },
      ceilings: { podcast_eur: 9_000 },
      keepInsideObservedRange: true,
      keepInsideHull: false,
    });
  });

  it("replaces the amounts only, and the total follows", () => {
    const next = draftAllocation(start(), draft);
    expect(next.channels.map((channel) => channel.amountCents)).toEqual([24_000_50, 10_000_00, 4_000_00]);
    expect(next.totalCents).toBe(38_000_50);
    expect(next).toMatchObject({ mode: "growing", ceilingCents: 40_000_00, horizonPeriods: 13 });
    expect(next.channels[1].locked).toBe(true);
    expect(next.channels[0].floorCents).toBe(5_000_00);
  });

  it("is one undo step: undo brings back the plan, redo the draft", () => {
    const store = createAllocationStore(start(), { money });
    store.getState().move("search_eur", 21_000_00);
    const before = store.getState().allocation;
    applyDraftToStore(store, draft);
    expect(store.getState().allocation.totalCents).toBe(38_000_50);
    expect(store.getState().past.length).toBe(2);
    store.getState().undo();
    expect(store.getState().allocation).toBe(before);
    store.getState().redo();
    expect(store.getState().allocation.channels[0].amountCents).toBe(24_000_50);
  });

  it("refuses a draft made for other channels", () => {
    expect(() => draftAllocation(start(), { allocation: { search_eur: 1 } } as unknown as SuggestResponse)).toThrow(/no amount for Email/);
  });
});

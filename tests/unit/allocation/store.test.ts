import fc from "fast-check";
import { afterEach, describe, expect, it, vi } from "vitest";
import type { AllocationChannel, AllocationState } from "@/server/planning/allocation";
import {
  ALLOCATION_INPUT_MARK,
  createAllocationStore,
  DEFAULT_HISTORY_LIMIT,
  selectCanRedo,
  selectCanUndo,
  subscribeToAllocation,
  type AllocationStore,
} from "@/ui/stores/allocation-store";
import { stateArb } from "./arbitraries";

const money = { currency: "EUR", locale: "en-IE" };
const ch = (name: string, amountCents: number, extra: Partial<AllocationChannel> = {}): AllocationChannel => ({
  name,
  label: name[0].toUpperCase() + name.slice(1),
  amountCents,
  locked: false,
  ...extra,
});
const make = () =>
  createAllocationStore(
    { horizonPeriods: 13, channels: [ch("search", 6_000_000), ch("video", 3_000_000), ch("radio", 1_000_000)] },
    { money },
  );
const amounts = (store: AllocationStore) => store.getState().allocation.channels.map((c) => c.amountCents);

afterEach(() => vi.restoreAllMocks());

describe("allocation store", () => {
  it("moves with the mode's rule and keeps the why-it-stopped message", () => {
    const store = make();
    store.getState().move("search", 7_200_000);
    expect(amounts(store)).toEqual([7_200_000, 2_100_000, 700_000]);
    expect(store.getState().lastMessage).toBeNull();
    store.getState().toggleLock("radio");
    store.getState().move("search", 99_000_000);
    expect(amounts(store)).toEqual([9_300_000, 0, 700_000]);
    expect(store.getState().lastMessage).toBe("Only €21,000 can move: Video is at zero, Radio is locked.");
    expect(store.getState().lastReason?.channel).toBe("search");
    store.getState().move("search", 8_000_000);
    expect(store.getState().lastMessage).toBeNull();
  });

  it("undo and redo restore the exact states", () => {
    const store = make();
    const s0 = store.getState().allocation;
    store.getState().move("search", 5_000_000);
    const s1 = store.getState().allocation;
    store.getState().setMode("growing");
    const s2 = store.getState().allocation;
    store.getState().move("video", 4_000_000);
    const s3 = store.getState().allocation;
    store.getState().undo();
    expect(store.getState().allocation).toBe(s2);
    store.getState().undo();
    store.getState().undo();
    expect(store.getState().allocation).toBe(s0);
    expect(selectCanUndo(store.getState())).toBe(false);
    store.getState().undo(); // nothing left: no change
    expect(store.getState().allocation).toBe(s0);
    store.getState().redo();
    store.getState().redo();
    store.getState().redo();
    expect(store.getState().allocation).toBe(s3);
    expect(selectCanRedo(store.getState())).toBe(false);
    store.getState().undo();
    store.getState().undo();
    expect(store.getState().allocation).toBe(s1);
    store.getState().move("radio", 0); // a new edit drops the redo branch
    expect(selectCanRedo(store.getState())).toBe(false);
  });

  it("undoing everything after random edits gives back each earlier state, in order", () => {
    type Action = { kind: "move" | "lock" | "bounds" | "total" | "mode" | "ceiling"; index: number; value: number };
    const actionArb = fc.record({
      kind: fc.constantFrom("move", "lock", "bounds", "total", "mode", "ceiling") as fc.Arbitrary<Action["kind"]>,
      index: fc.nat(),
      value: fc.integer({ min: -1000, max: 20_000_000_000 }),
    });
    fc.assert(
      fc.property(stateArb({ minChannels: 2 }), fc.array(actionArb, { maxLength: 40 }), (start, actions) => {
        const store = createAllocationStore(start, { money });
        const seen: AllocationState[] = [store.getState().allocation];
        for (const action of actions) {
          const s = store.getState();
          const name = s.allocation.channels[action.index % s.allocation.channels.length].name;
          if (action.kind === "move") s.move(name, action.value);
          if (action.kind === "lock") s.toggleLock(name);
          if (action.kind === "bounds") s.setBounds(name, action.value % 2 ? { floorCents: Math.abs(action.value) % 1_000_000 } : {});
          if (action.kind === "total") s.setTotal(action.value);
          if (action.kind === "mode") s.setMode(s.allocation.mode === "fixed" ? "growing" : "fixed");
          if (action.kind === "ceiling") s.setCeiling(action.value);
          if (store.getState().allocation !== seen[seen.length - 1]) seen.push(store.getState().allocation);
        }
        const final = store.getState().allocation;
        expect(store.getState().past.length).toBe(seen.length - 1);
        for (let i = seen.length - 2; i >= 0; i--) {
          store.getState().undo();
          expect(store.getState().allocation).toBe(seen[i]);
        }
        for (let i = 1; i < seen.length; i++) store.getState().redo();
        expect(store.getState().allocation).toBe(final);
      }),
      { numRuns: 200 },
    );
  });

  it("coalesces a drag into one undo step", () => {
    const store = make();
    const before = store.getState().allocation;
    store.getState().beginGesture();
    for (let cents = 6_000_000; cents <= 8_000_000; cents += 10_000) store.getState().move("search", cents);
    expect(store.getState().past.length).toBe(0);
    expect(selectCanUndo(store.getState())).toBe(true);
    store.getState().endGesture();
    const after = store.getState().allocation;
    expect(store.getState().past.length).toBe(1);
    store.getState().undo();
    expect(store.getState().allocation).toBe(before);
    store.getState().redo();
    expect(store.getState().allocation).toBe(after);
  });

  it("records nothing for a gesture that changed nothing or came back to where it began", () => {
    const store = make();
    store.getState().beginGesture();
    store.getState().endGesture();
    store.getState().beginGesture();
    store.getState().move("search", 7_000_000);
    store.getState().move("search", 6_000_000);
    store.getState().endGesture();
    expect(store.getState().past.length).toBe(0);
    store.getState().endGesture(); // closing twice is harmless
    expect(store.getState().past.length).toBe(0);
  });

  it("undo during a drag closes the drag first", () => {
    const store = make();
    const before = store.getState().allocation;
    store.getState().beginGesture();
    store.getState().move("search", 7_000_000);
    store.getState().undo();
    expect(store.getState().allocation).toBe(before);
    expect(store.getState().gestureStart).toBeNull();
  });

  it("keeps at most the history limit", () => {
    const store = make();
    for (let i = 1; i <= DEFAULT_HISTORY_LIMIT + 50; i++) store.getState().move("search", 6_000_000 + i * 100);
    expect(store.getState().past.length).toBe(DEFAULT_HISTORY_LIMIT);
    const small = createAllocationStore(store.getState().allocation, { money, historyLimit: 3 });
    for (let i = 1; i <= 10; i++) small.getState().move("video", i * 100);
    expect(small.getState().past.length).toBe(3);
  });

  it("tells subscribers about allocation changes only", () => {
    const store = make();
    const listener = vi.fn();
    const stop = subscribeToAllocation(store, listener);
    store.getState().beginGesture();
    expect(listener).not.toHaveBeenCalled();
    store.getState().move("search", 7_000_000);
    store.getState().endGesture();
    store.getState().undo();
    expect(listener).toHaveBeenCalledTimes(2);
    expect(listener.mock.calls[0][0].channels[0].amountCents).toBe(7_000_000);
    expect(listener.mock.calls[0][1].channels[0].amountCents).toBe(6_000_000);
    stop();
    store.getState().redo();
    expect(listener).toHaveBeenCalledTimes(2);
  });

  it("marks every move for the latency benchmark", () => {
    const mark = vi.spyOn(performance, "mark");
    const store = make();
    store.getState().move("search", 7_000_000);
    store.getState().move("search", 7_000_000);
    expect(mark).toHaveBeenCalledTimes(2);
    expect(mark).toHaveBeenCalledWith(ALLOCATION_INPUT_MARK);
  });

  it("keeps separate scenarios separate", () => {
    const a = make();
    const b = make();
    a.getState().move("search", 1);
    expect(amounts(b)).toEqual([6_000_000, 3_000_000, 1_000_000]);
    expect(b.getState().past.length).toBe(0);
  });

  it("loading a saved version clears the history", () => {
    const store = make();
    store.getState().move("search", 1);
    const other = make().getState().allocation;
    store.getState().load(other);
    expect(store.getState().allocation).toBe(other);
    expect(selectCanUndo(store.getState())).toBe(false);
  });
});

/**
 * Allocation state for one scenario: the pure allocation (server/planning/allocation), the
 * "why it stopped" message and an undo/redo history. Created per scenario by a factory so several
 * scenarios (side by side) can coexist; components get it through props or AllocationStoreProvider.
 */
import { useStore } from "zustand";
import { createStore, type StoreApi } from "zustand/vanilla";
import {
  centsFormatter,
  createAllocationState,
  moveChannel,
  setBounds as setBoundsRule,
  setCeiling as setCeilingRule,
  setGrowth as setGrowthRule,
  setLocked as setLockedRule,
  setMode as setModeRule,
  setTotal as setTotalRule,
  type AllocationInit,
  type AllocationMode,
  type AllocationResult,
  type AllocationState,
  type ChannelBounds,
  type ClampReason,
  type MoneyLocale,
} from "@/server/planning/allocation";

/** Undo steps kept; older ones are dropped. */
export const DEFAULT_HISTORY_LIMIT = 100;

/** Name of the performance mark set on every move (the latency benchmark measures from it). */
export const ALLOCATION_INPUT_MARK = "allocation-input";

export interface AllocationStoreState {
  allocation: AllocationState;
  money: MoneyLocale;
  /** Why the last edit stopped short or was refused; null after an edit that went through. */
  lastMessage: string | null;
  /** The structured form of {@link lastMessage} (which channel, which blockers). */
  lastReason: ClampReason | null;
  /** Older states, most recent last. */
  past: readonly AllocationState[];
  /** States undone, most recent last. */
  future: readonly AllocationState[];
  /** The state when the open gesture (a slider drag) began; null when no gesture is open. */
  gestureStart: AllocationState | null;

  /** Sets one channel's horizon amount with the current mode's rule. */
  move(channel: string, amountCents: number): AllocationResult;
  /** Opens a gesture: moves until {@link endGesture} become one undo step. */
  beginGesture(): void;
  /** Closes the open gesture, recording one undo step if anything changed. */
  endGesture(): void;
  setLocked(channel: string, locked: boolean): void;
  toggleLock(channel: string): void;
  setBounds(channel: string, bounds: ChannelBounds): AllocationResult;
  setMode(mode: AllocationMode): void;
  setTotal(totalCents: number): AllocationResult;
  setCeiling(ceilingCents: number): AllocationResult;
  setGrowth(growth: number): AllocationResult;
  undo(): void;
  redo(): void;
  /** Replaces the allocation (e.g. a saved version was opened) and clears the history. */
  load(allocation: AllocationState): void;
  clearMessage(): void;
}

export type AllocationStore = StoreApi<AllocationStoreState>;

export interface AllocationStoreOptions {
  money: MoneyLocale;
  historyLimit?: number;
}

/** True when two allocations hold the same numbers, locks and bounds (so no undo step is needed). */
export function sameAllocation(a: AllocationState, b: AllocationState): boolean {
  if (a === b) return true;
  if (
    a.mode !== b.mode ||
    a.totalCents !== b.totalCents ||
    a.baseTotalCents !== b.baseTotalCents ||
    a.ceilingCents !== b.ceilingCents ||
    a.horizonPeriods !== b.horizonPeriods ||
    a.channels.length !== b.channels.length
  ) {
    return false;
  }
  return a.channels.every((channel, i) => {
    const other = b.channels[i];
    return (
      channel === other ||
      (channel.name === other.name &&
        channel.amountCents === other.amountCents &&
        channel.locked === other.locked &&
        channel.floorCents === other.floorCents &&
        channel.ceilingCents === other.ceilingCents)
    );
  });
}

function markInput(): void {
  if (typeof performance !== "undefined" && typeof performance.mark === "function") {
    performance.mark(ALLOCATION_INPUT_MARK);
  }
}

/**
 * Creates a vanilla zustand store for one scenario's allocation.
 *
 * @param initial a ready state, or the starting allocation to build one from.
 */
export function createAllocationStore(
  initial: AllocationState | AllocationInit,
  options: AllocationStoreOptions,
): AllocationStore {
  const limit = options.historyLimit ?? DEFAULT_HISTORY_LIMIT;
  const start = "totalCents" in initial ? initial : createAllocationState(initial);
  const format = centsFormatter(options.money);

  return createStore<AllocationStoreState>()((set, get) => {
    /** Applies an edit's result: history (unless a gesture is open), message, state. */
    const apply = (result: AllocationResult): AllocationResult => {
      const { allocation, past, gestureStart } = get();
      const said = { lastMessage: result.reason?.message ?? null, lastReason: result.reason ?? null };
      if (result.state === allocation) {
        set(said);
        return result;
      }
      if (gestureStart) {
        set({ allocation: result.state, future: [], ...said });
      } else {
        set({ allocation: result.state, past: [...past, allocation].slice(-limit), future: [], ...said });
      }
      return result;
    };

    return {
      allocation: start,
      money: options.money,
      lastMessage: null,
      lastReason: null,
      past: [],
      future: [],
      gestureStart: null,

      move(channel, amountCents) {
        markInput();
        return apply(moveChannel(get().allocation, channel, amountCents, { format }));
      },
      beginGesture() {
        if (!get().gestureStart) set({ gestureStart: get().allocation });
      },
      endGesture() {
        const { gestureStart, allocation, past } = get();
        if (!gestureStart) return;
        if (sameAllocation(gestureStart, allocation)) {
          set({ gestureStart: null });
        } else {
          set({ gestureStart: null, past: [...past, gestureStart].slice(-limit), future: [] });
        }
      },
      setLocked(channel, locked) {
        apply(setLockedRule(get().allocation, channel, locked));
      },
      toggleLock(channel) {
        const current = get().allocation.channels.find((c) => c.name === channel);
        if (current) apply(setLockedRule(get().allocation, channel, !current.locked));
      },
      setBounds(channel, bounds) {
        return apply(setBoundsRule(get().allocation, channel, bounds, { format }));
      },
      setMode(mode) {
        apply(setModeRule(get().allocation, mode));
      },
      setTotal(totalCents) {
        markInput();
        return apply(setTotalRule(get().allocation, totalCents, { format }));
      },
      setCeiling(ceilingCents) {
        return apply(setCeilingRule(get().allocation, ceilingCents, { format }));
      },
      setGrowth(growth) {
        return apply(setGrowthRule(get().allocation, growth, { format }));
      },
      undo() {
        get().endGesture();
        const { past, future, allocation } = get();
        if (past.length === 0) return;
        set({ allocation: past[past.length - 1], past: past.slice(0, -1), future: [...future, allocation], lastMessage: null, lastReason: null });
      },
      redo() {
        get().endGesture();
        const { past, future, allocation } = get();
        if (future.length === 0) return;
        set({
          allocation: future[future.length - 1],
          future: future.slice(0, -1),
          past: [...past, allocation].slice(-limit),
          lastMessage: null,
          lastReason: null,
        });
      },
      load(allocation) {
        set({ allocation, past: [], future: [], gestureStart: null, lastMessage: null, lastReason: null });
      },
      clearMessage() {
        set({ lastMessage: null, lastReason: null });
      },
    };
  });
}

/** Can the last step be undone? (Selector.) */
export const selectCanUndo = (state: AllocationStoreState): boolean =>
  state.past.length > 0 || (state.gestureStart !== null && state.gestureStart !== state.allocation);

/** Can an undone step be redone? (Selector.) */
export const selectCanRedo = (state: AllocationStoreState): boolean => state.future.length > 0;

/**
 * Calls `listener` whenever the allocation changes (moves, undo/redo, loads) — the hook for the
 * prediction layer. Returns the unsubscribe function.
 */
export function subscribeToAllocation(
  store: AllocationStore,
  listener: (allocation: AllocationState, previous: AllocationState) => void,
): () => void {
  return store.subscribe((state, previous) => {
    if (state.allocation !== previous.allocation) listener(state.allocation, previous.allocation);
  });
}

/** React hook: reads a slice of an allocation store (re-renders only when the slice changes). */
export function useAllocationStore<T>(store: AllocationStore, selector: (state: AllocationStoreState) => T): T {
  return useStore(store, selector);
}

"use client";

import { createContext, useContext, type ReactNode } from "react";
import type { MoneyLocale } from "@/server/planning/allocation";
import { useAllocationStore, type AllocationStore, type AllocationStoreState } from "@/ui/stores/allocation-store";

const AllocationStoreContext = createContext<AllocationStore | null>(null);
const ReadOnlyContext = createContext(false);

/**
 * Makes one scenario's allocation store available to the allocation components below it. With
 * `readOnly` every control below shows the plan but cannot change it (disabled, keyboard included).
 */
export function AllocationStoreProvider({ store, readOnly = false, children }: { store: AllocationStore; readOnly?: boolean; children: ReactNode }) {
  return (
    <AllocationStoreContext.Provider value={store}>
      <ReadOnlyContext.Provider value={readOnly}>{children}</ReadOnlyContext.Provider>
    </AllocationStoreContext.Provider>
  );
}

/** True inside a read-only AllocationStoreProvider (members who may look but not plan). */
export function useAllocationReadOnly(): boolean {
  return useContext(ReadOnlyContext);
}

/** The store from a prop if given, else from the nearest AllocationStoreProvider. */
export function useAllocationStoreApi(store?: AllocationStore): AllocationStore {
  const fromContext = useContext(AllocationStoreContext);
  const found = store ?? fromContext;
  if (!found) throw new Error("Allocation components need a `store` prop or an AllocationStoreProvider above them.");
  return found;
}

/** Reads a slice of the allocation store from a prop or the context. */
export function useAllocation<T>(selector: (state: AllocationStoreState) => T, store?: AllocationStore): T {
  return useAllocationStore(useAllocationStoreApi(store), selector);
}

/** Workspace currency/locale: the `money` prop when given, else the store's. */
export function useMoney(store?: AllocationStore, money?: MoneyLocale): MoneyLocale {
  const fromStore = useAllocation((state) => state.money, store);
  return money ?? fromStore;
}

/** Props every allocation component accepts. */
export interface AllocationComponentProps {
  /** The scenario's store; defaults to the AllocationStoreProvider's. */
  store?: AllocationStore;
  /** Workspace currency and locale; defaults to the store's. */
  money?: MoneyLocale;
}

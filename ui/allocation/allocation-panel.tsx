"use client";

import { useEffect, useRef } from "react";
import type { AllocationState } from "@/server/planning/allocation";
import { subscribeToAllocation, type AllocationStore } from "@/ui/stores/allocation-store";
import { ChannelRow } from "./channel-row";
import { ModeSwitch } from "./mode-switch";
import { AllocationStoreProvider, useAllocation, type AllocationComponentProps } from "./store-context";
import { TotalDisplay } from "./total-display";
import { UndoRedoButtons, useUndoRedoShortcuts } from "./undo-redo";

export interface AllocationPanelProps extends AllocationComponentProps {
  store: AllocationStore;
  /** Per channel "Beyond observed range" sentences from the prediction layer (see ChannelRow.rangeWarning). */
  rangeWarnings?: Record<string, string | null>;
  /** Word for one period of the fit, e.g. "week". */
  periodNoun?: string;
  /** Listen for Ctrl+Z anywhere on the page, not only inside the panel (one panel per page). */
  globalShortcuts?: boolean;
  /** Show the plan without letting it change: every control disabled, no undo/redo (members without scenario:write). */
  readOnly?: boolean;
  /** Called after every allocation change (moves, undo/redo) — where the prediction layer hooks in. */
  onAllocationChange?: (allocation: AllocationState, previous: AllocationState) => void;
  className?: string;
}

/**
 * The whole allocation panel: total mode, total, undo/redo, one row per channel and a status line
 * for total-level messages. Provides the store to its children.
 */
export function AllocationPanel({
  store,
  money,
  rangeWarnings,
  periodNoun,
  globalShortcuts = false,
  readOnly = false,
  onAllocationChange,
  className,
}: AllocationPanelProps) {
  const onKeyDown = useUndoRedoShortcuts(store, globalShortcuts, !readOnly);
  const names = useAllocation((state) => state.allocation.channels.map((c) => c.name).join("\n"), store);
  const totalMessage = useAllocation((state) => (state.lastReason && !state.lastReason.channel ? state.lastMessage : null), store);

  // Keep the latest callback without resubscribing on every render.
  const callback = useRef(onAllocationChange);
  useEffect(() => {
    callback.current = onAllocationChange;
  });
  useEffect(() => subscribeToAllocation(store, (next, previous) => callback.current?.(next, previous)), [store]);

  return (
    <AllocationStoreProvider store={store} readOnly={readOnly}>
      <section
        aria-label="Allocation"
        data-readonly={readOnly || undefined}
        className={`space-y-4 ${className ?? ""}`}
        onKeyDown={globalShortcuts ? undefined : onKeyDown}
      >
        <div className="flex flex-wrap items-end justify-between gap-4">
          <ModeSwitch money={money} />
          {readOnly ? null : <UndoRedoButtons />}
        </div>
        <TotalDisplay money={money} periodNoun={periodNoun} />
        <p role="status" className={totalMessage ? "text-sm text-slate-700" : "sr-only"}>
          {totalMessage ?? ""}
        </p>
        <div className="space-y-3">
          {names.split("\n").filter(Boolean).map((name) => (
            <ChannelRow key={name} channel={name} money={money} periodNoun={periodNoun} rangeWarning={rangeWarnings?.[name]} />
          ))}
        </div>
      </section>
    </AllocationStoreProvider>
  );
}

"use client";

import { useCallback, useEffect } from "react";
import { selectCanRedo, selectCanUndo, type AllocationStore } from "@/ui/stores/allocation-store";
import { useAllocation, useAllocationStoreApi, type AllocationComponentProps } from "./store-context";

/** True when the key event is typing in a text field, where Ctrl+Z must stay the field's own undo. */
function isTextEditing(target: EventTarget | null): boolean {
  if (!(target instanceof HTMLElement)) return false;
  if (target.isContentEditable || target instanceof HTMLTextAreaElement) return true;
  return target instanceof HTMLInputElement && !["checkbox", "radio", "range", "button", "submit"].includes(target.type);
}

/**
 * Ctrl+Z (⌘Z) undoes, Ctrl+Shift+Z / Ctrl+Y redoes. Returns a handler for a container's onKeyDown
 * (scoped, so two scenarios side by side keep separate histories); pass `global` to listen on window.
 * With `enabled` false (a read-only plan) the keys do nothing.
 */
export function useUndoRedoShortcuts(store: AllocationStore, global = false, enabled = true) {
  const handler = useCallback(
    (event: Pick<KeyboardEvent, "key" | "ctrlKey" | "metaKey" | "shiftKey" | "target" | "preventDefault" | "defaultPrevented">) => {
      if (!enabled || event.defaultPrevented || !(event.ctrlKey || event.metaKey) || isTextEditing(event.target)) return;
      const key = event.key.toLowerCase();
      if (key === "z" && !event.shiftKey) {
        event.preventDefault();
        store.getState().undo();
      } else if ((key === "z" && event.shiftKey) || key === "y") {
        event.preventDefault();
        store.getState().redo();
      }
    },
    [store, enabled],
  );
  useEffect(() => {
    if (!global || !enabled) return;
    const listener = (event: KeyboardEvent) => handler(event);
    window.addEventListener("keydown", listener);
    return () => window.removeEventListener("keydown", listener);
  }, [global, enabled, handler]);
  return handler;
}

/** Undo and Redo buttons (disabled when there is nothing to undo/redo). */
export function UndoRedoButtons({ store: storeProp, className }: AllocationComponentProps & { className?: string }) {
  const store = useAllocationStoreApi(storeProp);
  const canUndo = useAllocation(selectCanUndo, storeProp);
  const canRedo = useAllocation(selectCanRedo, storeProp);
  const button =
    "rounded border border-slate-300 bg-white px-3 py-1 text-sm text-river outline-none hover:border-shallows focus-visible:ring-2 focus-visible:ring-shallows disabled:cursor-not-allowed disabled:text-slate-400 disabled:hover:border-slate-300";
  return (
    <div className={`flex gap-2 ${className ?? ""}`} role="group" aria-label="History">
      <button type="button" className={button} disabled={!canUndo} aria-keyshortcuts="Control+Z Meta+Z" onClick={() => store.getState().undo()}>
        Undo
      </button>
      <button
        type="button"
        className={button}
        disabled={!canRedo}
        aria-keyshortcuts="Control+Shift+Z Meta+Shift+Z Control+Y"
        onClick={() => store.getState().redo()}
      >
        Redo
      </button>
    </div>
  );
}

"use client";

import { useAllocation, useAllocationReadOnly, useAllocationStoreApi, type AllocationComponentProps } from "./store-context";

export interface LockToggleProps extends AllocationComponentProps {
  channel: string;
  className?: string;
}

/** Locks a channel so it holds still while others move (a toggle button: aria-pressed). */
export function LockToggle({ channel, className, store: storeProp }: LockToggleProps) {
  const store = useAllocationStoreApi(storeProp);
  const row = useAllocation((state) => state.allocation.channels.find((c) => c.name === channel), storeProp);
  const readOnly = useAllocationReadOnly();
  if (!row) return null;
  return (
    <button
      type="button"
      aria-pressed={row.locked}
      title={row.locked ? `${row.label} is locked` : `Lock ${row.label}`}
      disabled={readOnly}
      onClick={() => {
        if (!readOnly) store.getState().toggleLock(channel);
      }}
      className={`inline-flex items-center gap-1 rounded border px-2 py-1 text-sm outline-none focus-visible:ring-2 focus-visible:ring-shallows disabled:cursor-not-allowed disabled:opacity-60 ${
        row.locked ? "border-river bg-river text-white" : "border-slate-300 bg-white text-slate-700 hover:border-shallows"
      } ${className ?? ""}`}
    >
      <PadlockIcon closed={row.locked} />
      {/* Constant visible text so the accessible name stays "Lock Search"; the pressed state says locked. */}
      <span>Lock</span>
      <span className="sr-only"> {row.label}</span>
    </button>
  );
}

function PadlockIcon({ closed }: { closed: boolean }) {
  return (
    <svg aria-hidden="true" viewBox="0 0 16 16" className="size-4" fill="none" stroke="currentColor" strokeWidth="1.6">
      <rect x="3" y="7" width="10" height="7" rx="1.5" fill={closed ? "currentColor" : "none"} />
      <path d={closed ? "M5 7V5a3 3 0 0 1 6 0v2" : "M5 7V5a3 3 0 0 1 5.8-1"} />
    </svg>
  );
}

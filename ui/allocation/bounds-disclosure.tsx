"use client";

import { formatCents } from "@/server/planning/allocation";
import { AmountField } from "./amount-field";
import { useAllocation, useAllocationReadOnly, useAllocationStoreApi, useMoney, type AllocationComponentProps } from "./store-context";

export interface BoundsDisclosureProps extends AllocationComponentProps {
  channel: string;
  className?: string;
}

/**
 * Optional floor and ceiling for a channel (e.g. a contractual minimum), folded away under "Bounds".
 * An empty field removes that bound; a bound the allocation cannot meet is refused with the reason.
 */
export function BoundsDisclosure({ channel, className, store: storeProp, money: moneyProp }: BoundsDisclosureProps) {
  const store = useAllocationStoreApi(storeProp);
  const money = useMoney(storeProp, moneyProp);
  const row = useAllocation((state) => state.allocation.channels.find((c) => c.name === channel), storeProp);
  const readOnly = useAllocationReadOnly();
  if (!row) return null;

  const summary = [
    row.floorCents !== undefined ? `floor ${formatCents(row.floorCents, money)}` : null,
    row.ceilingCents !== undefined ? `ceiling ${formatCents(row.ceilingCents, money)}` : null,
  ].filter(Boolean);
  const commit = (bounds: { floorCents?: number; ceilingCents?: number }) => {
    const before = store.getState().allocation;
    const result = store.getState().setBounds(channel, bounds);
    if (result.state !== before || !result.reason) return null;
    // Refused: say why beside the field the planner is looking at, not a second time on the row.
    store.getState().clearMessage();
    return result.reason.message;
  };

  return (
    <details className={`group text-sm ${className ?? ""}`}>
      <summary className="cursor-pointer select-none text-slate-600 outline-none hover:text-river focus-visible:ring-2 focus-visible:ring-shallows">
        Bounds{summary.length > 0 ? <span className="num text-slate-600"> · {summary.join(" · ")}</span> : null}
      </summary>
      <div className="mt-2 grid grid-cols-2 gap-3">
        <AmountField
          label={`${row.label} floor for the horizon`}
          showLabel
          valueCents={row.floorCents}
          locale={money.locale}
          currency={money.currency}
          allowEmpty
          disabled={readOnly}
          onCommit={(cents) => commit({ floorCents: cents, ceilingCents: row.ceilingCents })}
        />
        <AmountField
          label={`${row.label} ceiling for the horizon`}
          showLabel
          valueCents={row.ceilingCents}
          locale={money.locale}
          currency={money.currency}
          allowEmpty
          disabled={readOnly}
          onCommit={(cents) => commit({ floorCents: row.floorCents, ceilingCents: cents })}
        />
      </div>
      <p className="mt-1 text-xs text-slate-600">{readOnly ? "Bounds are set by planners." : "Leave a field empty for no bound."}</p>
    </details>
  );
}

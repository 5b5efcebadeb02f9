"use client";

import { formatCents, headroomCents, horizonToPerPeriod } from "@/server/planning/allocation";
import { AmountField } from "./amount-field";
import { useAllocation, useAllocationReadOnly, useAllocationStoreApi, useMoney, type AllocationComponentProps } from "./store-context";

export interface TotalDisplayProps extends AllocationComponentProps {
  /** Word for one period of the fit, e.g. "week". */
  periodNoun?: string;
  className?: string;
}

/**
 * The horizon total. In fixed mode it is editable (the unlocked channels scale to the new total);
 * in growing mode it reads against the ceiling. Both show the per-period figure the model uses.
 */
export function TotalDisplay({ periodNoun = "period", className, store: storeProp, money: moneyProp }: TotalDisplayProps) {
  const store = useAllocationStoreApi(storeProp);
  const money = useMoney(storeProp, moneyProp);
  const mode = useAllocation((state) => state.allocation.mode, storeProp);
  const total = useAllocation((state) => state.allocation.totalCents, storeProp);
  const ceiling = useAllocation((state) => state.allocation.ceilingCents, storeProp);
  const headroom = useAllocation((state) => headroomCents(state.allocation), storeProp);
  const horizon = useAllocation((state) => state.allocation.horizonPeriods, storeProp);
  const readOnly = useAllocationReadOnly();
  const perPeriod = Math.round(horizonToPerPeriod(total, horizon));

  return (
    <div className={className}>
      {mode === "fixed" ? (
        <AmountField
          className="w-48"
          label="Fixed total for the horizon"
          showLabel
          valueCents={total}
          locale={money.locale}
          currency={money.currency}
          disabled={readOnly}
          onCommit={(cents) => {
            if (cents !== undefined) store.getState().setTotal(cents);
          }}
        />
      ) : (
        <div>
          <p className="text-xs font-medium text-slate-600">Total for the horizon</p>
          <p className="num text-lg font-semibold text-river">
            {formatCents(total, money)}
            <span className="text-sm font-normal text-slate-600">
              {" "}
              of {formatCents(ceiling, money)} ceiling · {formatCents(headroom, money)} headroom
            </span>
          </p>
        </div>
      )}
      <p className="num mt-1 text-xs text-slate-600">
        {horizon} {horizon === 1 ? periodNoun : `${periodNoun}s`} · about {formatCents(perPeriod, money)} per {periodNoun} (horizon amount ÷ {horizon}), the unit
        the model was fitted on
      </p>
    </div>
  );
}

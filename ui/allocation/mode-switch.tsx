"use client";

import { useId } from "react";
import { formatCents, growthOf, type AllocationMode } from "@/server/planning/allocation";
import { AmountField } from "./amount-field";
import { useAllocation, useAllocationReadOnly, useAllocationStoreApi, useMoney, type AllocationComponentProps } from "./store-context";

const MODES: { mode: AllocationMode; label: string; hint: string }[] = [
  { mode: "fixed", label: "Fixed total", hint: "Money only moves between channels." },
  { mode: "growing", label: "Growing total (with a ceiling)", hint: "The total may rise up to the ceiling." },
];

/**
 * Fixed total / Growing total switch (a radio group). In growing mode it also edits the ceiling,
 * either as an amount or as growth over the starting total.
 */
export function ModeSwitch({ store: storeProp, money: moneyProp, className }: AllocationComponentProps & { className?: string }) {
  const name = useId();
  const store = useAllocationStoreApi(storeProp);
  const money = useMoney(storeProp, moneyProp);
  const mode = useAllocation((state) => state.allocation.mode, storeProp);
  const ceiling = useAllocation((state) => state.allocation.ceilingCents, storeProp);
  const base = useAllocation((state) => state.allocation.baseTotalCents, storeProp);
  const growth = useAllocation((state) => growthOf(state.allocation), storeProp);
  const readOnly = useAllocationReadOnly();

  return (
    <fieldset className={className} disabled={readOnly}>
      <legend className="mb-1 text-sm font-medium text-slate-600">Total</legend>
      <div className="inline-flex overflow-hidden rounded-md border border-river">
        {MODES.map((option) => (
          <label
            key={option.mode}
            title={option.hint}
            className={`px-3 py-1.5 ${readOnly ? "cursor-not-allowed" : "cursor-pointer"} text-sm has-[:focus-visible]:ring-2 has-[:focus-visible]:ring-shallows ${
              mode === option.mode ? "bg-river text-white" : readOnly ? "bg-white text-slate-600" : "bg-white text-river hover:bg-silt"
            }`}
          >
            <input
              type="radio"
              className="sr-only"
              name={name}
              value={option.mode}
              checked={mode === option.mode}
              disabled={readOnly}
              onChange={() => {
                if (!readOnly) store.getState().setMode(option.mode);
              }}
            />
            {option.label}
          </label>
        ))}
      </div>
      {mode === "growing" ? (
        <div className="mt-3 flex flex-wrap items-end gap-4">
          <AmountField
            className="w-44"
            label="Ceiling for the total"
            showLabel
            valueCents={ceiling}
            locale={money.locale}
            currency={money.currency}
            disabled={readOnly}
            onCommit={(cents) => {
              // A clamped ceiling is explained in the panel's status line, like every total-level message.
              if (cents !== undefined) store.getState().setCeiling(cents);
            }}
          />
          <GrowthField growth={growth} disabled={readOnly} onCommit={(value) => store.getState().setGrowth(value)} />
          <p className="num pb-1 text-sm text-slate-600">Starting total {formatCents(base, money)}</p>
        </div>
      ) : null}
    </fieldset>
  );
}

function GrowthField({ growth, disabled, onCommit }: { growth: number; disabled: boolean; onCommit: (growth: number) => void }) {
  const id = useId();
  const shown = String(Math.round(growth * 1000) / 10);
  return (
    <div className="w-48">
      <label htmlFor={id} className="mb-1 block text-xs font-medium text-slate-600">
        Growth over the start (%)
      </label>
      <input
        id={id}
        key={shown}
        type="number"
        step="0.1"
        min="0"
        defaultValue={shown}
        disabled={disabled}
        onKeyDown={(event) => {
          if (event.key === "Enter") event.currentTarget.blur();
        }}
        onBlur={(event) => {
          const value = Number(event.currentTarget.value);
          if (event.currentTarget.value.trim() === "" || !Number.isFinite(value)) {
            event.currentTarget.value = shown;
            return;
          }
          if (!disabled && String(value) !== shown) onCommit(value / 100);
        }}
        className="num w-full rounded border border-slate-300 bg-white px-2 py-1 text-right outline-none focus-visible:ring-2 focus-visible:ring-shallows disabled:bg-slate-100 disabled:text-slate-600"
      />
    </div>
  );
}

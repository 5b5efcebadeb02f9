"use client";

import { useId } from "react";
import { type PlanShape, periodsWord } from "@/server/predict/plan-shape";

export interface ControlsPanelProps {
  shape: PlanShape;
  horizon: number;
  controls: Record<string, number>;
  onChange: (name: string, value: number) => void;
  disabled?: boolean;
}

/**
 * The plan's controls over the horizon: on/off controls as a count of periods ("4 promotion weeks
 * of 13"), others as their value per period. Held fixed while channels move.
 */
export function ControlsPanel({ shape, horizon, controls, onChange, disabled }: ControlsPanelProps) {
  const baseId = useId();
  if (shape.controls.length === 0) return null;
  return (
    <fieldset className="rounded-md bg-white px-4 py-3 shadow-sm" data-testid="controls-panel" disabled={disabled}>
      <legend className="sr-only">Controls over the horizon</legend>
      <p className="mb-2 text-sm font-medium text-river">Held over the {periodsWord(horizon, shape.periodNoun)}</p>
      <div className="flex flex-wrap gap-4">
        {shape.controls.map((control) => {
          const id = `${baseId}-${control.name}`;
          const value = controls[control.name] ?? 0;
          return (
            <div key={control.name} className="flex items-center gap-2 text-sm">
              <label htmlFor={id} className="text-slate-700">
                {control.label}
                {control.kind === "count" ? ` (${shape.periodNoun}s on)` : ` per ${shape.periodNoun}`}
              </label>
              <input
                id={id}
                type="number"
                inputMode="decimal"
                min={control.kind === "count" ? 0 : undefined}
                max={control.kind === "count" ? horizon : undefined}
                step={control.kind === "count" ? 1 : "any"}
                value={value}
                disabled={disabled}
                onChange={(event) => {
                  if (disabled) return;
                  const next = Number(event.currentTarget.value);
                  if (event.currentTarget.value.trim() === "" || !Number.isFinite(next)) return;
                  onChange(control.name, control.kind === "count" ? Math.max(0, Math.min(horizon, Math.round(next))) : next);
                }}
                className="num w-20 rounded border border-slate-300 bg-white px-2 py-1 text-right outline-none focus-visible:ring-2 focus-visible:ring-shallows disabled:bg-slate-100 disabled:text-slate-600"
              />
              {control.kind === "count" ? <span className="text-slate-600">of {horizon}</span> : null}
            </div>
          );
        })}
      </div>
    </fieldset>
  );
}

"use client";

import { useId, useState, type KeyboardEvent } from "react";
import { formatCentsPlain, parseAmountInput } from "@/server/planning/allocation";

export interface AmountFieldProps {
  /** Accessible name, e.g. "Search spend for the horizon". */
  label: string;
  /** Show the label above the field (otherwise it is only announced). */
  showLabel?: boolean;
  valueCents: number | undefined;
  /** Workspace locale (separators, grouping). */
  locale: string;
  /** Currency code shown beside the field, e.g. "EUR". */
  currency?: string;
  /** An empty field commits `undefined` (e.g. "no floor") instead of being an error. */
  allowEmpty?: boolean;
  /** Called with a parsed amount; returns an error sentence to show, or nothing. */
  onCommit: (cents: number | undefined) => string | null | void;
  disabled?: boolean;
  className?: string;
}

/**
 * A money input in the workspace locale. Typing is free; the value is read on blur or Enter
 * ("12,500", "12500.50", "41k"); an unreadable entry shows a sentence and changes nothing. Escape
 * restores the current value. While not being edited it shows the stored value.
 */
export function AmountField({
  label,
  showLabel = false,
  valueCents,
  locale,
  currency,
  allowEmpty = false,
  onCommit,
  disabled,
  className,
}: AmountFieldProps) {
  const id = useId();
  const [draft, setDraft] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);
  const shown = valueCents === undefined ? "" : formatCentsPlain(valueCents, locale);

  const commit = () => {
    if (draft === null) return;
    const text = draft.trim();
    if (text === "" && allowEmpty) {
      finish(onCommit(undefined));
      return;
    }
    const parsed = parseAmountInput(text, locale);
    if (!parsed.ok) {
      setError(parsed.message);
      return;
    }
    if (parsed.cents === valueCents) {
      finish(null);
      return;
    }
    finish(onCommit(parsed.cents));
  };
  const finish = (message: string | null | void) => {
    setError(message ?? null);
    setDraft(null);
  };
  const onKeyDown = (event: KeyboardEvent<HTMLInputElement>) => {
    if (event.key === "Enter") {
      event.preventDefault();
      commit();
    } else if (event.key === "Escape") {
      setDraft(null);
      setError(null);
    }
  };

  return (
    <div className={className}>
      <label htmlFor={id} className={showLabel ? "mb-1 block text-xs font-medium text-slate-600" : "sr-only"}>
        {label}
      </label>
      <div className="flex items-center gap-1">
        <input
          id={id}
          type="text"
          inputMode="decimal"
          autoComplete="off"
          spellCheck={false}
          disabled={disabled}
          value={draft ?? shown}
          aria-invalid={error ? true : undefined}
          aria-describedby={error ? `${id}-error` : undefined}
          onFocus={() => setDraft(shown)}
          onChange={(event) => setDraft(event.target.value)}
          onBlur={commit}
          onKeyDown={onKeyDown}
          className={`num w-full min-w-0 rounded border bg-white px-2 py-1 text-right outline-none focus-visible:ring-2 focus-visible:ring-shallows disabled:bg-slate-100 disabled:text-slate-600 ${
            error ? "border-ember" : "border-slate-300"
          }`}
        />
        {currency ? <span className="text-xs text-slate-600">{currency}</span> : null}
      </div>
      {error ? (
        <p id={`${id}-error`} role="alert" className="mt-1 text-xs text-[#9f3f2c]">
          {error}
        </p>
      ) : null}
    </div>
  );
}

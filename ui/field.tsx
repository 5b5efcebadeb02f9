import type { InputHTMLAttributes, ReactNode } from "react";

/** A labelled input with its hint and error, wired with aria-describedby / aria-invalid. */
export function TextField({
  label,
  name,
  hint,
  errors,
  className = "",
  ...input
}: InputHTMLAttributes<HTMLInputElement> & { label: ReactNode; name: string; hint?: ReactNode; errors?: string[] }) {
  const id = input.id ?? `field-${name}`;
  const hintId = hint ? `${id}-hint` : undefined;
  const errorId = errors?.length ? `${id}-error` : undefined;
  return (
    <div className={`flex flex-col gap-1 ${className}`}>
      <label htmlFor={id} className="text-sm font-medium text-slate-800">
        {label}
      </label>
      <input
        id={id}
        name={name}
        aria-invalid={errors?.length ? true : undefined}
        aria-describedby={[hintId, errorId].filter(Boolean).join(" ") || undefined}
        className={`rounded-md border bg-white px-3 py-2 text-base text-slate-900 shadow-sm focus:outline-2 focus:outline-offset-1 focus:outline-shallows ${
          errors?.length ? "border-ember" : "border-slate-300"
        }`}
        {...input}
      />
      {hint && (
        <p id={hintId} className="text-xs text-slate-600">
          {hint}
        </p>
      )}
      {errors?.length ? (
        <p id={errorId} className="text-sm text-ember">
          {errors.join(" ")}
        </p>
      ) : null}
    </div>
  );
}

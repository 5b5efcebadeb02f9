/**
 * A labelled progress bar: determinate when `value` is a fraction, otherwise an indeterminate stripe.
 * The label is always written out ("Uploading 42 MB of 100 MB"), never shown by the bar alone.
 */
export function ProgressBar({ label, detail, value, testId }: { label: string; detail?: string; value: number | null; testId?: string }) {
  const percent = value === null ? null : Math.max(0, Math.min(100, Math.round(value * 1000) / 10));
  return (
    <div className="flex flex-col gap-1.5" data-testid={testId}>
      <div className="flex flex-wrap items-baseline justify-between gap-2 text-sm">
        <span className="font-medium text-river" aria-live="polite">
          {label}
        </span>
        {detail || percent !== null ? (
          <span className="num text-slate-600">
            {detail}
            {detail && percent !== null ? " · " : ""}
            {percent !== null ? `${percent.toFixed(percent >= 10 ? 0 : 1)}%` : ""}
          </span>
        ) : null}
      </div>
      <div
        role="progressbar"
        aria-label={label}
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={percent ?? undefined}
        aria-valuetext={detail ? `${label} ${detail}` : label}
        className="relative h-3 overflow-hidden rounded-full bg-shallows-pale"
      >
        {percent !== null ? (
          <div className="h-full rounded-full bg-shallows transition-[width] duration-200" style={{ width: `${percent}%` }} />
        ) : (
          <div className="h-full w-full animate-pulse rounded-full bg-shallows-mid" />
        )}
      </div>
    </div>
  );
}

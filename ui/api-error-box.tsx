/** The `{ error, details }` body every route answers with on failure. */
export type ApiErrorBody = { error: string; details?: { path?: string; message: string; term?: string }[] };

/** A route's refusal shown as the route said it: the sentence, then one line per detail. */
export function ApiErrorBox({ error, className = "rounded-md px-3 py-2", testId }: { error: ApiErrorBody; className?: string; testId?: string }) {
  return (
    <div role="alert" className={`border-l-4 border-ember bg-white text-sm text-slate-900 ${className}`} data-testid={testId}>
      <p className="font-semibold text-ember">{error.error}</p>
      {error.details?.length ? (
        <ul className="mt-1 list-disc space-y-1 pl-5 text-slate-800">
          {error.details.map((detail, index) => (
            <li key={index}>{detail.message}</li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}

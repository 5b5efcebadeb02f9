/**
 * The outcome of a form, announced to screen readers (role=alert for problems, status for success).
 * Takes the `status`/`message` of a server action's state.
 */
export function FormMessage({ state, id }: { state: { status: string; message?: string }; id?: string }) {
  const problem = state.status === "invalid_data" || state.status === "forbidden" || state.status === "error";
  const text = "message" in state ? state.message : undefined;
  return (
    <div id={id} aria-live={problem ? "assertive" : "polite"} role={problem ? "alert" : "status"} className="min-h-0">
      {text ? (
        <p
          className={`rounded-md border-l-4 px-3 py-2 text-sm ${
            problem ? "border-ember bg-ember/10 text-slate-900" : "border-reed bg-reed/10 text-slate-900"
          }`}
        >
          {text}
        </p>
      ) : null}
    </div>
  );
}

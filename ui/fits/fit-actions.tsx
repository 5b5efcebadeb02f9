"use client";
import { useRouter } from "next/navigation";
import { useState, useTransition } from "react";
import { ApiErrorBox, type ApiErrorBody } from "@/ui/api-error-box";
import { buttonClass } from "@/ui/button-class";
import type { FitAction } from "@/server/fits/workflow";

type ApiError = ApiErrorBody;

const endpoints: Record<FitAction, { path: string; body: (comment: string) => object; label: string; pending: string }> = {
  submit: { path: "submit", body: (comment) => (comment ? { comment } : {}), label: "Send for review", pending: "Sending…" },
  approve: { path: "review", body: (comment) => ({ decision: "approve", ...(comment ? { comment } : {}) }), label: "Approve", pending: "Approving…" },
  "request-changes": { path: "review", body: (comment) => ({ decision: "request-changes", comment }), label: "Request changes", pending: "Sending…" },
  retire: { path: "retire", body: (comment) => (comment ? { comment } : {}), label: "Retire", pending: "Retiring…" },
};

/**
 * The review actions this person may take now (decided on the server; the API checks again).
 * One comment box serves every action; a request for changes needs it.
 */
export function FitActions(props: { fitId: string; actions: FitAction[]; selfApprovalBlocked: boolean; status: string }) {
  const router = useRouter();
  const [comment, setComment] = useState("");
  const [error, setError] = useState<ApiError | null>(null);
  const [running, setRunning] = useState<FitAction | null>(null);
  const [, startTransition] = useTransition();

  async function run(action: FitAction) {
    setError(null);
    if (action === "request-changes" && comment.trim() === "") {
      setError({ error: "Say what should change: a request for changes needs a comment." });
      return;
    }
    if (action === "retire" && !window.confirm("Retire this fit? Planners will no longer be able to start scenarios on it. This cannot be undone.")) return;
    setRunning(action);
    try {
      const endpoint = endpoints[action];
      const response = await fetch(`/api/fits/${props.fitId}/${endpoint.path}`, {
        method: "POST",
        headers: { "Content-Type": "application/json" },
        body: JSON.stringify(endpoint.body(comment.trim())),
      });
      if (!response.ok) {
        setError((await response.json().catch(() => ({ error: `The server answered ${response.status}.` }))) as ApiError);
        return;
      }
      setComment("");
      startTransition(() => router.refresh());
    } catch {
      setError({ error: "The server could not be reached; try again." });
    } finally {
      setRunning(null);
    }
  }

  if (props.actions.length === 0 && !props.selfApprovalBlocked) return null;
  return (
    <div className="space-y-3" data-testid="fit-actions">
      {props.actions.length > 0 ? (
        <div className="flex flex-col gap-1">
          <label htmlFor="fit-comment" className="text-sm font-medium text-slate-800">
            Comment {props.actions.includes("request-changes") ? <span className="font-normal text-slate-600">(required to request changes)</span> : <span className="font-normal text-slate-600">(optional)</span>}
          </label>
          <textarea
            id="fit-comment"
            value={comment}
            onChange={(event) => setComment(event.target.value)}
            rows={3}
            maxLength={4000}
            className="rounded-md border border-slate-300 bg-white px-3 py-2 text-sm shadow-sm focus:outline-2 focus:outline-shallows"
          />
        </div>
      ) : null}
      <div className="flex flex-wrap gap-2">
        {props.actions.map((action) => (
          <button
            key={action}
            type="button"
            disabled={running !== null}
            onClick={() => run(action)}
            className={buttonClass(action === "retire" ? "danger" : action === "request-changes" ? "secondary" : "primary")}
          >
            {running === action ? endpoints[action].pending : endpoints[action].label}
          </button>
        ))}
      </div>
      {props.selfApprovalBlocked ? (
        <p className="text-sm text-slate-700" data-testid="self-approval-note">
          You built this fit, so someone else must approve it (separation of duties). You can still request changes or retire it.
        </p>
      ) : null}
      {error ? <ApiErrorBox error={error} /> : null}
    </div>
  );
}

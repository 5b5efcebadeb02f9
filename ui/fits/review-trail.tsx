import type { FitTrailEntry } from "@/server/fits/types";
import { formatDateTime } from "./format";
import { fitStatusLabels } from "./status";

const verbs: Record<string, string> = {
  "fit.created": "built this fit",
  "fit.refitted": "refitted it",
  "fit.submitted": "sent it for review",
  "fit.approved": "approved it",
  "fit.changes_requested": "requested changes",
  "fit.retired": "retired it",
};

/** Who did what, when, with their comment: the fit's audit entries, oldest first. */
export function ReviewTrail({ entries, locale }: { entries: FitTrailEntry[]; locale: string }) {
  if (entries.length === 0) return <p className="text-sm text-slate-600">No entries yet.</p>;
  return (
    <ol className="relative space-y-4 border-l-2 border-shallows-pale pl-5" data-testid="review-trail">
      {entries.map((entry) => (
        <li key={entry.id} data-action={entry.action} className="relative">
          <span className="absolute -left-[27px] top-1.5 h-3 w-3 rounded-full border-2 border-white bg-shallows" aria-hidden="true" />
          <p className="text-sm text-slate-900">
            <strong className="font-semibold">{entry.actorName ?? entry.actorEmail ?? "Someone"}</strong> {verbs[entry.action] ?? entry.action}
            {entry.from && entry.to && entry.from !== entry.to ? (
              <span className="text-slate-600">
                {" "}
                ({fitStatusLabels[entry.from]} → {fitStatusLabels[entry.to]})
              </span>
            ) : null}
          </p>
          <p className="text-xs text-slate-600">
            <time dateTime={new Date(entry.at).toISOString()}>{formatDateTime(entry.at, locale)}</time>
          </p>
          {entry.comment ? <blockquote className="mt-1 whitespace-pre-wrap rounded bg-silt px-3 py-2 text-sm text-slate-800">{entry.comment}</blockquote> : null}
        </li>
      ))}
    </ol>
  );
}

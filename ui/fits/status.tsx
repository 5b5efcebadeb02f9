import type { FitStatus } from "@/server/fits/types";

export const fitStatusLabels: Record<FitStatus, string> = {
  draft: "Draft",
  in_review: "In review",
  changes_requested: "Changes requested",
  approved: "Approved",
  retired: "Retired",
};

/** The order states are listed in on the fits page: what needs someone first. */
export const fitStatusOrder: FitStatus[] = ["in_review", "changes_requested", "draft", "approved", "retired"];

const styles: Record<FitStatus, string> = {
  draft: "bg-slate-100 text-slate-800 border-slate-300",
  in_review: "bg-shallows-pale text-river border-shallows",
  changes_requested: "bg-white text-ember border-ember",
  approved: "bg-reed text-white border-reed",
  retired: "bg-slate-200 text-slate-600 border-slate-300 line-through decoration-slate-400",
};

/** The state as a word in a pill (colour never alone: the word is always there). */
export function FitStatusBadge({ status }: { status: FitStatus }) {
  return (
    <span data-testid="fit-status" data-status={status} className={`inline-flex items-center rounded-full border px-2.5 py-0.5 text-xs font-semibold ${styles[status]}`}>
      {fitStatusLabels[status]}
    </span>
  );
}

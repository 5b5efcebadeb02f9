export type DatasetStatusName = "needs-roles" | "ready";

const labels: Record<DatasetStatusName, string> = { "needs-roles": "Needs roles", ready: "Ready" };
const styles: Record<DatasetStatusName, string> = {
  "needs-roles": "bg-white text-ember border-ember",
  ready: "bg-reed text-white border-reed",
};

/** The state of a spend history as a word in a pill (never colour alone). */
export function DatasetStatusBadge({ status }: { status: DatasetStatusName }) {
  return (
    <span data-testid="dataset-status" data-status={status} className={`inline-flex items-center rounded-full border px-2.5 py-0.5 text-xs font-semibold ${styles[status]}`}>
      {labels[status]}
    </span>
  );
}

import { checksSummary, type ReportCheck } from "./report-checks";
import { textLinkClass } from "@/ui/button-class";

const statusWords: Record<ReportCheck["status"], string> = { ok: "OK", look: "Look", unknown: "Not checked" };
const statusStyles: Record<ReportCheck["status"], string> = {
  ok: "border-reed text-reed",
  look: "border-ember text-ember",
  unknown: "border-slate-300 text-slate-600",
};

/** The reviewer's run-down: one line per check, a word for its state (never colour alone) and a link to the details. */
export function ReportChecks({ checks, decided = false }: { checks: ReportCheck[]; /** Approved or retired: no approval ahead. */ decided?: boolean }) {
  return (
    <div>
      <p className="text-sm text-slate-800" data-testid="report-checks-summary">
        {checksSummary(checks, decided)}
      </p>
      <ul className="mt-3 flex flex-col gap-2" data-testid="report-checks">
        {checks.map((check) => (
          <li key={check.key} className="flex flex-wrap items-start gap-3 text-sm" data-check={check.key} data-status={check.status}>
            <span className={`inline-flex w-24 shrink-0 justify-center rounded-full border bg-white px-2 py-0.5 text-xs font-semibold ${statusStyles[check.status]}`}>
              {statusWords[check.status]}
              <span className="sr-only">:</span>
            </span>
            <span className="min-w-0 flex-1">
              <a href={check.anchor} className={`font-medium ${textLinkClass}`}>
                {check.label}
              </a>
              : <span className="text-slate-800">{check.text}</span>
            </span>
          </li>
        ))}
      </ul>
    </div>
  );
}

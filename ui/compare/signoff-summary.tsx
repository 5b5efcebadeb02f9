import type { ScenarioSignoffState, ScenarioSignoffSummaryDto } from "@/server/signoffs/types";

const pill: Record<ScenarioSignoffState, string> = {
  signed_off: "border-reed bg-reed text-white",
  declined: "border-ember bg-white text-[#9f3f2c]",
  awaiting: "border-shallows bg-white text-shallows",
  not_shared: "border-slate-300 bg-slate-50 text-slate-700",
  no_version: "border-slate-300 bg-slate-50 text-slate-700",
};

// A mark beside the words, so the state never rests on colour alone (the words carry it for screen readers).
const mark: Record<ScenarioSignoffState, string> = { signed_off: "✓", declined: "✕", awaiting: "…", not_shared: "–", no_version: "–" };

/** The pill's words: "Signed off v2 by Dana Okafor", "Declined v3", "Awaiting sign-off", "Not shared". */
export function signoffSummaryLabel(summary: ScenarioSignoffSummaryDto): string {
  const v = `v${summary.latestVersion}`;
  const who = summary.latestDecision?.decidedByName ?? "someone";
  switch (summary.state) {
    case "signed_off":
      return `Signed off ${v} by ${who}`;
    case "declined":
      return `Declined ${v} by ${who}`;
    case "awaiting":
      return `Awaiting sign-off of ${v}`;
    case "not_shared":
      return `${v} not shared with finance`;
    case "no_version":
      return "No version saved";
  }
}

/** The sentence after the pill when an earlier version is signed off but the latest is not: "v2 signed off; v3 not signed off". */
export function earlierSignoffText(summary: ScenarioSignoffSummaryDto): string | null {
  if (!summary.earlierSignedOff || summary.latestVersion === null) return null;
  return `v${summary.earlierSignedOff.version} signed off; v${summary.latestVersion} not signed off`;
}

/**
 * A scenario's finance status in a line: the latest version's state as words in a pill (reed for
 * signed off, with a mark), a decline's reason, and whether an earlier version was signed off.
 */
export function SignoffSummary({ summary, className }: { summary: ScenarioSignoffSummaryDto; className?: string }) {
  const earlier = earlierSignoffText(summary);
  const reason = summary.state === "declined" ? summary.latestDecision?.reason : null;
  return (
    <span data-testid="signoff-summary" data-state={summary.state} data-version={summary.latestVersion ?? undefined} className={`inline-flex flex-wrap items-center gap-x-2 gap-y-1 ${className ?? ""}`}>
      <span className={`inline-flex items-center gap-1 whitespace-nowrap rounded-full border px-2.5 py-0.5 text-xs font-semibold ${pill[summary.state]}`}>
        <span aria-hidden="true">{mark[summary.state]}</span>
        {signoffSummaryLabel(summary)}
      </span>
      {reason ? <span className="text-xs text-slate-700">“{reason}”</span> : null}
      {earlier ? (
        <span data-testid="signoff-earlier" className="text-xs text-slate-700">
          {earlier}
        </span>
      ) : null}
    </span>
  );
}

import type { SignoffDto } from "@/server/signoffs/types";
import { dateText } from "./format";

const styles = {
  signed_off: "border-reed bg-reed text-white",
  declined: "border-ember bg-white text-[#9f3f2c]",
  none: "border-slate-300 bg-slate-50 text-slate-700",
} as const;

/**
 * A version's finance status as words in a pill (colour never alone): "Signed off", "Declined" or
 * "Not signed off". A sign-off belongs to exactly one version, so a later version shows "Not signed off".
 */
export function SignoffBadge({ signoff, version, locale }: { signoff: Pick<SignoffDto, "decision" | "decidedByName" | "decidedAt" | "reason"> | null; version?: number; locale: string }) {
  const state = signoff?.decision ?? "none";
  const label = state === "signed_off" ? "Signed off" : state === "declined" ? "Declined" : "Not signed off";
  const title = signoff
    ? `${label} by ${signoff.decidedByName ?? "someone"} on ${dateText(signoff.decidedAt, locale)}${signoff.reason ? `: ${signoff.reason}` : ""}`
    : `No finance decision on ${version ? `version ${version}` : "this version"} yet`;
  return (
    <span
      data-testid="signoff-badge"
      data-state={state}
      data-version={version}
      title={title}
      className={`inline-flex items-center whitespace-nowrap rounded-full border px-2.5 py-0.5 text-xs font-semibold ${styles[state]}`}
    >
      {version ? `v${version} · ` : ""}
      {label}
    </span>
  );
}

/** The decision in a sentence: who, when, and the reason of a decline. */
export function SignoffSentence({ signoff, version, locale }: { signoff: SignoffDto | null; version: number; locale: string }) {
  if (!signoff) return <span data-testid="signoff-sentence">Version {version} is not signed off.</span>;
  const who = signoff.decidedByName ?? "someone";
  return (
    <span data-testid="signoff-sentence">
      {signoff.decision === "signed_off" ? (
        <>
          Version {version} was signed off by {who} on {dateText(signoff.decidedAt, locale)}
          {signoff.reason ? <> (“{signoff.reason}”)</> : null}.
        </>
      ) : (
        <>
          Version {version} was declined by {who} on {dateText(signoff.decidedAt, locale)}: “{signoff.reason}”
        </>
      )}
    </span>
  );
}

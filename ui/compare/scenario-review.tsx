"use client";

import Link from "next/link";
import { useRouter, useSearchParams } from "next/navigation";
import { useEffect, useState } from "react";
import type { CommentDto } from "@/server/comments/store";
import type { Mentionable } from "@/server/comments/mentions";
import type { MoneyLocale } from "@/server/planning/allocation";
import type { SignoffDto } from "@/server/signoffs/types";
import { formatMoney } from "@/ui/scenario/format";
import { CommentThread } from "./comment-thread";
import { dateText } from "./format";
import { ShareForm, type FinanceMember } from "./share-form";
import { SignoffBadge, SignoffSentence } from "./signoff-badge";
import { SignoffForm } from "./signoff-form";
import { textLinkClass } from "@/ui/button-class";

export type ReviewVersion = {
  number: number;
  total: number;
  note: string;
  authorName: string | null;
  createdAt: string;
  warned: boolean;
  signoff: SignoffDto | null;
  history: SignoffDto[];
  sharedWith: string[];
};

export type ScenarioReviewProps = {
  scenarioId: string;
  scenarioName: string;
  versions: ReviewVersion[];
  comments: CommentDto[];
  members: Mentionable[];
  financeMembers: FinanceMember[];
  currentUserId: string;
  money: MoneyLocale;
  can: { comment: boolean; decide: boolean; share: boolean; compare: boolean };
};

/** Re-reads the page's server data when someone saves a newer version (the room above saves without a reload). */
function useLatestVersionWatch(scenarioId: string, latest: number | null) {
  const router = useRouter();
  useEffect(() => {
    const check = async () => {
      if (document.visibilityState !== "visible") return;
      const response = await fetch(`/api/scenarios/${scenarioId}/versions`).catch(() => null);
      if (!response?.ok) return;
      const body = (await response.json()) as { versions: { number: number }[] };
      const newest = body.versions.at(-1)?.number ?? null;
      if (newest !== latest) router.refresh();
    };
    const timer = window.setInterval(check, 4_000);
    return () => window.clearInterval(timer);
  }, [scenarioId, latest, router]);
}

/**
 * The finance side of a scenario: each version's sign-off status (bound to that version: a later
 * version is not signed off), the review of one version (decision, comments), and sharing it.
 */
export function ScenarioReview({ scenarioId, scenarioName, versions, comments, members, financeMembers, currentUserId, money, can }: ScenarioReviewProps) {
  const params = useSearchParams();
  const latest = versions.at(-1) ?? null;
  const requested = Number(params?.get("version")); // nullable in the types only (see nav-links.tsx)
  const [selected, setSelected] = useState<number | null>(versions.some((version) => version.number === requested) ? requested : (latest?.number ?? null));
  useLatestVersionWatch(scenarioId, latest?.number ?? null);
  // Follow a newly saved version when the reviewer was looking at the latest one.
  const [seenLatest, setSeenLatest] = useState(latest?.number ?? null);
  if ((latest?.number ?? null) !== seenLatest) {
    if (selected === seenLatest || selected === null || !versions.some((version) => version.number === selected)) setSelected(latest?.number ?? null);
    setSeenLatest(latest?.number ?? null);
  }

  const signedOff = [...versions].reverse().find((version) => version.signoff?.decision === "signed_off") ?? null;
  const current = versions.find((version) => version.number === selected) ?? null;
  const lastTwo = versions.slice(-2);

  return (
    <section id="review" aria-labelledby="review-heading" className="rounded-lg border border-slate-200 bg-white p-5 shadow-sm">
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <h2 id="review-heading" className="text-lg font-semibold text-river">
            Finance review
          </h2>
          <p className="mt-1 text-sm text-slate-800" data-testid="scenario-signoff-status">
            {latest === null ? (
              "Nothing to review until the first version is saved."
            ) : (
              <>
                Latest version {latest.number}: <SignoffBadge signoff={latest.signoff} version={latest.number} locale={money.locale} />
                {signedOff && signedOff.number !== latest.number ? (
                  <span className="ml-2 text-slate-700">
                    Version {signedOff.number} is signed off; version {latest.number} is not.
                  </span>
                ) : null}
              </>
            )}
          </p>
        </div>
        {can.compare && lastTwo.length === 2 ? (
          <Link
            href={`/compare/view?v=${scenarioId}:${lastTwo[0].number}&v=${scenarioId}:${lastTwo[1].number}&baseline=0`}
            className="rounded-md border border-shallows bg-white px-3 py-1.5 text-sm font-medium text-shallows hover:bg-shallows-pale"
          >
            Versions {lastTwo[0].number} and {lastTwo[1].number} side by side
          </Link>
        ) : null}
      </div>

      {versions.length > 0 ? (
        <table className="num mt-4 w-full text-sm" data-testid="version-signoffs">
          <thead>
            <tr className="text-left text-xs text-slate-600">
              <th className="py-1 font-medium">Version</th>
              <th className="py-1 text-right font-medium">Total spend</th>
              <th className="py-1 pl-4 font-medium">Saved</th>
              <th className="py-1 font-medium">Finance</th>
              <th className="py-1 font-medium">Shared with</th>
              <th className="py-1">
                <span className="sr-only">Review</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {[...versions].reverse().map((version) => (
              <tr key={version.number} className={`border-t border-slate-100 ${version.number === selected ? "bg-shallows-pale/50" : ""}`} data-testid="version-signoff-row" data-version={version.number}>
                <td className={`py-2 ${version.warned ? "border-l-4 border-ember pl-2" : ""}`}>
                  v{version.number}
                  {version.warned ? <span className="block text-xs text-[#9f3f2c]">has warnings</span> : null}
                </td>
                <td className="py-2 text-right">{formatMoney(version.total, money)}</td>
                <td className="py-2 pl-4 text-slate-700">
                  {version.authorName ?? "—"}, {dateText(version.createdAt, money.locale)}
                </td>
                <td className="py-2">
                  <SignoffBadge signoff={version.signoff} locale={money.locale} />
                </td>
                <td className="py-2 text-slate-700">{version.sharedWith.length > 0 ? version.sharedWith.join(", ") : "—"}</td>
                <td className="py-2 text-right">
                  <button type="button" onClick={() => setSelected(version.number)} aria-pressed={version.number === selected} className={`text-sm font-medium ${textLinkClass}`}>
                    Review v{version.number}
                  </button>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      ) : null}

      {current ? (
        <div className="mt-5 space-y-4 border-t border-slate-200 pt-4" data-testid="version-review" data-version={current.number}>
          <h3 className="text-base font-semibold text-river">Version {current.number}</h3>
          <p className="text-sm">
            <SignoffSentence signoff={current.signoff} version={current.number} locale={money.locale} />
          </p>
          {current.history.length > 1 ? (
            <details className="text-sm text-slate-700">
              <summary className="cursor-pointer text-shallows">Earlier decisions on version {current.number}</summary>
              <ul className="mt-1 list-disc pl-5">
                {current.history.slice(1).map((entry) => (
                  <li key={entry.id}>
                    {entry.decision === "signed_off" ? "Signed off" : "Declined"} by {entry.decidedByName ?? "someone"} on {dateText(entry.decidedAt, money.locale)}
                    {entry.reason ? `: “${entry.reason}”` : ""}
                  </li>
                ))}
              </ul>
            </details>
          ) : null}
          {can.decide ? <SignoffForm key={current.number} scenarioId={scenarioId} version={current.number} scenarioName={scenarioName} warned={current.warned} decided={current.signoff?.decision ?? null} /> : null}
          {can.share ? (
            <details className="rounded-md border border-slate-200 p-3" data-testid="share-version">
              <summary className="cursor-pointer text-sm font-medium text-shallows">Share version {current.number} with finance</summary>
              <div className="mt-3">
                <ShareForm
                  key={current.number}
                  target={{ kind: "version", scenarioId, version: current.number }}
                  financeMembers={financeMembers}
                  warnedVersions={current.warned ? [`Version ${current.number}`] : []}
                  title={`version ${current.number}`}
                />
              </div>
            </details>
          ) : null}
          <CommentThread
            key={`thread-${current.number}`}
            comments={comments.filter((comment) => comment.version === current.number)}
            scenarioId={scenarioId}
            version={current.number}
            comparisonId={null}
            canComment={can.comment}
            members={members}
            currentUserId={currentUserId}
            locale={money.locale}
          />
        </div>
      ) : null}
    </section>
  );
}

"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState, useTransition } from "react";
import type { CommentDto } from "@/server/comments/store";
import type { Mentionable } from "@/server/comments/mentions";
import type { ComparisonDto } from "@/server/comparisons/types";
import type { MoneyLocale } from "@/server/planning/allocation";
import { buttonClass, textLinkClass } from "@/ui/button-class";
import { cautionText } from "@/ui/scenario/cautions";
import { problemText, reviewApi } from "./api";
import { CommentThread } from "./comment-thread";
import { ComparisonTable } from "./comparison-table";
import { dateText, levelText } from "./format";
import { IntervalsChart } from "./intervals-chart";
import { ShareForm, type FinanceMember } from "./share-form";
import { SignoffBadge, SignoffSentence } from "./signoff-badge";
import { SignoffForm } from "./signoff-form";
import { defaultReviewedPosition } from "./review-default";

export type ComparisonScreenProps = {
  comparison: ComparisonDto;
  money: MoneyLocale;
  comments: CommentDto[];
  members: Mentionable[];
  financeMembers: FinanceMember[];
  currentUserId: string;
  can: { save: boolean; share: boolean; comment: boolean; decide: boolean };
};

const refParam = (column: { scenarioId: string; version: number }) => `${column.scenarioId}:${column.version}`;

/** Where the same versions are shown against another baseline. */
function baselineHref(comparison: ComparisonDto, position: number): string {
  if (comparison.id) return `/compare/${comparison.id}?baseline=${position}`;
  const query = new URLSearchParams(comparison.columns.map((column) => ["v", refParam(column)]));
  query.set("baseline", String(position));
  return `/compare/view?${query.toString()}`;
}

function SaveForm({ comparison }: { comparison: ComparisonDto }) {
  const router = useRouter();
  const [name, setName] = useState("");
  const [problem, setProblem] = useState<string | null>(null);
  const [pending, startTransition] = useTransition();
  return (
    <form
      className="flex flex-wrap items-end gap-2 print:hidden"
      onSubmit={(event) => {
        event.preventDefault();
        setProblem(null);
        startTransition(async () => {
          try {
            const saved = await reviewApi.saveComparison({
              name,
              versions: comparison.columns.map((column) => ({ scenarioId: column.scenarioId, version: column.version })),
              baseline: comparison.baselinePosition,
            });
            router.push(`/compare/${saved.id}`);
          } catch (error) {
            setProblem(problemText(error));
          }
        });
      }}
    >
      <label className="flex flex-col gap-1 text-sm">
        <span className="font-medium text-slate-700">Name this comparison</span>
        <input
          value={name}
          onChange={(event) => setName(event.currentTarget.value)}
          maxLength={200}
          required
          placeholder="e.g. Q3 options for finance"
          className="w-72 rounded border border-slate-300 px-2 py-1.5 outline-none focus-visible:ring-2 focus-visible:ring-shallows"
        />
      </label>
      <button type="submit" disabled={pending || name.trim() === ""} className={buttonClass("primary")}>
        {pending ? "Saving…" : "Save comparison"}
      </button>
      <div aria-live="polite" className="basis-full">
        {problem ? (
          <p role="alert" className="rounded-md border-l-4 border-ember bg-ember/10 px-3 py-2 text-sm">
            {problem}
          </p>
        ) : null}
      </div>
    </form>
  );
}

/**
 * "Side by side": 2–4 versions as columns, the intervals charted on one axis, each version's
 * difference from the chosen baseline, and the review of each version (sign-off, comments).
 * Read-only for everyone: allocations change only on the scenario page, by planners.
 */
export function ComparisonScreen({ comparison, money, comments, members, financeMembers, currentUserId, can }: ComparisonScreenProps) {
  const router = useRouter();
  const { columns } = comparison;
  const [reviewed, setReviewed] = useState(() => defaultReviewedPosition(columns, comparison.baselinePosition));
  const [sharing, setSharing] = useState(false);
  const outcome = columns[0].outcomeShape;
  const level = columns[0].level;
  const baseline = columns[comparison.baselinePosition];
  const current = columns[Math.min(reviewed, columns.length - 1)];
  const warnedVersions = columns.filter((column) => column.warnings.length > 0).map((column) => `${column.scenarioName} v${column.version}`);
  const title = (column: (typeof columns)[number]) => `${column.scenarioName} v${column.version}`;

  return (
    <div className="space-y-6" data-compare-print>
      <div className="flex flex-wrap items-end justify-between gap-4">
        <div>
          <p className="text-sm text-slate-600 print:hidden">
            <Link href="/compare" className={textLinkClass}>
              Side by side
            </Link>{" "}
            / {comparison.id ? "saved comparison" : "not saved"}
          </p>
          <h1 className="text-2xl font-semibold text-river" data-testid="comparison-title">
            {comparison.name ?? columns.map(title).join(" vs ")}
          </h1>
          {comparison.id ? (
            <p className="text-sm text-slate-600">
              Saved by {comparison.createdByName ?? "—"} on {dateText(comparison.createdAt, money.locale)}
            </p>
          ) : null}
        </div>
        <div className="flex flex-wrap items-center gap-2 print:hidden">
          <label className="flex items-center gap-2 text-sm text-slate-700">
            <span>Differences from</span>
            <select
              aria-label="Baseline version"
              value={comparison.baselinePosition}
              onChange={(event) => router.push(baselineHref(comparison, Number(event.currentTarget.value)))}
              className="rounded border border-slate-300 bg-white px-2 py-1.5 text-sm"
            >
              {columns.map((column) => (
                <option key={column.position} value={column.position}>
                  {title(column)}
                </option>
              ))}
            </select>
          </label>
          {comparison.id ? (
            <>
              <a href={`/api/comparisons/${comparison.id}/export.csv`} className={buttonClass("secondary", "py-1.5")} download>
                Export CSV
              </a>
              <a href={`/api/comparisons/${comparison.id}/export.pdf`} className={buttonClass("secondary", "py-1.5")} download>
                PDF for finance
              </a>
            </>
          ) : null}
          <button type="button" onClick={() => window.print()} className={buttonClass("secondary", "py-1.5")}>
            Print
          </button>
          {comparison.id && can.share ? (
            <button type="button" onClick={() => setSharing((open) => !open)} aria-expanded={sharing} className={buttonClass("primary", "py-1.5")}>
              Share with finance
            </button>
          ) : null}
        </div>
      </div>

      {!comparison.id && can.save ? <SaveForm comparison={comparison} /> : null}
      {!comparison.id && !can.save ? <p className="text-sm text-slate-600">Planners and finance can save this comparison to share it.</p> : null}
      {comparison.id && can.share && sharing ? (
        <section aria-label="Share" className="rounded-lg border border-slate-200 bg-white p-4 shadow-sm">
          <ShareForm target={{ kind: "comparison", comparisonId: comparison.id }} financeMembers={financeMembers} warnedVersions={warnedVersions} title="this comparison" />
        </section>
      ) : null}

      <section className="rounded-lg border border-slate-200 bg-white p-5 shadow-sm" aria-label="Versions side by side">
        <ComparisonTable comparison={comparison} money={money} />
        <div className="mt-4 space-y-1 border-t border-slate-100 pt-3 text-xs text-slate-600" data-testid="cautions">
          <p>{cautionText.association}</p>
          <p>{cautionText.modelHolds}</p>
          <p>{cautionText.testFirst}</p>
        </div>
      </section>

      <section className="grid gap-6 rounded-lg border border-slate-200 bg-white p-5 shadow-sm lg:grid-cols-2 print:grid-cols-1" aria-label="Intervals">
        <IntervalsChart
          testId="outcome-chart"
          outcome={outcome}
          money={money}
          reference={null}
          caption={`Predicted ${outcome.label.toLowerCase()} over each horizon: pale band ${levelText(level)} prediction interval, darker band ${levelText(level)} confidence interval, tick the expected total.`}
          rows={columns.map((column) => ({
            key: String(column.position),
            label: column.scenarioName,
            tag: `v${column.version}`,
            point: column.outcome.mean,
            confidence: column.outcome.confidence,
            prediction: column.outcome.prediction,
            tone: column.warnings.length > 0 ? "warning" : "normal",
          }))}
        />
        <IntervalsChart
          testId="difference-chart"
          outcome={outcome}
          money={money}
          reference={0}
          signed
          caption={`Difference of each expected total from ${title(baseline)}, with its own ${levelText(level)} confidence interval from the fit's covariance (dashed line: no difference).`}
          rows={columns
            .filter((column) => column.position !== comparison.baselinePosition)
            .map((column) =>
              column.difference.kind === "joint"
                ? { key: String(column.position), label: column.scenarioName, tag: `v${column.version}`, point: column.difference.mean, confidence: column.difference.confidence, prediction: null }
                : { key: String(column.position), label: column.scenarioName, tag: `v${column.version}`, point: null, note: "No joint interval: the fits differ, so each outcome stands alone." },
            )}
        />
      </section>

      <section className="rounded-lg border border-slate-200 bg-white p-5 shadow-sm" aria-labelledby="review-heading" id="review">
        <h2 id="review-heading" className="text-lg font-semibold text-river">
          Review
        </h2>
        <p className="mt-1 text-sm text-slate-600">Comments and sign-off belong to one version: a later version of a scenario starts without them.</p>
        <div role="tablist" aria-label="Version to review" className="mt-4 flex flex-wrap gap-2 print:hidden">
          {columns.map((column, index) => (
            <button
              key={column.position}
              type="button"
              role="tab"
              aria-selected={index === reviewed}
              onClick={() => setReviewed(index)}
              className={`flex items-center gap-2 rounded-md border px-3 py-1.5 text-sm ${index === reviewed ? "border-river bg-river text-white" : "border-slate-300 bg-white text-slate-800 hover:bg-shallows-pale"}`}
            >
              {title(column)}
              <SignoffBadge signoff={column.signoff} locale={money.locale} />
            </button>
          ))}
        </div>
        <div role="tabpanel" className="mt-4 space-y-4" data-testid="review-panel" data-version={current.version}>
          <p className="text-sm text-slate-800">
            <SignoffSentence signoff={current.signoff} version={current.version} locale={money.locale} />
          </p>
          {can.decide ? (
            <SignoffForm key={`${current.scenarioId}:${current.version}`} scenarioId={current.scenarioId} version={current.version} scenarioName={current.scenarioName} warned={current.warnings.length > 0} decided={current.signoff?.decision ?? null} />
          ) : null}
          <CommentThread
            key={`thread-${current.scenarioId}:${current.version}`}
            comments={comments.filter((comment) => comment.scenarioId === current.scenarioId && comment.version === current.version)}
            scenarioId={current.scenarioId}
            version={current.version}
            comparisonId={comparison.id}
            canComment={can.comment}
            members={members}
            currentUserId={currentUserId}
            locale={money.locale}
          />
        </div>
      </section>
    </div>
  );
}

import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { z } from "zod";
import { can, requirePageActor } from "@/server/authz";
import { getFitById, listFitTrail } from "@/server/fits/store";
import { availableFitActions } from "@/server/fits/workflow";
import { buttonClass, textLinkClass } from "@/ui/button-class";
import { CoefficientTable } from "@/ui/fits/coefficient-table";
import { CollinearitySection } from "@/ui/fits/collinearity-section";
import { DiagnosticsSection } from "@/ui/fits/diagnostics-section";
import { FitActions } from "@/ui/fits/fit-actions";
import { durbinWatsonNote, FitSummary, unequalVarianceNote } from "@/ui/fits/fit-summary";
import { HoldoutSection } from "@/ui/fits/holdout-section";
import { reportChecks } from "@/ui/fits/report-checks";
import { ReportChecks } from "@/ui/fits/report-checks-section";
import { formatDateTime } from "@/ui/fits/format";
import { ReviewTrail } from "@/ui/fits/review-trail";
import { FitStatusBadge } from "@/ui/fits/status";
import { Section } from "@/ui/section";
import { Breadcrumb } from "@/ui/breadcrumb";

export const metadata: Metadata = { title: "Fit report" };

type Props = { params: Promise<{ id: string }> };

export default async function FitReportPage({ params }: Props) {
  const actor = await requirePageActor("fit:read");
  const { id } = await params;
  if (!z.uuid().safeParse(id).success) notFound();
  const fit = await getFitById(id);
  if (!fit || fit.workspaceId !== actor.workspaceId) notFound();
  const trail = await listFitTrail({ workspaceId: actor.workspaceId, fitId: fit.id });
  const report = fit.report;
  const locale = actor.locale;
  const actions = availableFitActions(fit, actor);
  const selfApprovalBlocked = fit.status === "in_review" && can(actor, "fit:review") && fit.authorId === actor.userId;
  const dw = durbinWatsonNote(report);
  const suggestNeweyWest = dw?.tone === "warning" && report.covariance.type !== "newey-west" && can(actor, "fit:create");
  // Newey–West allows for unequal variance too, so HC3 is only offered when autocorrelation is not the issue.
  const suggestHc3 = !suggestNeweyWest && unequalVarianceNote(report)?.tone === "warning" && report.covariance.type === "classical" && can(actor, "fit:create");

  return (
    <div className="flex flex-col gap-6">
      <div className="flex flex-wrap items-start justify-between gap-4">
        <div>
          <Breadcrumb trail={[{ href: "/fits", label: "Fits" }]} />
          <h1 className="mt-1 flex flex-wrap items-center gap-3 text-2xl font-semibold text-river">
            <span data-testid="fit-name">{fit.name}</span> <FitStatusBadge status={fit.status} />
          </h1>
          <p className="mt-1 text-sm text-slate-700">
            <span className="font-mono">{report.outcome}</span> on {report.coefficients.length - (report.intercept ? 1 : 0)} terms
            {report.intercept ? " with an intercept" : ", no intercept"} · {report.n.toLocaleString(locale)} rows of{" "}
            <Link href={`/datasets/${fit.datasetId}`} className={textLinkClass}>
              {fit.datasetName ?? "the spend history"}
            </Link>{" "}
            · built by {fit.authorName ?? "—"} on {formatDateTime(fit.createdAt, locale)}
            {fit.approvedAt ? ` · approved by ${fit.approvedByName ?? "—"} on ${formatDateTime(fit.approvedAt, locale)}` : ""}
          </p>
          {fit.status === "approved" || fit.status === "retired" ? (
            <p className="mt-1 text-xs text-slate-600">
              Frozen: the database refuses any change to this fit&apos;s numbers and to its data. Record checksum{" "}
              <span className="font-mono">{fit.recordChecksum.slice(0, 19)}…</span>
            </p>
          ) : null}
        </div>
        {fit.status === "approved" && can(actor, "scenario:write") ? (
          // Planners plan on approved fits (issue 5).
          <Link href={`/scenarios/new?fitId=${fit.id}`} className={buttonClass("primary", "ml-auto")}>
            Start a scenario
          </Link>
        ) : null}
        {can(actor, "fit:create") ? (
          <Link href={`/fits/new?from=${fit.id}`} className={buttonClass("secondary")}>
            {fit.authorId === actor.userId && (fit.status === "draft" || fit.status === "changes_requested") ? "Change and refit" : "Build a new fit from this one"}
          </Link>
        ) : null}
        <Link href={`/fits/compare?choose=1&ids=${fit.id}`} className={buttonClass("secondary")}>
          Compare with other fits
        </Link>
      </div>

      <Section id="checks" title="Checks" description="What a reviewer reads before approving, from the numbers below; each links to its section.">
        <ReportChecks
          checks={reportChecks(report, fit.input.terms.filter((term) => term.role === "spend").map((term) => term.column), locale)}
          decided={fit.status === "approved" || fit.status === "retired"}
        />
      </Section>

      {actions.length > 0 || selfApprovalBlocked ? (
        <Section id="review" title="Review" description={reviewHint(fit.status)}>
          <FitActions fitId={fit.id} actions={actions} selfApprovalBlocked={selfApprovalBlocked} status={fit.status} />
        </Section>
      ) : null}

      <Section id="coefficients" title="Coefficients" description="What each term is associated with, per unit, holding the other terms at their values.">
        <p className="mb-3 rounded-md border-l-4 border-ember bg-silt px-3 py-2 text-sm text-slate-900" data-testid="association-caution">
          These effects are associations in past data, not the result of changing one channel alone.
        </p>
        <CoefficientTable report={report} locale={locale} />
      </Section>

      <Section id="summary" title="Fit summary">
        <FitSummary report={report} locale={locale} />
        {suggestNeweyWest ? (
          <p className="mt-3">
            <Link href={`/fits/new?from=${fit.id}&covariance=newey-west`} className={buttonClass("secondary")}>
              Refit with Newey–West standard errors
            </Link>
          </p>
        ) : null}
        {suggestHc3 ? (
          <p className="mt-3">
            <Link href={`/fits/new?from=${fit.id}&covariance=hc3`} className={buttonClass("secondary")}>
              Refit with HC3 standard errors
            </Link>
          </p>
        ) : null}
      </Section>

      <Section id="collinearity" title="Collinearity" description="Terms that move together share credit: their separate estimates are uncertain.">
        <CollinearitySection report={report} locale={locale} />
      </Section>

      <Section id="diagnostics" title="Diagnostics" description="Do the residuals look like noise? Are a few weeks steering the fit?">
        <DiagnosticsSection report={report} locale={locale} />
      </Section>

      <Section id="holdout" title="Held-out check" description="How the model would have predicted the latest periods had it not seen them.">
        <HoldoutSection report={report} locale={locale} />
      </Section>

      <Section id="trail" title="Review trail" description="Every step of this fit, from the audit log.">
        <ReviewTrail entries={trail} locale={locale} />
      </Section>
    </div>
  );
}

function reviewHint(status: string): string {
  switch (status) {
    case "draft":
      return "When the report looks right, send it for review. A reviewer who did not build it approves it or asks for changes.";
    case "changes_requested":
      return "A reviewer asked for changes (see the review trail). Refit, then send it for review again.";
    case "in_review":
      return "Approve to freeze this fit and let planners use it, or request changes with a comment.";
    case "approved":
      return "Approved fits are frozen. Retire it when planners should stop using it.";
    default:
      return "";
  }
}

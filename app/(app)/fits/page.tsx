import type { Metadata } from "next";
import Link from "next/link";
import { can, requirePageActor } from "@/server/authz";
import { listFitsByWorkspaceId } from "@/server/fits/store";
import type { FitStatus, FitSummaryDto } from "@/server/fits/types";
import { buttonClass, textLinkClass } from "@/ui/button-class";
import { formatDateTime, formatNumber } from "@/ui/fits/format";
import { FitStatusBadge, fitStatusLabels, fitStatusOrder } from "@/ui/fits/status";
import { PageHeading, Section } from "@/ui/section";

export const metadata: Metadata = { title: "Fits" };

const descriptions: Record<FitStatus, string> = {
  in_review: "Waiting for a reviewer who did not build them.",
  changes_requested: "A reviewer asked for changes; the author refits and sends them again.",
  draft: "Built, not yet sent for review.",
  approved: "Frozen; planners build scenarios on these.",
  retired: "No longer offered to planners; kept, frozen, for the record.",
};

export default async function FitsPage() {
  const actor = await requirePageActor("fit:read");
  const fits = await listFitsByWorkspaceId({ workspaceId: actor.workspaceId });
  const byStatus = new Map<FitStatus, FitSummaryDto[]>();
  for (const fit of fits) byStatus.set(fit.status, [...(byStatus.get(fit.status) ?? []), fit]);

  return (
    <div className="flex flex-col gap-6">
      <div className="flex flex-wrap items-start justify-between gap-4">
        <PageHeading title="Fits">
          Regressions of an outcome on spend channels and controls; scenarios start only from approved ones. Scripts can list, build and review fits through{" "}
          <Link href="/api-docs#api-fits" className={textLinkClass}>
            the API
          </Link>
          .
        </PageHeading>
        <div className="flex flex-wrap gap-2">
          {can(actor, "fit:create") ? (
            <Link href="/fits/new" className={buttonClass("primary")}>
              Build a fit
            </Link>
          ) : null}
          {fits.length >= 2 ? (
            <Link href="/fits/compare" className={buttonClass("secondary")}>
              Compare fits
            </Link>
          ) : null}
        </div>
      </div>
      {fits.length === 0 ? (
        <Section title="No fits yet">
          <p className="text-sm text-slate-700">
            {can(actor, "fit:create") ? "Build the first one from a spend history." : "Analysts build fits from spend histories; they appear here."}
          </p>
        </Section>
      ) : null}
      {fitStatusOrder
        .filter((status) => byStatus.has(status))
        .map((status) => (
          <Section key={status} id={`fits-${status}`} title={`${fitStatusLabels[status]} (${byStatus.get(status)!.length})`} description={descriptions[status]}>
            <div className="overflow-x-auto">
              <table className="w-full min-w-[760px] table-fixed text-sm" data-testid={`fits-${status}`}>
                <colgroup>
                  <col className="w-[34%]" />
                  <col className="w-[22%]" />
                  <col className="w-[7%]" />
                  <col className="w-[7%]" />
                  <col className="w-[7%]" />
                  <col className="w-[11%]" />
                  <col className="w-[12%]" />
                </colgroup>
                <thead>
                  <tr className="border-b border-slate-300 text-left text-xs uppercase tracking-wide text-slate-600">
                    <th scope="col" className="py-2 pr-3">Fit</th>
                    <th scope="col" className="py-2 pr-3">Spend history</th>
                    <th scope="col" className="py-2 pr-3 text-right">Terms</th>
                    <th scope="col" className="py-2 pr-3 text-right">n</th>
                    <th scope="col" className="py-2 pr-3 text-right">R²</th>
                    <th scope="col" className="py-2 pr-3">Author</th>
                    <th scope="col" className="py-2">Last change</th>
                  </tr>
                </thead>
                <tbody>
                  {byStatus.get(status)!.map((fit) => (
                    <tr key={fit.id} className="border-b border-slate-100">
                      <td className="py-2 pr-3">
                        <Link href={`/fits/${fit.id}`} className={`font-medium ${textLinkClass}`}>
                          {fit.name}
                        </Link>{" "}
                        <FitStatusBadge status={fit.status} />
                      </td>
                      <td className="py-2 pr-3 text-slate-700">{fit.datasetName ?? "—"}</td>
                      <td className="num py-2 pr-3 text-right">{fit.termCount}</td>
                      <td className="num py-2 pr-3 text-right">{fit.n.toLocaleString(actor.locale)}</td>
                      <td className="num py-2 pr-3 text-right">{formatNumber(fit.rSquared, actor.locale, 3)}</td>
                      <td className="py-2 pr-3 text-slate-700">{fit.authorName ?? "—"}</td>
                      <td className="py-2 text-slate-600">{formatDateTime(fit.updatedAt, actor.locale)}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          </Section>
        ))}
    </div>
  );
}

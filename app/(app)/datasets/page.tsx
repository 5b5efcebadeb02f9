import type { Metadata } from "next";
import Link from "next/link";
import { can, requirePageActor } from "@/server/authz";
import { getPeopleByIds } from "@/server/datasets/details";
import { listDatasetsByWorkspace } from "@/server/datasets/store";
import { buttonClass, textLinkClass } from "@/ui/button-class";
import { formatBytes } from "@/ui/datasets/format";
import { DatasetStatusBadge } from "@/ui/datasets/status";
import { formatDateTime } from "@/ui/fits/format";
import { PageHeading, Section } from "@/ui/section";

export const metadata: Metadata = { title: "Spend histories" };

export default async function SpendHistoriesPage() {
  const actor = await requirePageActor("dataset:read");
  const datasets = await listDatasetsByWorkspace(actor.workspaceId, { limit: 200 });
  const people = await getPeopleByIds(datasets.map((d) => d.uploadedBy));
  const canUpload = can(actor, "dataset:upload");

  return (
    <div className="flex flex-col gap-6">
      <div className="flex flex-wrap items-start justify-between gap-4">
        <PageHeading title="Spend histories">
          Weekly (or monthly) spend per channel, controls and the outcome, uploaded as CSV. Fits are built on them.
        </PageHeading>
        {canUpload ? (
          <Link href="/datasets/upload" className={buttonClass("primary")}>
            Upload a spend history
          </Link>
        ) : null}
      </div>
      {datasets.length === 0 ? (
        <Section title="No spend histories yet">
          <p className="text-sm text-slate-700">
            {canUpload ? "Upload the first one: a CSV file with a header row and one row per period." : "Analysts upload spend histories; they appear here."}
          </p>
        </Section>
      ) : (
        <Section title={`${datasets.length} ${datasets.length === 1 ? "spend history" : "spend histories"}`}>
          <div className="overflow-x-auto">
            <table className="w-full min-w-[820px] text-sm" data-testid="dataset-list">
              <thead>
                <tr className="border-b border-slate-300 text-left text-xs uppercase tracking-wide text-slate-600">
                  <th scope="col" className="py-2 pr-3">Spend history</th>
                  <th scope="col" className="py-2 pr-3">File</th>
                  <th scope="col" className="py-2 pr-3 text-right">Rows</th>
                  <th scope="col" className="py-2 pr-3 text-right">Columns</th>
                  <th scope="col" className="py-2 pr-3">Uploaded by</th>
                  <th scope="col" className="py-2">Uploaded</th>
                </tr>
              </thead>
              <tbody>
                {datasets.map((d) => (
                  <tr key={d.id} className="border-b border-slate-100">
                    <td className="py-2 pr-3">
                      <Link href={`/datasets/${d.id}`} className={`font-medium ${textLinkClass}`}>
                        {d.name}
                      </Link>{" "}
                      <DatasetStatusBadge status={d.status} />
                    </td>
                    <td className="py-2 pr-3 text-slate-700">
                      <span className="break-all">{d.originalFilename}</span> <span className="text-slate-600">· {formatBytes(d.byteSize, actor.locale)}</span>
                    </td>
                    <td className="num py-2 pr-3 text-right">{d.rowCount.toLocaleString(actor.locale)}</td>
                    <td className="num py-2 pr-3 text-right">{d.columnCount.toLocaleString(actor.locale)}</td>
                    <td className="py-2 pr-3 text-slate-700">{(d.uploadedBy && people[d.uploadedBy]?.name) || "—"}</td>
                    <td className="py-2 text-slate-600">{formatDateTime(d.uploadedAt, actor.locale)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </Section>
      )}
    </div>
  );
}

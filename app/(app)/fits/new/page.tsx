import type { Metadata } from "next";
import { z } from "zod";
import { requirePageActor } from "@/server/authz";
import { getDatasetById, listDatasetsByWorkspace } from "@/server/datasets/store";
import { getFitById } from "@/server/fits/store";
import { FitBuilder, type BuilderDataset, type BuilderInitial } from "@/ui/fits/fit-builder";
import { durbinWatsonNote } from "@/ui/fits/fit-summary";
import { PageHeading } from "@/ui/section";

export const metadata: Metadata = { title: "Build a fit" };

type Props = { searchParams: Promise<{ from?: string | string[]; covariance?: string | string[] }> };

export default async function NewFitPage({ searchParams }: Props) {
  const actor = await requirePageActor("fit:create");
  const query = await searchParams;
  const summaries = await listDatasetsByWorkspace(actor.workspaceId, { limit: 200 });
  const datasets: BuilderDataset[] = [];
  for (const summary of summaries) {
    const dataset = await getDatasetById({ workspaceId: actor.workspaceId, datasetId: summary.id });
    if (!dataset) continue;
    datasets.push({
      id: dataset.id,
      name: dataset.name,
      status: dataset.status,
      rowCount: dataset.rowCount,
      usableRows: dataset.rowCount - dataset.droppedRowCount,
      columns: dataset.columns.map((column) => ({ name: column.name, role: column.role, unit: column.unit })),
    });
  }

  // "Build a new fit from this one" / "Change and refit": start from an existing fit's request.
  let initial: BuilderInitial | null = null;
  let refitId: string | null = null;
  let autocorrelatedDurbinWatson: number | null = null;
  const from = typeof query.from === "string" && z.uuid().safeParse(query.from).success ? query.from : null;
  if (from) {
    const fit = await getFitById(from);
    if (fit && fit.workspaceId === actor.workspaceId && datasets.some((d) => d.id === fit.datasetId)) {
      initial = { ...fit.input, name: fit.name };
      if (query.covariance === "newey-west" || query.covariance === "hc3") initial = { ...initial, covariance: { type: query.covariance } };
      if (fit.authorId === actor.userId && (fit.status === "draft" || fit.status === "changes_requested")) refitId = fit.id;
      else initial = { ...initial, name: `${fit.name} (revised)`.slice(0, 200) };
      if (durbinWatsonNote(fit.report)?.tone === "warning") autocorrelatedDurbinWatson = fit.report.durbinWatson;
    }
  }

  return (
    <div className="flex flex-col gap-2">
      <PageHeading title={refitId ? "Change and refit" : "Build a fit"}>
        A multiple linear regression of an outcome on spend channels and controls. It is saved as a draft; send it for review from its report.
      </PageHeading>
      <FitBuilder datasets={datasets} initial={initial} refitId={refitId} autocorrelatedDurbinWatson={autocorrelatedDurbinWatson} />
    </div>
  );
}

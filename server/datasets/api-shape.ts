import "server-only";
import type { Note } from "./problems";
import type { DatasetDto, DatasetSummaryDto } from "./store";

/** Links of a spend history: its API resources and its page. */
export const datasetLinks = (id: string) => ({
  self: `/api/datasets/${id}`,
  rows: `/api/datasets/${id}/rows`,
  correlations: `/api/datasets/${id}/correlations`,
  roles: `/api/datasets/${id}/roles`,
  file: `/api/datasets/${id}/file`,
  export: `/api/datasets/${id}/export`,
  page: `/datasets/${id}`,
});

/** A spend history as the API sends it: the summary, every column's role, unit and profile, links. */
export function datasetResponse(dataset: DatasetDto, extra: { notes?: Note[] } = {}) {
  return {
    ...dataset,
    ...(extra.notes ? { notes: extra.notes } : {}),
    links: datasetLinks(dataset.id),
  };
}

export function datasetSummaryResponse(dataset: DatasetSummaryDto) {
  return { ...dataset, links: datasetLinks(dataset.id) };
}

/** A dataset.ingest job as the API sends it: the shape of every job (links.dataset and links.page once stored). */
export { jobResponse as ingestJobResponse } from "@/server/jobs/api-shape";

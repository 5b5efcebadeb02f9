import { datasetResponse, datasetSummaryResponse, ingestJobResponse } from "@/server/datasets/api-shape";
import { reportToErrorBody } from "@/server/datasets/problems";
import { listDatasetsByWorkspace } from "@/server/datasets/store";
import { receiveDatasetUpload } from "@/server/datasets/upload-request";
import { apiRoute, json } from "@/server/http/route";
import { datasetListQuerySchema } from "./schema";

/** The workspace's spend histories, newest upload first (`?limit=&offset=`). */
export const GET = apiRoute({ permission: "dataset:read", query: datasetListQuerySchema }, async ({ actor, query }) => ({
  datasets: (await listDatasetsByWorkspace(actor.workspaceId, query)).map(datasetSummaryResponse),
  limit: query.limit,
  offset: query.offset,
}));

/**
 * Uploads a spend history: the CSV as multipart/form-data (field `file`; optional `name` and `options`
 * before it) or as the raw body (Content-Type text/csv, `?filename=`). Both are streamed. Up to 5 MB:
 * 201 with the stored dataset (id, rowCount, columns with their profile) or 422/413 with every problem
 * (row and column). Larger: 202 with the dataset.ingest job to poll; nothing is stored unless it passes.
 */
export const POST = apiRoute({ permission: "dataset:upload" }, async ({ actor, request }) => {
  const outcome = await receiveDatasetUpload(actor, request);
  switch (outcome.kind) {
    case "created":
      return json(datasetResponse(outcome.dataset, { notes: outcome.report.notes }), 201, { Location: `/api/datasets/${outcome.dataset.id}` });
    case "rejected":
      return json(reportToErrorBody(outcome.report), outcome.status);
    case "queued":
      return json(
        { job: ingestJobResponse(outcome.job), upload: { id: outcome.uploadId, receivedBytes: outcome.receivedBytes } },
        202,
        { Location: `/api/jobs/${outcome.job.id}` },
      );
  }
});

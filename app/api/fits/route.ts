import { apiRoute, json } from "@/server/http/route";
import { fitResponse, fitSummaryResponse, jobResponse } from "@/server/fits/api-shape";
import { createOrRefitFit } from "@/server/fits/create";
import { listFitsByWorkspaceId } from "@/server/fits/store";
import { fitListQuerySchema, fitRequestSchema } from "./schema";

/** The workspace's fits, newest change first; `?status=approved` (repeatable) filters by state. */
export const GET = apiRoute({ permission: "fit:read", query: fitListQuerySchema }, async ({ actor, query }) => ({
  fits: (await listFitsByWorkspaceId({ workspaceId: actor.workspaceId, statuses: query.status })).map(fitSummaryResponse),
}));

/**
 * Builds and fits a model as a draft. Small datasets: 201 with the whole report. Large ones: 202
 * with the job to poll (GET /api/jobs/{id}); its result names the fit when it succeeds.
 */
export const POST = apiRoute({ permission: "fit:create", body: fitRequestSchema }, async ({ actor, body }) => {
  const result = await createOrRefitFit(actor, body);
  if (result.kind === "queued") {
    return json({ job: jobResponse(result.job) }, 202, { Location: `/api/jobs/${result.job.id}` });
  }
  return json(fitResponse(result.fit), 201, { Location: `/api/fits/${result.fit.id}` });
});

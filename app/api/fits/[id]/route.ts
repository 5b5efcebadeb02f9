import { assertInWorkspace } from "@/server/authz";
import { apiRoute, idParams, json } from "@/server/http/route";
import { fitResponse, jobResponse } from "@/server/fits/api-shape";
import { createOrRefitFit } from "@/server/fits/create";
import { getFitById, listFitTrail } from "@/server/fits/store";
import { fitRequestSchema } from "../schema";

/** One fit with its whole report and its review trail. Another workspace's fit is 404. */
export const GET = apiRoute({ permission: "fit:read", params: idParams }, async ({ actor, params }) => {
  const fit = await getFitById(params.id);
  assertInWorkspace(actor, fit, "fit");
  return fitResponse(fit, await listFitTrail({ workspaceId: actor.workspaceId, fitId: fit.id }));
});

/**
 * Refits the author's own draft (or a fit with changes requested) with a new request: 200 with the
 * report, or 202 with a job for large datasets. Approved and retired fits are frozen (409).
 */
export const PUT = apiRoute({ permission: "fit:create", params: idParams, body: fitRequestSchema }, async ({ actor, params, body }) => {
  const result = await createOrRefitFit(actor, body, params.id);
  if (result.kind === "queued") return json({ job: jobResponse(result.job) }, 202, { Location: `/api/jobs/${result.job.id}` });
  return json(fitResponse(result.fit), 200);
});

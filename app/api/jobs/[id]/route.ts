import { AppError } from "@/server/errors";
import { apiRoute, idParams } from "@/server/http/route";
import { jobResponse } from "@/server/jobs/api-shape";
import { getJobRunById } from "@/server/jobs/runs";

/** A background job of this workspace (status, progress, result or error); another workspace's is 404. */
export const GET = apiRoute({ permission: "workspace:read", params: idParams }, async ({ actor, params }) => {
  const job = await getJobRunById({ workspaceId: actor.workspaceId, runId: params.id });
  if (!job) throw new AppError("not_found:job", "No such job in this workspace.");
  return jobResponse(job);
});

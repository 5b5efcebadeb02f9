import { AppError } from "@/server/errors";
import { getCorrelationMatrix } from "@/server/datasets/store";
import { apiRoute, idParams } from "@/server/http/route";

/** Pearson correlations of the candidate predictors (spend and control columns; every numeric column before roles). */
export const GET = apiRoute({ permission: "dataset:read", params: idParams }, async ({ actor, params }) => {
  const matrix = await getCorrelationMatrix({ workspaceId: actor.workspaceId, datasetId: params.id });
  if (!matrix) throw new AppError("not_found:dataset", "No such spend history in this workspace.");
  return matrix;
});

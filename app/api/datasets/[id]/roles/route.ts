import { AppError } from "@/server/errors";
import { datasetResponse } from "@/server/datasets/api-shape";
import { isFrozenByFit, listFitsOfDataset } from "@/server/datasets/details";
import { reportToErrorBody } from "@/server/datasets/problems";
import { assignDatasetRoles, getDatasetById } from "@/server/datasets/store";
import { recordDatasetRolesAssigned } from "@/server/datasets/upload-audit";
import { apiRoute, idParams, json } from "@/server/http/route";
import { assignRolesRequestSchema } from "./schema";

/**
 * Assigns the column roles (outcome, spend, control, period, ignored) and units, and runs the checks
 * that depend on them (numbers, negative spend, missing values under the chosen policy, constant
 * columns, enough rows). 200 with the dataset, now "ready"; 422 with every problem (row and column),
 * nothing changed; 409 when an approved fit uses the dataset (its data is frozen).
 */
export const PUT = apiRoute({ permission: "dataset:upload", params: idParams, body: assignRolesRequestSchema }, async ({ actor, params, body }) => {
  const dataset = await getDatasetById({ workspaceId: actor.workspaceId, datasetId: params.id });
  if (!dataset) throw new AppError("not_found:dataset", "No such spend history in this workspace.");
  if (isFrozenByFit(await listFitsOfDataset({ workspaceId: actor.workspaceId, datasetId: dataset.id }))) {
    throw new AppError("conflict:frozen", "An approved fit uses this spend history, so its roles are frozen; upload it again to use other roles.");
  }
  const result = await assignDatasetRoles({
    workspaceId: actor.workspaceId,
    datasetId: dataset.id,
    userId: actor.userId,
    ...body,
    beforeCommit: (tx, datasetId) => recordDatasetRolesAssigned(tx, { datasetId, actorUserId: actor.userId, roles: body.roles }),
  });
  if (!result) throw new AppError("not_found:dataset", "No such spend history in this workspace.");
  if (!result.ok) {
    // the file itself stays stored: say what was refused
    const body = reportToErrorBody(result.report);
    return json({ ...body, error: body.error.replace(/^The file was not stored: /, "The roles were not saved: ") }, 422);
  }
  return datasetResponse(result.dataset, { notes: result.report.notes });
});

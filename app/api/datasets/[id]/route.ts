import { AppError } from "@/server/errors";
import { datasetResponse } from "@/server/datasets/api-shape";
import { getPeopleByIds, listFitsOfDataset } from "@/server/datasets/details";
import { getDatasetById } from "@/server/datasets/store";
import { apiRoute, idParams } from "@/server/http/route";

/** One spend history: summary, every column's role, unit and profile, who uploaded it, fits built on it. */
export const GET = apiRoute({ permission: "dataset:read", params: idParams }, async ({ actor, params }) => {
  const dataset = await getDatasetById({ workspaceId: actor.workspaceId, datasetId: params.id });
  if (!dataset) throw new AppError("not_found:dataset", "No such spend history in this workspace.");
  const [people, fits] = await Promise.all([
    getPeopleByIds([dataset.uploadedBy, dataset.rolesAssignedBy]),
    listFitsOfDataset({ workspaceId: actor.workspaceId, datasetId: dataset.id }),
  ]);
  return {
    ...datasetResponse(dataset),
    uploadedByName: dataset.uploadedBy ? (people[dataset.uploadedBy]?.name ?? null) : null,
    rolesAssignedByName: dataset.rolesAssignedBy ? (people[dataset.rolesAssignedBy]?.name ?? null) : null,
    fits: fits.map((fit) => ({ ...fit, links: { self: `/api/fits/${fit.id}`, page: `/fits/${fit.id}` } })),
  };
});

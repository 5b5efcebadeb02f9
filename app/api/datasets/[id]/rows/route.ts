import { AppError } from "@/server/errors";
import { getDatasetRowsPage } from "@/server/datasets/store";
import { apiRoute, idParams } from "@/server/http/route";
import { rowsQuerySchema } from "./schema";

/** One page of rows (`?offset=0&limit=100`, at most 1000): each row's cells in column order. */
export const GET = apiRoute({ permission: "dataset:read", params: idParams, query: rowsQuerySchema }, async ({ actor, params, query }) => {
  const page = await getDatasetRowsPage({ workspaceId: actor.workspaceId, datasetId: params.id, offset: query.offset, limit: query.limit });
  if (!page) throw new AppError("not_found:dataset", "No such spend history in this workspace.");
  return page;
});

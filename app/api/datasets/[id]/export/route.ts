import { AppError } from "@/server/errors";
import { attachment } from "@/server/datasets/download";
import { datasetRowsCsv } from "@/server/datasets/export-rows";
import { apiRoute, idParams } from "@/server/http/route";

/** The stored rows as CSV; cells that a spreadsheet would run as formulas (=, +, -, @) are escaped as text. */
export const GET = apiRoute({ permission: "dataset:read", params: idParams }, async ({ actor, params }) => {
  const csv = await datasetRowsCsv({ workspaceId: actor.workspaceId, datasetId: params.id });
  if (!csv) throw new AppError("not_found:dataset", "No such spend history in this workspace.");
  return new Response(csv.body, {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": attachment(csv.filename),
      "Cache-Control": "private, no-store",
      "X-Content-Type-Options": "nosniff",
    },
  });
});

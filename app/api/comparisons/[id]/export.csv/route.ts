import { getComparisonView } from "@/server/comparisons/compute";
import { comparisonCsv } from "@/server/exports/comparison-csv";
import { comparisonTitle } from "@/server/exports/format";
import { apiRoute, idParams } from "@/server/http/route";
import { attachmentName } from "../export.pdf/filename";

/** The comparison as CSV (one row per version; formula-safe cells). */
export const GET = apiRoute({ permission: "comparison:read", params: idParams }, async ({ actor, params }) => {
  const comparison = await getComparisonView(actor, params.id);
  const body = comparisonCsv(comparison, { currency: actor.currency, locale: actor.locale });
  return new Response(body, {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": attachmentName(comparisonTitle(comparison), "csv"),
      "cache-control": "private, no-store",
    },
  });
});

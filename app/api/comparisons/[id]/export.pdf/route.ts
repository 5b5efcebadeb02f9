import { getComparisonView } from "@/server/comparisons/compute";
import { comparisonPdf } from "@/server/exports/comparison-pdf";
import { comparisonTitle } from "@/server/exports/format";
import { apiRoute, idParams } from "@/server/http/route";
import { attachmentName } from "./filename";

/** A one-page PDF of the comparison for finance, generated on the server (pdfkit). */
export const GET = apiRoute({ permission: "comparison:read", params: idParams }, async ({ actor, params }) => {
  const comparison = await getComparisonView(actor, params.id);
  const pdf = await comparisonPdf(comparison, {
    money: { currency: actor.currency, locale: actor.locale },
    workspaceName: actor.workspaceName,
    generatedBy: actor.name ?? actor.email,
  });
  return new Response(new Uint8Array(pdf), {
    headers: {
      "content-type": "application/pdf",
      "content-disposition": attachmentName(comparisonTitle(comparison), "pdf"),
      "cache-control": "private, no-store",
    },
  });
});

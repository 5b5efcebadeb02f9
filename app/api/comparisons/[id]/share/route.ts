import { shareComparison } from "@/server/comparisons/share";
import { apiRoute, idParams, json } from "@/server/http/route";
import { shareRequestSchema } from "./schema";

/**
 * Shares a saved comparison with chosen finance members (planners): each gets an e-mail with the link
 * and a notification. 422 when a recipient is not a finance member, or when a version carries
 * warnings and no acknowledgement is given. 201 with the share.
 */
export const POST = apiRoute({ permission: "scenario:share", params: idParams, body: shareRequestSchema }, async ({ actor, params, body }) =>
  json(await shareComparison(actor, { comparisonId: params.id, ...body }), 201),
);

import { shareScenarioVersion } from "@/server/comparisons/share";
import { apiRoute, json } from "@/server/http/route";
import { shareRequestSchema } from "@/app/api/comparisons/[id]/share/schema";
import { versionParams } from "../comments/schema";

/**
 * Shares this version with chosen finance members (planners): e-mail with the link and a
 * notification each. 422 when the version carries warnings and no acknowledgement is given.
 */
export const POST = apiRoute({ permission: "scenario:share", params: versionParams, body: shareRequestSchema }, async ({ actor, params, body }) =>
  json(await shareScenarioVersion(actor, { scenarioId: params.id, version: params.n, ...body }), 201),
);

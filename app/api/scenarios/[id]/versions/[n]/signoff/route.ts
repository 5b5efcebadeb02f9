import { requireVersion } from "@/server/comparisons/versions";
import { apiRoute, json } from "@/server/http/route";
import { decideSignoff, getVersionSignoffStatus } from "@/server/signoffs/store";
import { versionParams } from "../comments/schema";
import { signoffRequestSchema } from "./schema";

/** The version's sign-off status: its latest decision (null: not signed off) and the decisions before. */
export const GET = apiRoute({ permission: "scenario:read", params: versionParams }, async ({ actor, params }) => {
  await requireVersion(actor, params.id, params.n);
  return getVersionSignoffStatus(params.id, params.n);
});

/**
 * Signs off or declines (with a reason) exactly this version (finance). 201 with the decision;
 * 422 for a decline without a reason; 409 when signing off a version whose fit is no longer approved.
 */
export const POST = apiRoute({ permission: "signoff:decide", params: versionParams, body: signoffRequestSchema }, async ({ actor, params, body }) =>
  json(await decideSignoff(actor, { scenarioId: params.id, version: params.n, decision: body.decision, reason: body.reason }), 201),
);

import { assertInWorkspace } from "@/server/authz";
import { apiRoute, idParams, json } from "@/server/http/route";
import { saveScenarioVersion } from "@/server/scenarios/save-version";
import { getScenarioHead, listVersionSummaries } from "@/server/scenarios/store";
import { saveVersionRequestSchema } from "./schema";

/** The scenario's versions, oldest first. */
export const GET = apiRoute({ permission: "scenario:read", params: idParams }, async ({ actor, params }) => {
  const head = await getScenarioHead(params.id);
  assertInWorkspace(actor, head, "scenario");
  return { versions: await listVersionSummaries(params.id) };
});

/**
 * Saves version baseVersion + 1 (planners). The server validates the plan (422), checks the fit is
 * approved (409) and recomputes the prediction; if a version after baseVersion exists → 409 with who
 * saved it and when. 201 with the version.
 */
export const POST = apiRoute(
  { permission: "scenario:write", params: idParams, body: saveVersionRequestSchema, maxBodyBytes: 64_000 },
  async ({ actor, params, body }) => json(await saveScenarioVersion(actor, params.id, body), 201),
);

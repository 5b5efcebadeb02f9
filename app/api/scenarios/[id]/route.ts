import { assertInWorkspace } from "@/server/authz";
import { apiRoute, idParams } from "@/server/http/route";
import { getScenarioById } from "@/server/scenarios/store";

/** A scenario with its starting plan and version list (planners, finance, reviewers with scenario:read). */
export const GET = apiRoute({ permission: "scenario:read", params: idParams }, async ({ actor, params }) => {
  const scenario = await getScenarioById(params.id);
  assertInWorkspace(actor, scenario, "scenario");
  return scenario;
});

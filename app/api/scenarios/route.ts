import { apiRoute, json } from "@/server/http/route";
import { startScenario } from "@/server/scenarios/create";
import { listScenariosByWorkspace } from "@/server/scenarios/store";
import { listScenariosQuerySchema, startScenarioRequestSchema } from "./schema";

/** The workspace's scenarios, newest first; `?fitId=` keeps those on one fit. */
export const GET = apiRoute({ permission: "scenario:read", query: listScenariosQuerySchema }, async ({ actor, query }) => ({
  scenarios: await listScenariosByWorkspace({ workspaceId: actor.workspaceId, fitId: query.fitId }),
}));

/** Starts a scenario on an approved fit (planners). 201 with the scenario; it has no version until the first save. */
export const POST = apiRoute({ permission: "scenario:write", body: startScenarioRequestSchema }, async ({ actor, body }) =>
  json(await startScenario(actor, body), 201),
);

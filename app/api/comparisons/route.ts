import { apiRoute, json } from "@/server/http/route";
import { getComparisonView } from "@/server/comparisons/compute";
import { createComparison, listComparisonsByWorkspace } from "@/server/comparisons/store";
import { createComparisonRequestSchema } from "./schema";

/** The workspace's saved comparisons, newest first, with their versions' sign-off decisions. */
export const GET = apiRoute({ permission: "comparison:read" }, async ({ actor }) => ({
  comparisons: await listComparisonsByWorkspace(actor.workspaceId),
}));

/**
 * Saves a named comparison of 2–4 versions (planners and finance). 201 with the computed view;
 * 422 for too few/many or repeated versions, 404 for a scenario of another workspace.
 */
export const POST = apiRoute({ permission: "comparison:write", body: createComparisonRequestSchema }, async ({ actor, body }) => {
  const id = await createComparison(actor, body);
  return json(await getComparisonView(actor, id), 201);
});

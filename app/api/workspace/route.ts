import { apiRoute } from "@/server/http/route";
import { getWorkspaceById, updateWorkspaceSettings } from "@/server/data/workspaces";
import { updateWorkspaceRequestSchema } from "./schema";

/** The workspace the caller acts in. */
export const GET = apiRoute({ permission: "workspace:read" }, async ({ actor }) => ({
  workspace: await getWorkspaceById(actor.workspaceId),
}));

/** Renames the workspace or changes its currency / locale (admins). */
export const PATCH = apiRoute({ permission: "workspace:admin", body: updateWorkspaceRequestSchema }, async ({ actor, body }) => ({
  workspace: await updateWorkspaceSettings({ workspaceId: actor.workspaceId, actorUserId: actor.userId, ...body }),
}));

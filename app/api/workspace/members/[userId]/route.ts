import { apiRoute, noContent } from "@/server/http/route";
import { changeMemberRoles, removeMember } from "@/server/data/members";
import { changeRolesRequestSchema, memberParams } from "../schema";

/** Replaces a member's roles; the last admin keeps "admin" (409). */
export const PATCH = apiRoute(
  { permission: "workspace:admin", params: memberParams, body: changeRolesRequestSchema },
  async ({ actor, params, body }) => ({
    member: await changeMemberRoles({ workspaceId: actor.workspaceId, userId: params.userId, roles: body.roles, actorUserId: actor.userId }),
  }),
);

/** Removes a member from the workspace; the last admin cannot be removed (409). */
export const DELETE = apiRoute({ permission: "workspace:admin", params: memberParams }, async ({ actor, params }) => {
  await removeMember({ workspaceId: actor.workspaceId, userId: params.userId, actorUserId: actor.userId });
  return noContent();
});

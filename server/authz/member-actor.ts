// An Actor from a membership row, free of the request layer: the session path builds its actor here, and
// so does the seed, which acts as a demo member (through the same domain functions a request would use).
import { listMembershipsByUserId, type UserMembershipDto } from "@/server/data/members";
import type { Actor } from "./actor";
import { permissionsOf } from "./roles";

export function actorFromMembership(userId: string, membership: UserMembershipDto, via: "session" | "script"): Actor {
  return {
    userId,
    email: membership.userEmail,
    name: membership.userName,
    workspaceId: membership.workspaceId,
    workspaceSlug: membership.workspaceSlug,
    workspaceName: membership.workspaceName,
    currency: membership.currency,
    locale: membership.locale,
    roles: membership.roles,
    permissions: permissionsOf(membership.roles),
    via,
  };
}

/** A member acting from a script (the seed): their roles in that workspace, as a request would see them. */
export async function actorForScript(userId: string, workspaceSlug: string): Promise<Actor> {
  const membership = (await listMembershipsByUserId(userId)).find((m) => m.workspaceSlug === workspaceSlug);
  if (!membership) throw new Error(`user ${userId} is not a member of ${workspaceSlug}`);
  return actorFromMembership(userId, membership, "script");
}

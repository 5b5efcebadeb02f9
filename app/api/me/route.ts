import { apiRoute } from "@/server/http/route";

/** Who am I: the caller, the workspace the call acts in, and the roles held there. */
export const GET = apiRoute({}, ({ actor }) => ({
  user: { id: actor.userId, email: actor.email, name: actor.name },
  workspace: { id: actor.workspaceId, slug: actor.workspaceSlug, name: actor.workspaceName, currency: actor.currency, locale: actor.locale },
  roles: actor.roles,
  permissions: [...actor.permissions].sort(),
  via: actor.via,
}));

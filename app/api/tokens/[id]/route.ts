import { apiRoute, idParams } from "@/server/http/route";
import { revokeApiToken } from "@/server/data/api-tokens";

/** Revokes one of the caller's tokens (someone else's or another workspace's: 404). */
export const DELETE = apiRoute({ permission: "token:manage", params: idParams }, async ({ actor, params }) => ({
  apiToken: await revokeApiToken({ workspaceId: actor.workspaceId, userId: actor.userId, tokenId: params.id }),
}));

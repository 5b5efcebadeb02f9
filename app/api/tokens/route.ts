import { apiRoute, json } from "@/server/http/route";
import { createApiToken, listApiTokensByUser } from "@/server/data/api-tokens";
import { createTokenRequestSchema } from "./schema";

/** The caller's own API tokens in this workspace (never the secret). */
export const GET = apiRoute({ permission: "token:manage" }, async ({ actor }) => ({
  tokens: await listApiTokensByUser({ workspaceId: actor.workspaceId, userId: actor.userId }),
}));

/** Creates a token acting for the caller in this workspace; `token` is in this response only. */
export const POST = apiRoute({ permission: "token:manage", body: createTokenRequestSchema }, async ({ actor, body }) => {
  const { token, apiToken } = await createApiToken({
    workspaceId: actor.workspaceId,
    userId: actor.userId,
    name: body.name,
    expiresAt: body.expiresAt,
  });
  return json({ token, apiToken }, 201);
});

import { createHash } from "node:crypto";
import { and, eq, sql } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { apiTokens, memberships } from "@/db/schema";
import { requireActor } from "@/server/authz/actor";
import { invalidateActorCache } from "@/server/authz/actor-cache";
import { createApiToken, generateApiToken, hashApiToken, listApiTokensByUser, revokeApiToken } from "@/server/data/api-tokens";
import { changeMemberRoles, removeMember } from "@/server/data/members";
import { AppError } from "@/server/errors";
import { apiRequest, db, makeWorkspace } from "./helpers";

const bearer = (token: string) => apiRequest("/api/me", { token });

async function expectUnauthenticated(promise: Promise<unknown>) {
  const error = await promise.then(() => null, (e: unknown) => e);
  expect(error).toBeInstanceOf(AppError);
  expect((error as AppError).status).toBe(401);
}

describe("API tokens", () => {
  it("are trib_ plus 32 random bytes in base64url, stored only as their sha256", async () => {
    const generated = generateApiToken();
    expect(generated.token).toMatch(/^trib_[A-Za-z0-9_-]{43}$/);
    expect(Buffer.from(generated.token.slice(5), "base64url")).toHaveLength(32);
    expect(generated.tokenHash).toBe(createHash("sha256").update(generated.token).digest("hex"));
    expect(generated.prefix).toBe(generated.token.slice(0, 9));

    const { workspace, members } = await makeWorkspace({ ana: ["analyst"] });
    const { token, apiToken } = await createApiToken({ workspaceId: workspace.id, userId: members.ana.id, name: "script", expiresAt: null });
    const [row] = await db().select().from(apiTokens).where(eq(apiTokens.id, apiToken.id));
    expect(row.tokenHash).toBe(hashApiToken(token));
    expect(JSON.stringify(row)).not.toContain(token);
    expect(JSON.stringify(await listApiTokensByUser({ workspaceId: workspace.id, userId: members.ana.id }))).not.toContain(row.tokenHash);
  });

  it("let requireActor act for the member, in the token's workspace, with the member's roles", async () => {
    const { workspace, members } = await makeWorkspace({ pat: ["planner", "finance"] });
    const { token, apiToken } = await createApiToken({ workspaceId: workspace.id, userId: members.pat.id, name: "report", expiresAt: null });
    const actor = await requireActor(bearer(token));
    expect(actor).toMatchObject({
      userId: members.pat.id,
      email: members.pat.email,
      workspaceId: workspace.id,
      workspaceSlug: workspace.slug,
      currency: "EUR",
      roles: ["planner", "finance"],
      via: "token",
      tokenId: apiToken.id,
    });
    expect(actor.permissions.has("signoff:decide")).toBe(true);
    expect(actor.permissions.has("fit:create")).toBe(false);
  });

  it("record their last use, at most once a minute", async () => {
    const { workspace, members } = await makeWorkspace({ ana: ["analyst"] });
    const { token, apiToken } = await createApiToken({ workspaceId: workspace.id, userId: members.ana.id, name: "ci", expiresAt: null });
    await requireActor(bearer(token));
    const lastUsed = async () => (await db().select({ at: apiTokens.lastUsedAt }).from(apiTokens).where(eq(apiTokens.id, apiToken.id)))[0].at;
    await expect.poll(lastUsed).not.toBeNull();
    const first = await lastUsed();
    invalidateActorCache();
    await requireActor(bearer(token));
    await new Promise((resolve) => setTimeout(resolve, 100));
    expect(await lastUsed()).toEqual(first);
  });

  it("stop working once expired", async () => {
    const { workspace, members } = await makeWorkspace({ ana: ["analyst"] });
    const { token, apiToken } = await createApiToken({
      workspaceId: workspace.id,
      userId: members.ana.id,
      name: "short-lived",
      expiresAt: new Date(Date.now() + 60_000),
    });
    await requireActor(bearer(token));
    await db().update(apiTokens).set({ expiresAt: sql`now() - interval '1 second'` }).where(eq(apiTokens.id, apiToken.id));
    invalidateActorCache();
    await expectUnauthenticated(requireActor(bearer(token)));
  });

  it("refuse an expiry in the past at creation", async () => {
    const { workspace, members } = await makeWorkspace({ ana: ["analyst"] });
    await expect(
      createApiToken({ workspaceId: workspace.id, userId: members.ana.id, name: "x", expiresAt: new Date(Date.now() - 1000) }),
    ).rejects.toMatchObject({ status: 422 });
  });

  it("stop working at once when revoked, and only their owner can revoke them", async () => {
    const { workspace, members } = await makeWorkspace({ ana: ["analyst"], bo: ["admin"] });
    const { token, apiToken } = await createApiToken({ workspaceId: workspace.id, userId: members.ana.id, name: "laptop", expiresAt: null });
    await requireActor(bearer(token)); // now cached
    await expect(revokeApiToken({ workspaceId: workspace.id, userId: members.bo.id, tokenId: apiToken.id })).rejects.toMatchObject({ status: 404 });
    const revoked = await revokeApiToken({ workspaceId: workspace.id, userId: members.ana.id, tokenId: apiToken.id });
    expect(revoked.revokedAt).toBeInstanceOf(Date);
    await expectUnauthenticated(requireActor(bearer(token)));
  });

  it("follow role changes at once and die with the membership", async () => {
    const { workspace, members } = await makeWorkspace({ ana: ["analyst"], bo: ["admin"] });
    const { token } = await createApiToken({ workspaceId: workspace.id, userId: members.ana.id, name: "x", expiresAt: null });
    expect((await requireActor(bearer(token))).roles).toEqual(["analyst"]);
    await changeMemberRoles({ workspaceId: workspace.id, userId: members.ana.id, roles: ["reviewer"], actorUserId: members.bo.id });
    expect((await requireActor(bearer(token))).roles).toEqual(["reviewer"]);
    await removeMember({ workspaceId: workspace.id, userId: members.ana.id, actorUserId: members.bo.id });
    await expectUnauthenticated(requireActor(bearer(token)));
    const left = await db()
      .select()
      .from(memberships)
      .where(and(eq(memberships.workspaceId, workspace.id), eq(memberships.userId, members.ana.id)));
    expect(left).toEqual([]);
  });

  it("refuse unknown, malformed and non-bearer credentials without falling back to a session", async () => {
    await expectUnauthenticated(requireActor(bearer(generateApiToken().token)));
    await expectUnauthenticated(requireActor(bearer("trib_short")));
    await expectUnauthenticated(requireActor(apiRequest("/api/me", { headers: { authorization: "Basic dXNlcjpwYXNz" } })));
  });
});

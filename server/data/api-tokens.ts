import "server-only";
import { createHash, randomBytes } from "node:crypto";
import { and, desc, eq, isNull, sql } from "drizzle-orm";
import { db } from "@/db/client";
import { apiTokens, memberships, users, workspaces, type Role } from "@/db/schema";
import { AppError } from "@/server/errors";
import { recordAudit } from "@/server/data/audit";
import { invalidateActorCache } from "@/server/authz/actor-cache";

export const API_TOKEN_PREFIX = "trib_";
/** How much of the token is kept for display ("trib_" and four more characters). */
const DISPLAY_PREFIX_LENGTH = API_TOKEN_PREFIX.length + 4;

export type ApiTokenDto = {
  id: string;
  name: string;
  prefix: string;
  createdAt: Date;
  expiresAt: Date | null;
  lastUsedAt: Date | null;
  revokedAt: Date | null;
};

const tokenColumns = {
  id: apiTokens.id,
  name: apiTokens.name,
  prefix: apiTokens.prefix,
  createdAt: apiTokens.createdAt,
  expiresAt: apiTokens.expiresAt,
  lastUsedAt: apiTokens.lastUsedAt,
  revokedAt: apiTokens.revokedAt,
};

/** sha256 (hex) of the whole token: tokens are random, so a slow hash adds nothing. */
export const hashApiToken = (token: string) => createHash("sha256").update(token, "utf8").digest("hex");

/** "trib_" + 32 random bytes in base64url (43 characters). */
export function generateApiToken(): { token: string; tokenHash: string; prefix: string } {
  const token = API_TOKEN_PREFIX + randomBytes(32).toString("base64url");
  return { token, tokenHash: hashApiToken(token), prefix: token.slice(0, DISPLAY_PREFIX_LENGTH) };
}

export const looksLikeApiToken = (value: string) => /^trib_[A-Za-z0-9_-]{43}$/.test(value);

/** Creates a token for the caller's membership; the plain token is returned here and never again. */
export async function createApiToken(input: {
  workspaceId: string;
  userId: string;
  name: string;
  expiresAt: Date | null;
}): Promise<{ token: string; apiToken: ApiTokenDto }> {
  if (input.expiresAt && input.expiresAt.getTime() <= Date.now()) {
    throw new AppError("invalid:expiresAt", "The expiry must be in the future.", {
      details: [{ path: "expiresAt", message: "Choose a date in the future, or no expiry." }],
    });
  }
  const { token, tokenHash, prefix } = generateApiToken();
  const apiToken = await db.transaction(async (tx) => {
    const [row] = await tx
      .insert(apiTokens)
      .values({ workspaceId: input.workspaceId, userId: input.userId, name: input.name, tokenHash, prefix, expiresAt: input.expiresAt })
      .returning(tokenColumns);
    await recordAudit(
      {
        workspaceId: input.workspaceId,
        actorUserId: input.userId,
        action: "api_token.created",
        objectType: "api_token",
        objectId: row.id,
        details: { name: row.name, prefix: row.prefix, expiresAt: row.expiresAt?.toISOString() ?? null },
      },
      tx,
    );
    return row;
  });
  return { token, apiToken };
}

/** The caller's own tokens in this workspace, newest first, revoked ones included (marked). */
export async function listApiTokensByUser(input: { workspaceId: string; userId: string }): Promise<ApiTokenDto[]> {
  return db
    .select(tokenColumns)
    .from(apiTokens)
    .where(and(eq(apiTokens.workspaceId, input.workspaceId), eq(apiTokens.userId, input.userId)))
    .orderBy(desc(apiTokens.createdAt));
}

/** Revokes one of the caller's own tokens; someone else's, or another workspace's, is "not found". */
export async function revokeApiToken(input: { workspaceId: string; userId: string; tokenId: string }): Promise<ApiTokenDto> {
  const revoked = await db.transaction(async (tx) => {
    const [row] = await tx
      .update(apiTokens)
      .set({ revokedAt: sql`coalesce(${apiTokens.revokedAt}, now())` })
      .where(and(eq(apiTokens.id, input.tokenId), eq(apiTokens.workspaceId, input.workspaceId), eq(apiTokens.userId, input.userId)))
      .returning(tokenColumns);
    if (!row) throw new AppError("not_found:api_token", "No such API token.");
    await recordAudit(
      {
        workspaceId: input.workspaceId,
        actorUserId: input.userId,
        action: "api_token.revoked",
        objectType: "api_token",
        objectId: row.id,
        details: { name: row.name, prefix: row.prefix },
      },
      tx,
    );
    return row;
  });
  invalidateActorCache();
  return revoked;
}

/** What the authorization helper needs to act for a token; null when unknown or revoked. */
export type ApiTokenIdentity = {
  tokenId: string;
  expiresAt: Date | null;
  lastUsedAt: Date | null;
  userId: string;
  email: string;
  name: string | null;
  workspaceId: string;
  workspaceSlug: string;
  workspaceName: string;
  currency: string;
  locale: string;
  roles: Role[];
};

export async function findApiTokenIdentityByHash(tokenHash: string): Promise<ApiTokenIdentity | null> {
  const [row] = await db
    .select({
      tokenId: apiTokens.id,
      expiresAt: apiTokens.expiresAt,
      lastUsedAt: apiTokens.lastUsedAt,
      userId: users.id,
      email: users.email,
      name: users.name,
      workspaceId: workspaces.id,
      workspaceSlug: workspaces.slug,
      workspaceName: workspaces.name,
      currency: workspaces.currency,
      locale: workspaces.locale,
      roles: memberships.roles,
    })
    .from(apiTokens)
    .innerJoin(memberships, and(eq(memberships.workspaceId, apiTokens.workspaceId), eq(memberships.userId, apiTokens.userId)))
    .innerJoin(users, eq(users.id, apiTokens.userId))
    .innerJoin(workspaces, eq(workspaces.id, apiTokens.workspaceId))
    .where(and(eq(apiTokens.tokenHash, tokenHash), isNull(apiTokens.revokedAt)));
  return row ?? null;
}

/** Records use, at most once a minute per token (the condition keeps concurrent calls from all writing). */
export async function touchApiToken(tokenId: string): Promise<void> {
  await db
    .update(apiTokens)
    .set({ lastUsedAt: sql`now()` })
    .where(
      and(
        eq(apiTokens.id, tokenId),
        sql`(${apiTokens.lastUsedAt} is null or ${apiTokens.lastUsedAt} < now() - interval '1 minute')`,
      ),
    );
}

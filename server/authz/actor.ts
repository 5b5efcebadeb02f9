import "server-only";
import { cookies, headers } from "next/headers";
import type { Role } from "@/db/schema";
import type { Session } from "next-auth";
import { auth } from "@/server/auth";
import { AppError } from "@/server/errors";
import { cached } from "@/server/authz/actor-cache";
import { permissionsByRole, permissionsOf, roleLabels, type Permission } from "@/server/authz/roles";
import { findApiTokenIdentityByHash, hashApiToken, looksLikeApiToken, touchApiToken } from "@/server/data/api-tokens";
import { listMembershipsByUserId } from "@/server/data/members";
import { actorFromMembership } from "./member-actor";
import { getUserById } from "@/server/data/users";

/** The cookie naming the current workspace (its slug) for signed-in browsers. */
export const WORKSPACE_COOKIE = "tributary-workspace";

/**
 * Whether the request reached the app over TLS, decided as Auth.js decides it for its own cookies: the
 * protocol of AUTH_URL (or NEXTAUTH_URL) when set, else X-Forwarded-Proto (set by a TLS proxy in front,
 * and by Next itself to the protocol it was reached with).
 */
export function requestIsHttps(requestHeaders: Headers, env: Record<string, string | undefined> = process.env): boolean {
  const envUrl = env.AUTH_URL ?? env.NEXTAUTH_URL;
  if (envUrl) return new URL(envUrl).protocol === "https:";
  const forwarded = requestHeaders.get("x-forwarded-proto");
  // Auth.js assumes https when nothing says otherwise (Next always sets the header).
  return (forwarded?.split(",")[0].trim().replace(/:$/, "") ?? "https") === "https";
}

/** Remembers the member's current workspace: HttpOnly, SameSite=Lax, path /, and Secure behind TLS. */
export async function setWorkspaceCookie(slug: string): Promise<void> {
  const secure = requestIsHttps(await headers());
  (await cookies()).set(WORKSPACE_COOKIE, slug, { httpOnly: true, secure, sameSite: "lax", path: "/", maxAge: 365 * 24 * 60 * 60 });
}

/** Who is acting, in which workspace, with which roles. Every entry point gets one from requireActor. */
export { assertInWorkspace } from "./scope";

export type Actor = {
  userId: string;
  email: string;
  name: string | null;
  workspaceId: string;
  workspaceSlug: string;
  workspaceName: string;
  currency: string;
  locale: string;
  roles: Role[];
  permissions: ReadonlySet<Permission>;
  /** "script": the seed acting as a demo member, never a request. */
  via: "session" | "token" | "script";
  /** The API token's id when via is "token". */
  tokenId?: string;
};

type WorkspaceSummary = { workspaceId: string; workspaceSlug: string; workspaceName: string; roles: Role[] };

const TOUCH_EVERY_MS = 60_000;

function bearerToken(authorization: string | null): string | null | undefined {
  if (!authorization) return undefined; // no header: fall back to the session
  const match = /^Bearer\s+(\S+)\s*$/i.exec(authorization);
  return match ? match[1] : null; // a header that is not a bearer token is refused, never ignored
}

async function actorFromToken(token: string | null): Promise<Actor> {
  // Built only when refusing: an Error captures a stack trace, too costly for every accepted call.
  const refused = () => new AppError("unauthenticated:token", "The API token is not valid: it is unknown, revoked or expired.");
  if (!token || !looksLikeApiToken(token)) throw refused();
  const tokenHash = hashApiToken(token);
  const identity = await cached(`token:${tokenHash}`, () => findApiTokenIdentityByHash(tokenHash));
  if (!identity) throw refused();
  if (identity.expiresAt && identity.expiresAt.getTime() <= Date.now()) throw refused();
  if (!identity.lastUsedAt || Date.now() - identity.lastUsedAt.getTime() > TOUCH_EVERY_MS) {
    identity.lastUsedAt = new Date(); // the cached copy, so this process writes at most once a minute
    touchApiToken(identity.tokenId).catch((error: unknown) => {
      console.error(`[authz] could not record API token use: ${error instanceof Error ? error.name : "error"}`);
    });
  }
  return {
    userId: identity.userId,
    email: identity.email,
    name: identity.name,
    workspaceId: identity.workspaceId,
    workspaceSlug: identity.workspaceSlug,
    workspaceName: identity.workspaceName,
    currency: identity.currency,
    locale: identity.locale,
    roles: identity.roles,
    permissions: permissionsOf(identity.roles),
    via: "token",
    tokenId: identity.tokenId,
  };
}

/** A request as authentication needs it: its headers (route handlers of either router pass them). */
export type RequestHeadersLike = { headers: Headers };

/** Reads the Auth.js session; the default (`auth()`) works in pages, server actions and App Router handlers. */
export type SessionReader = () => Promise<Session | null>;

async function currentWorkspaceSlug(request?: RequestHeadersLike): Promise<string | undefined> {
  if (request) {
    const cookie = request.headers.get("cookie") ?? "";
    const match = new RegExp(`(?:^|;\\s*)${WORKSPACE_COOKIE}=([^;]+)`).exec(cookie);
    return match ? decodeURIComponent(match[1]) : undefined;
  }
  return (await cookies()).get(WORKSPACE_COOKIE)?.value;
}

async function actorFromSession(request?: RequestHeadersLike, readSession: SessionReader = () => auth()): Promise<Actor> {
  const session = await readSession();
  const userId = session?.user?.id;
  if (!userId) throw new AppError("unauthenticated");
  // Memberships are re-read (through a cache of a few seconds, cleared on every change) so that a
  // role change or a removal takes effect on the member's next request, whatever their JWT says.
  const memberships = await cached(`user:${userId}`, () => listMembershipsByUserId(userId));
  if (memberships.length === 0) {
    const user = await getUserById(userId);
    if (!user) throw new AppError("unauthenticated", "Your account no longer exists; sign in again.");
    throw new AppError("forbidden:no_workspace", "You are not a member of any workspace; ask an admin for an invitation.");
  }
  const slug = await currentWorkspaceSlug(request);
  const membership = memberships.find((m) => m.workspaceSlug === slug) ?? memberships[0];
  return actorFromMembership(userId, membership, "session");
}

/**
 * The one authorization entry point: who is calling, in which workspace, with which roles.
 *
 * `Authorization: Bearer trib_…` is used when present (a bad token is 401, never a fall-back to the
 * cookie); otherwise the Auth.js session and the workspace named by the `tributary-workspace`
 * cookie (or the member's first workspace). Pass the request in route handlers; pages and server
 * actions call it without arguments.
 *
 * @throws AppError "unauthenticated" (401) when neither identifies a user,
 *         "forbidden:no_workspace" (403) when the user belongs to no workspace.
 */
export async function requireActor(request?: RequestHeadersLike, readSession?: SessionReader): Promise<Actor> {
  const authorization = request ? request.headers.get("authorization") : (await headers()).get("authorization");
  const token = bearerToken(authorization);
  if (token !== undefined) return actorFromToken(token);
  return actorFromSession(request, readSession);
}

/** requireActor, or null when nobody is signed in (other failures still throw). */
export async function getOptionalActor(request?: RequestHeadersLike): Promise<Actor | null> {
  try {
    return await requireActor(request);
  } catch (error) {
    if (error instanceof AppError && error.type === "unauthenticated") return null;
    throw error;
  }
}

export const can = (actor: Pick<Actor, "permissions">, permission: Permission) => actor.permissions.has(permission);

const rolesGranting = (permission: Permission) =>
  (Object.keys(permissionsByRole) as Role[]).filter((role) => permissionsByRole[role].includes(permission));

/** @throws AppError "forbidden" (403) naming the roles that would allow it. */
export function requirePermission(actor: Actor, permission: Permission): void {
  if (can(actor, permission)) return;
  const needed = rolesGranting(permission).map((role) => roleLabels[role].toLowerCase());
  const held = actor.roles.map((role) => roleLabels[role].toLowerCase()).join(", ");
  throw new AppError(
    "forbidden",
    `This needs the ${needed.join(" or ")} role${needed.length > 1 ? "s" : ""}; your roles in ${actor.workspaceName} are: ${held}.`,
  );
}

/** The workspaces a signed-in user may switch between (for the app shell). */
export async function listActorWorkspaces(actor: Actor): Promise<WorkspaceSummary[]> {
  if (actor.via === "token") return [{ workspaceId: actor.workspaceId, workspaceSlug: actor.workspaceSlug, workspaceName: actor.workspaceName, roles: actor.roles }];
  const memberships = await cached(`user:${actor.userId}`, () => listMembershipsByUserId(actor.userId));
  return memberships.map(({ workspaceId, workspaceSlug, workspaceName, roles }) => ({ workspaceId, workspaceSlug, workspaceName, roles }));
}

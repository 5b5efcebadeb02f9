// Fixtures for the auth integration tests: each test makes its own workspace and people (random
// names), so tests never depend on each other or on the demo seed.
import { randomBytes } from "node:crypto";
import { getDatabase } from "@/db/client";
import { memberships, users, workspaces, type Role } from "@/db/schema";
import { hashPassword } from "@/server/auth/password";
import { invalidateActorCache } from "@/server/authz/actor-cache";

export const db = () => getDatabase().db;
export const uniq = (label: string) => `${label}-${randomBytes(4).toString("hex")}`;

export type TestPerson = { id: string; email: string; roles: Role[] };

let cheapHash: Promise<string> | undefined;

/** A workspace with one member per entry of `people` (name → roles); all share one password. */
export async function makeWorkspace(people: Record<string, Role[]>, password = "correct horse battery") {
  const slug = uniq("ws");
  const [workspace] = await db().insert(workspaces).values({ name: `Test ${slug}`, slug, currency: "EUR", locale: "en-IE" }).returning();
  cheapHash ??= hashPassword(password);
  const passwordHash = await cheapHash;
  const members: Record<string, TestPerson> = {};
  for (const [name, roles] of Object.entries(people)) {
    const email = `${uniq(name)}@test.example`;
    const [user] = await db().insert(users).values({ email, name, passwordHash }).returning({ id: users.id });
    await db().insert(memberships).values({ workspaceId: workspace.id, userId: user.id, roles });
    members[name] = { id: user.id, email, roles };
  }
  invalidateActorCache();
  return { workspace, members, password };
}

/** A Request as a route handler receives it. */
export function apiRequest(path: string, init: RequestInit & { token?: string; json?: unknown } = {}): Request {
  const headers = new Headers(init.headers);
  if (init.token) headers.set("authorization", `Bearer ${init.token}`);
  let body = init.body;
  if (init.json !== undefined) {
    headers.set("content-type", "application/json");
    body = JSON.stringify(init.json);
  }
  return new Request(`http://localhost:3100${path}`, { ...init, headers, body });
}

export const routeContext = (params: Record<string, string> = {}) => ({ params: Promise.resolve(params) });

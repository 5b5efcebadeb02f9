// Fixtures for the scenario tests: a fresh workspace with one member per role and an API token each,
// so tests never depend on each other or on the demo seed.
import { randomBytes } from "node:crypto";
import { getDatabase } from "@/db/client";
import { memberships, users, workspaces, type Role } from "@/db/schema";
import { invalidateActorCache } from "@/server/authz/actor-cache";
import { createApiToken } from "@/server/data/api-tokens";
import { createApprovedDemoFit } from "./approved-fit";

export const uniq = (label: string) => `${label}-${randomBytes(4).toString("hex")}`;

export type Member = { id: string; email: string; name: string; token: string };

/** A workspace with the given people (name → roles), each with an API token, and an approved demo fit. */
export async function makePlanningWorkspace(people: Record<string, Role[]> = {}, options: { currency?: string } = {}) {
  const { db, sql } = getDatabase();
  const slug = uniq("plan");
  const [workspace] = await db
    .insert(workspaces)
    .values({ name: `Test ${slug}`, slug, currency: options.currency ?? "EUR", locale: "en-IE" })
    .returning();
  const everyone: Record<string, Role[]> = { analyst: ["analyst"], reviewer: ["reviewer"], planner: ["planner"], finance: ["finance"], ...people };
  const members: Record<string, Member> = {};
  for (const [name, roles] of Object.entries(everyone)) {
    const email = `${uniq(name)}@test.example`;
    const displayName = name.charAt(0).toUpperCase() + name.slice(1);
    const [user] = await db.insert(users).values({ email, name: displayName }).returning({ id: users.id });
    await db.insert(memberships).values({ workspaceId: workspace.id, userId: user.id, roles });
    const { token } = await createApiToken({ workspaceId: workspace.id, userId: user.id, name: "scenario tests", expiresAt: null });
    members[name] = { id: user.id, email, name: displayName, token };
  }
  invalidateActorCache();
  const fit = await createApprovedDemoFit(sql, { workspaceId: workspace.id, authorId: members.analyst.id, approverId: members.reviewer.id });
  return { workspace, members, fit };
}

/** A Request as a route handler receives it (token-authenticated). */
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

// Signing in for browser and API tests: as a seeded demo user through the sign-in page, or with an
// API token written straight into the database (seed/demo-accounts.ts lists the people).
import { createHash, randomBytes } from "node:crypto";
import postgres from "postgres";
import type { Page } from "playwright-core";
import type { Role } from "@/db/schema/workspaces";
import { demoAccountFor, demoAccounts, type DemoAccount } from "@/seed/demo-accounts";
import { e2e, url } from "./env";

export { demoAccounts, demoAccountFor };

/** Signs in through /login and waits for the signed-in home page (or `expectPath`). */
export async function signInAs(page: Page, who: Role | Pick<DemoAccount, "email" | "password">, expectPath = "/"): Promise<void> {
  const account = typeof who === "string" ? demoAccountFor(who) : who;
  await page.goto("/login");
  await page.getByLabel("E-mail").fill(account.email);
  await page.getByLabel("Password").fill(account.password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL((u) => u.pathname === expectPath, { timeout: 15_000 });
}

export async function signOut(page: Page): Promise<void> {
  await page.getByRole("button", { name: "Sign out" }).click();
  await page.waitForURL((u) => u.pathname === "/login", { timeout: 15_000 });
}

/** A short-lived database connection for fixtures; close it with `sql.end()`. */
export const testDatabase = () => postgres(e2e.databaseUrl, { max: 2, onnotice: () => {} });

/**
 * Creates an API token for `email`'s membership in `workspaceSlug` (directly in the database, as the
 * tokens page would) and returns the secret. Use it as `Authorization: Bearer <token>`.
 */
export async function createTokenFor(sql: postgres.Sql, email: string, workspaceSlug = "larkspur", name = "e2e"): Promise<{ token: string; id: string }> {
  const token = `trib_${randomBytes(32).toString("base64url")}`;
  const [row] = await sql<{ id: string }[]>`
    insert into api_tokens (workspace_id, user_id, name, token_hash, prefix)
    select m.workspace_id, m.user_id, ${name}, ${createHash("sha256").update(token).digest("hex")}, ${token.slice(0, 9)}
    from memberships m join "user" u on u.id = m.user_id join workspaces w on w.id = m.workspace_id
    where u.email = ${email} and w.slug = ${workspaceSlug}
    returning id`;
  if (!row) throw new Error(`${email} is not a member of ${workspaceSlug}`);
  return { token, id: row.id };
}

/** fetch against the app with an optional Bearer token and JSON body; never follows redirects. */
export function api(path: string, init: { method?: string; token?: string; json?: unknown; headers?: Record<string, string> } = {}) {
  const headers: Record<string, string> = { ...init.headers };
  if (init.token) headers.authorization = `Bearer ${init.token}`;
  if (init.json !== undefined) headers["content-type"] = "application/json";
  return fetch(url(path), {
    method: init.method ?? "GET",
    headers,
    body: init.json === undefined ? undefined : JSON.stringify(init.json),
    redirect: "manual",
  });
}

// Talking to a running Tributary from a benchmark: API tokens written straight into the database (as the
// tokens page would), a session cookie through Auth.js's own credentials endpoint, a started scenario.
import { createHash, randomBytes } from "node:crypto";
import postgres from "postgres";

export type Sql = postgres.Sql;

export const database = (url: string) => postgres(url, { max: 2, onnotice: () => {} });

/** A new API token of `email`'s membership in `workspaceSlug`; revoke it with `revokeTokens(sql, name)`. */
export async function createToken(sql: Sql, email: string, name: string, workspaceSlug = "larkspur"): Promise<string> {
  const token = `trib_${randomBytes(32).toString("base64url")}`;
  const [row] = await sql<{ id: string }[]>`
    insert into api_tokens (workspace_id, user_id, name, token_hash, prefix)
    select m.workspace_id, m.user_id, ${name}, ${createHash("sha256").update(token).digest("hex")}, ${token.slice(0, 9)}
    from memberships m join "user" u on u.id = m.user_id join workspaces w on w.id = m.workspace_id
    where u.email = ${email} and w.slug = ${workspaceSlug}
    returning id`;
  if (!row) throw new Error(`${email} is not a member of ${workspaceSlug}`);
  return token;
}

export async function revokeTokens(sql: Sql, name: string): Promise<void> {
  await sql`update api_tokens set revoked_at = now() where name = ${name} and revoked_at is null`;
}

/** Cookie header value (name=value; …) from a response's Set-Cookie headers, merged into `jar`. */
export function mergeCookies(jar: Map<string, string>, response: Response): Map<string, string> {
  for (const line of response.headers.getSetCookie()) {
    const [pair] = line.split(";");
    const index = pair.indexOf("=");
    jar.set(pair.slice(0, index).trim(), pair.slice(index + 1).trim());
  }
  return jar;
}

export const cookieHeader = (jar: Map<string, string>) => [...jar].map(([name, value]) => `${name}=${value}`).join("; ");

/**
 * Signs in with e-mail and password through Auth.js's credentials endpoint (CSRF token first) and returns
 * the cookie jar with the session cookie, plus the raw Set-Cookie lines of the sign-in answer.
 */
export async function signInWithPassword(
  baseUrl: string,
  email: string,
  password: string,
  headers: Record<string, string> = {},
): Promise<{ jar: Map<string, string>; setCookie: string[]; status: number }> {
  const jar = new Map<string, string>();
  const csrf = await fetch(`${baseUrl}/api/auth/csrf`, { headers });
  mergeCookies(jar, csrf);
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const response = await fetch(`${baseUrl}/api/auth/callback/credentials`, {
    method: "POST",
    redirect: "manual",
    headers: { ...headers, "content-type": "application/x-www-form-urlencoded", cookie: cookieHeader(jar) },
    body: new URLSearchParams({ csrfToken, email, password, callbackUrl: "/" }).toString(),
  });
  await response.body?.cancel();
  mergeCookies(jar, response);
  return { jar, setCookie: response.headers.getSetCookie(), status: response.status };
}

/** The approved demo fit of Larkspur (the seed makes one). */
export async function approvedFitId(sql: Sql): Promise<string> {
  const [fit] = await sql<{ id: string }[]>`
    select f.id from fits f join workspaces w on w.id = f.workspace_id
    where w.slug = 'larkspur' and f.status = 'approved' order by f.approved_at limit 1`;
  if (!fit) throw new Error("the seed has no approved fit in Larkspur");
  return fit.id;
}

/** Starts a scenario on the approved demo fit through the API; returns its id and its starting plan. */
export async function startScenario(
  baseUrl: string,
  token: string,
  fitId: string,
  name: string,
): Promise<{ id: string; baseline: { allocation: Record<string, number>; controls: Record<string, number>; horizon: number; total: number } }> {
  const headers = { authorization: `Bearer ${token}`, "content-type": "application/json" };
  const created = await fetch(`${baseUrl}/api/scenarios`, { method: "POST", headers, body: JSON.stringify({ fitId, name }) });
  const body = (await created.json()) as { id?: string; scenario?: { id: string }; error?: string };
  if (created.status !== 201) throw new Error(`could not start a scenario: ${created.status} ${JSON.stringify(body)}`);
  const id = (body.id ?? body.scenario?.id)!;
  const scenario = (await (await fetch(`${baseUrl}/api/scenarios/${id}`, { headers })).json()) as {
    baseline: { allocation: Record<string, number>; controls: Record<string, number>; horizon: number; total: number };
  };
  return { id, baseline: scenario.baseline };
}

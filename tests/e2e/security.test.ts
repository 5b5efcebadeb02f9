// Security properties of the running app (the production build under test):
// - headers: every answer has nosniff, a Referrer-Policy, X-Frame-Options DENY, a Permissions-Policy and
//   COOP; pages have a Content-Security-Policy with a fresh nonce per request (script-src 'nonce-…'
//   'strict-dynamic', no 'unsafe-inline' or 'unsafe-eval' for scripts, frame-ancestors 'none') and every
//   script tag carries that nonce; route handlers' answers a policy that allows nothing; HSTS only when
//   the request came over TLS (X-Forwarded-Proto: https);
// - in a real browser the signed-in pages run under that policy without a single violation (the inline
//   bootstrap scripts and the chunks run: the page hydrates), the scenario room with the parts it loads
//   after the first paint too; so does the 404 page of a missing URL
//   (rendered per request, so it has the nonce too);
// - same-origin check: a cookie-authenticated POST from another origin (Origin or Sec-Fetch-Site) is 403
//   and changes nothing, while the same request from our origin works and Bearer calls are exempt; a server
//   action posted with another Origin is refused by Next and does not run;
// - cookie flags: the session cookie is HttpOnly and SameSite=Lax, not Secure over plain http, and
//   `__Secure-` + Secure when the app is reached over https (Auth.js decides from the request's protocol);
//   the `tributary-workspace` cookie is HttpOnly, SameSite=Lax, path / and Secure by the same rule;
// - the client bundles (static chunks and prerendered pages of the build) contain no secret or server-only
//   value: not AUTH_SECRET's or DATABASE_URL's value, no postgres:// URL, no SMTP password, no argon2 or
//   database driver code.
import { readdirSync, readFileSync, statSync } from "node:fs";
import path from "node:path";
import type { Browser } from "playwright-core";
import type postgres from "postgres";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { launch, openPage } from "./support/browser";
import { e2e, url } from "./support/env";
import { createTokenFor, demoAccountFor, signInAs, testDatabase } from "./support/sign-in";
import { demoChannels, demoControl } from "@/seed/history";

let sql: postgres.Sql;
let browser: Browser;
const origin = new URL(e2e.baseUrl).origin;

beforeAll(async () => {
  sql = testDatabase();
  browser = await launch();
});

afterAll(async () => {
  await sql`delete from api_tokens where name like 'security test%'`;
  await sql`delete from scenarios where name = 'security test room'`.catch(() => {});
  await sql.end();
  await browser?.close();
});

/** A scenario on Larkspur's approved fit, started through the API (removed again after the tests). */
async function scenarioForRoom(): Promise<string> {
  const [fit] = await sql<{ id: string }[]>`
    select f.id from fits f join workspaces w on w.id = f.workspace_id
    where w.slug = 'larkspur' and f.status = 'approved' order by f.approved_at limit 1`;
  expect(fit, "an approved fit in Larkspur Outfitters").toBeTruthy();
  const { token } = await createTokenFor(sql, "planner@larkspur.example", "larkspur", "security test room");
  const response = await fetch(url("/api/scenarios"), {
    method: "POST",
    headers: { authorization: `Bearer ${token}`, "content-type": "application/json" },
    body: JSON.stringify({ fitId: fit.id, name: "security test room" }),
  });
  expect(response.status, await response.clone().text()).toBe(201);
  return ((await response.json()) as { id: string }).id;
}

const get = (path: string, headers: Record<string, string> = {}) => fetch(url(path), { headers, redirect: "manual" });

/** The build's server actions by id (server-reference manifest). */
function serverActions(): Record<string, { exportedName?: string; filename?: string }> {
  const manifest = JSON.parse(readFileSync(path.join(process.env.NEXT_DIST_DIR || ".next-test", "server", "server-reference-manifest.json"), "utf8")) as {
    node: Record<string, { exportedName?: string; filename?: string }>;
  };
  return manifest.node;
}

function directives(policy: string | null): Map<string, string[]> {
  const map = new Map<string, string[]>();
  for (const part of (policy ?? "").split(";")) {
    const [name, ...values] = part.trim().split(/\s+/);
    if (name) map.set(name.toLowerCase(), values);
  }
  return map;
}

describe("headers", () => {
  test("every answer (page, route handler, static file) carries nosniff, Referrer-Policy, X-Frame-Options, Permissions-Policy and COOP", async () => {
    const login = await get("/login");
    const html = await login.text();
    const chunk = /src="(\/_next\/static\/chunks\/[^"]+\.js)"/.exec(html)?.[1];
    expect(chunk, "a script chunk on /login").toBeTruthy();
    for (const response of [login, await get("/api/health"), await get("/api/me"), await get(chunk!)]) {
      expect(response.headers.get("x-content-type-options"), response.url).toBe("nosniff");
      expect(response.headers.get("referrer-policy"), response.url).toBe("strict-origin-when-cross-origin");
      expect(response.headers.get("x-frame-options"), response.url).toBe("DENY");
      expect(response.headers.get("permissions-policy"), response.url).toMatch(/camera=\(\).*microphone=\(\).*geolocation=\(\)/);
      expect(response.headers.get("cross-origin-opener-policy"), response.url).toBe("same-origin");
      expect(response.headers.get("strict-transport-security"), `${response.url}: no HSTS over plain http`).toBeNull();
    }
  });

  test("pages: a CSP with a fresh nonce on every script, no unsafe-inline/unsafe-eval for scripts, no framing", async () => {
    const nonces: string[] = [];
    for (let i = 0; i < 2; i++) {
      const response = await get("/login");
      const policy = directives(response.headers.get("content-security-policy"));
      const scriptSrc = policy.get("script-src") ?? [];
      const nonce = scriptSrc.find((value) => value.startsWith("'nonce-"))?.slice(7, -1);
      expect(nonce, "script-src has a nonce").toBeTruthy();
      expect(scriptSrc).toContain("'strict-dynamic'");
      expect(scriptSrc).not.toContain("'unsafe-inline'");
      expect(scriptSrc).not.toContain("'unsafe-eval'");
      expect(policy.get("frame-ancestors")).toEqual(["'none'"]);
      expect(policy.get("object-src")).toEqual(["'none'"]);
      expect(policy.get("base-uri")).toEqual(["'self'"]);
      expect(policy.get("default-src")).toEqual(["'self'"]);
      const html = await response.text();
      const scripts = [...html.matchAll(/<script\b[^>]*>/g)].map((m) => m[0]);
      expect(scripts.length).toBeGreaterThan(0);
      for (const tag of scripts) expect(tag, "every script tag carries the nonce").toContain(`nonce="${nonce}"`);
      nonces.push(nonce!);
    }
    expect(nonces[0]).not.toBe(nonces[1]);
  });

  test("route handlers: a policy that allows nothing; HSTS only behind TLS", async () => {
    const health = await get("/api/health");
    expect(directives(health.headers.get("content-security-policy")).get("default-src")).toEqual(["'none'"]);
    const overTls = await get("/login", { "x-forwarded-proto": "https" });
    expect(overTls.headers.get("strict-transport-security")).toMatch(/^max-age=\d{7,}/);
    expect(directives(overTls.headers.get("content-security-policy")).has("upgrade-insecure-requests")).toBe(true);
    expect((await get("/api/health", { "x-forwarded-proto": "https" })).headers.get("strict-transport-security")).toMatch(/^max-age=/);
  });

  test("in the browser, the signed-in pages run under the CSP without a violation and hydrate", async () => {
    const tab = await openPage(browser);
    const violations = await recordViolations(tab);
    try {
      await signInAs(tab.page, "planner");
      for (const pagePath of ["/", "/scenarios", "/fits", "/settings/tokens"]) {
        await tab.page.goto(pagePath);
        await tab.page.waitForLoadState("networkidle");
        // The inline bootstrap ran (it defines self.__next_f) and the router is up: the page hydrated.
        expect(await tab.page.evaluate(() => Array.isArray((self as unknown as { __next_f?: unknown[] }).__next_f)), pagePath).toBe(true);
      }
      // A client-side navigation works (needs the hydrated router and its chunks).
      await tab.page.getByRole("link", { name: /scenarios/i }).first().click();
      await tab.page.waitForURL((u) => u.pathname.startsWith("/scenarios"), { timeout: 15_000 });

      // The scenario room loads parts after the first paint (preview engine, suggestion panel, response
      // curves, version drawer, finance review): chunks the nonce'd bootstrap imports, allowed by 'strict-dynamic'.
      const scenarioId = await scenarioForRoom();
      await tab.page.goto(`/scenarios/${scenarioId}`);
      await tab.page.locator('[data-testid="outcome-panel"][data-source="server"]').waitFor();
      await tab.page.getByTestId("response-curves").getByTestId("response-curve").first().waitFor();
      await tab.page.getByTestId("suggest-panel").waitFor();
      await tab.page.getByTestId("scenario-signoff-status").waitFor();
      await tab.page.getByRole("button", { name: /Version history/ }).click();
      await tab.page.getByTestId("version-drawer").waitFor();
      await tab.page.waitForLoadState("networkidle");
      expect(violations).toEqual([]);
      expect(tab.errors.filter((error) => /content security policy/i.test(error))).toEqual([]);
    } finally {
      await tab.close();
    }
  });
});

/** Every Content-Security-Policy violation the tab's pages report, as "directive blocked-URI on path". */
async function recordViolations(tab: Awaited<ReturnType<typeof openPage>>): Promise<string[]> {
  const violations: string[] = [];
  await tab.context.exposeBinding("reportViolation", (_source, text: string) => violations.push(text));
  await tab.context.addInitScript(() => {
    document.addEventListener("securitypolicyviolation", (event) => {
      (window as unknown as { reportViolation: (text: string) => void }).reportViolation(`${event.violatedDirective} ${event.blockedURI} on ${location.pathname}`);
    });
  });
  return violations;
}

describe("the 404 page", () => {
  test("is rendered per request: its scripts carry the nonce, and in the browser it runs without a violation and hydrates", async () => {
    const response = await get("/no-such-page-here");
    expect(response.status).toBe(404);
    const nonce = (directives(response.headers.get("content-security-policy")).get("script-src") ?? []).find((value) => value.startsWith("'nonce-"))?.slice(7, -1);
    expect(nonce, "script-src has a nonce").toBeTruthy();
    const scripts = [...(await response.text()).matchAll(/<script\b[^>]*>/g)].map((m) => m[0]);
    expect(scripts.length).toBeGreaterThan(0);
    for (const tag of scripts) expect(tag, "every script tag of the 404 page carries the nonce").toContain(`nonce="${nonce}"`);

    const tab = await openPage(browser);
    const violations = await recordViolations(tab);
    try {
      const page = await tab.page.goto("/no-such-page-here/either");
      expect(page?.status()).toBe(404);
      await tab.page.waitForLoadState("networkidle");
      await expect(tab.page.getByRole("heading", { name: "Nothing here" }).isVisible()).resolves.toBe(true);
      // The inline bootstrap ran (self.__next_f) and React hydrated the page (its fiber on the DOM node).
      expect(await tab.page.evaluate(() => Array.isArray((self as unknown as { __next_f?: unknown[] }).__next_f))).toBe(true);
      await tab.page.waitForFunction(() => {
        const main = document.querySelector("main");
        return main !== null && Object.keys(main).some((key) => key.startsWith("__reactFiber"));
      });
      expect(violations).toEqual([]);
      expect(tab.errors.filter((error) => /content security policy|refused to execute/i.test(error))).toEqual([]);
    } finally {
      await tab.close();
    }
  });
});

describe("same-origin check on cookie-authenticated mutations", () => {
  async function sessionCookie(): Promise<string> {
    const tab = await openPage(browser);
    try {
      await signInAs(tab.page, "planner");
      const cookies = await tab.context.cookies();
      return cookies.map((c) => `${c.name}=${c.value}`).join("; ");
    } finally {
      await tab.close();
    }
  }
  const tokenCount = async (name: string) => (await sql<{ n: number }[]>`select count(*)::int as n from api_tokens where name = ${name}`)[0].n;

  test("a cross-site POST with the session cookie is 403 and creates nothing; the same from our origin works; Bearer calls are exempt", async () => {
    const cookie = await sessionCookie();
    const post = (name: string, headers: Record<string, string>) =>
      fetch(url("/api/tokens"), { method: "POST", headers: { cookie, "content-type": "application/json", ...headers }, body: JSON.stringify({ name }), redirect: "manual" });

    const evil = await post("security test evil", { origin: "https://evil.example" });
    expect(evil.status).toBe(403);
    expect(await evil.json()).toEqual({ error: "Cross-site requests may not change data.", details: [] });
    const fetchSite = await post("security test fetch-site", { "sec-fetch-site": "cross-site" });
    expect(fetchSite.status).toBe(403);
    const sameSite = await post("security test same-site", { "sec-fetch-site": "same-site", origin: `http://other.${new URL(e2e.baseUrl).host}` });
    expect(sameSite.status).toBe(403);
    expect(await tokenCount("security test evil")).toBe(0);
    expect(await tokenCount("security test fetch-site")).toBe(0);
    expect(await tokenCount("security test same-site")).toBe(0);

    const ours = await post("security test ours", { origin, "sec-fetch-site": "same-origin" });
    expect(ours.status, await ours.clone().text()).toBe(201);
    expect(await tokenCount("security test ours")).toBe(1);

    // A script with a Bearer token carries no ambient credentials: exempt, whatever Origin it claims.
    const { token } = await createTokenFor(sql, "planner@larkspur.example", "larkspur", "security test bearer");
    const bearer = await fetch(url("/api/tokens"), {
      method: "POST",
      headers: { authorization: `Bearer ${token}`, "content-type": "application/json", origin: "https://evil.example" },
      body: JSON.stringify({ name: "security test via bearer" }),
    });
    expect(bearer.status).toBe(201);
  });

  // The prediction route is the one Pages Router API route (server/http/pages-route.ts): the same
  // session reading and same-origin rule as the route handlers, and it never re-issues the session cookie.
  test("the prediction route with the session cookie: answers from our origin, 403 cross-site, 401 without it, no Set-Cookie", async () => {
    const cookie = await sessionCookie();
    const [fit] = await sql<{ id: string }[]>`
      select f.id from fits f join workspaces w on w.id = f.workspace_id
      where w.slug = 'larkspur' and f.status = 'approved' order by f.approved_at limit 1`;
    const allocation = Object.fromEntries(demoChannels.map((channel) => [channel.column, 50_000]));
    const predict = (headers: Record<string, string>) =>
      fetch(url(`/api/fits/${fit.id}/predict`), {
        method: "POST",
        headers: { "content-type": "application/json", ...headers },
        body: JSON.stringify({ allocation, controls: { [demoControl.column]: 2 }, horizon: 13 }),
        redirect: "manual",
      });

    const ours = await predict({ cookie, origin, "sec-fetch-site": "same-origin" });
    expect(ours.status, await ours.clone().text()).toBe(200);
    expect(((await ours.json()) as { horizonTotal: { mean: number } }).horizonTotal.mean).toBeGreaterThan(0);
    expect(ours.headers.get("set-cookie")).toBeNull();
    expect(ours.headers.get("content-security-policy")).toContain("default-src 'none'");

    const evil = await predict({ cookie, origin: "https://evil.example" });
    expect(evil.status).toBe(403);
    expect(await evil.json()).toEqual({ error: "Cross-site requests may not change data.", details: [] });
    expect((await predict({ origin })).status).toBe(401);
    expect((await predict({ cookie: "authjs.session-token=forged", origin })).status).toBe(401);
  });

  test("a server action posted with another Origin is refused by Next and does not run (the same post from our origin does)", async () => {
    const actionId = Object.entries(serverActions()).find(([, entry]) => entry.exportedName === "createTokenAction")?.[0];
    expect(actionId, "createTokenAction in the build's server-reference manifest").toBeTruthy();
    const cookie = await sessionCookie();
    const call = (name: string, headers: Record<string, string>) =>
      fetch(url("/settings/tokens"), {
        method: "POST",
        headers: { cookie, "next-action": actionId!, "content-type": "text/plain;charset=UTF-8", accept: "text/x-component", ...headers },
        // React's encodeReply of (previousState, { name }): plain JSON.
        body: JSON.stringify([{ status: "idle" }, { name }]),
        redirect: "manual",
      });
    const evil = await call("security test action evil", { origin: "https://evil.example" });
    await evil.text();
    expect(evil.status).toBeGreaterThanOrEqual(400);
    expect(await tokenCount("security test action evil")).toBe(0);
    const ours = await call("security test action ours", { origin });
    expect(ours.status, await ours.text()).toBe(200);
    expect(await tokenCount("security test action ours")).toBe(1);
  });
});

describe("cookie flags", () => {
  /** Posts the header's workspace switch the way a browser without JavaScript does; returns the workspace cookie's Set-Cookie. */
  async function switchWorkspace(cookie: string, headers: Record<string, string> = {}): Promise<string | undefined> {
    const actionId = Object.entries(serverActions()).find(([, entry]) => entry.exportedName === "switchWorkspaceAction" && entry.filename?.includes("(app)/actions"))?.[0];
    expect(actionId, "switchWorkspaceAction in the build's server-reference manifest").toBeTruthy();
    const form = new FormData();
    form.set(`$ACTION_ID_${actionId}`, "");
    form.set("workspace", "larkspur");
    const response = await fetch(url("/"), { method: "POST", redirect: "manual", headers: { cookie, origin, ...headers }, body: form });
    await response.body?.cancel();
    const line = response.headers.getSetCookie().find((entry) => entry.startsWith("tributary-workspace="));
    expect(line, `status ${response.status}, Set-Cookie: ${response.headers.getSetCookie().join(" | ")}`).toBeTruthy();
    return line;
  }

  test("the session cookie is HttpOnly and SameSite=Lax (and not Secure over plain http); so is the workspace cookie", async () => {
    const tab = await openPage(browser);
    try {
      await signInAs(tab.page, "finance");
      const cookies = await tab.context.cookies();
      const session = cookies.find((c) => /^authjs\.session-token/.test(c.name));
      expect(session).toMatchObject({ httpOnly: true, sameSite: "Lax", secure: false });
      const workspace = await switchWorkspace(cookies.map((c) => `${c.name}=${c.value}`).join("; "));
      expect(workspace).toMatch(/^tributary-workspace=larkspur;/);
      expect(workspace).toMatch(/;\s*HttpOnly/i);
      expect(workspace).toMatch(/;\s*SameSite=Lax/i);
      expect(workspace).toMatch(/;\s*Path=\/(;|$)/i);
      expect(workspace).not.toMatch(/;\s*Secure/i);
    } finally {
      await tab.close();
    }
  });

  test("over https (X-Forwarded-Proto from a TLS proxy) it is __Secure- prefixed and Secure", async () => {
    const headers = { "x-forwarded-proto": "https", "x-forwarded-host": new URL(e2e.baseUrl).host };
    const csrf = await fetch(url("/api/auth/csrf"), { headers });
    const csrfCookies = csrf.headers.getSetCookie();
    const { csrfToken } = (await csrf.json()) as { csrfToken: string };
    const account = demoAccountFor("finance");
    const response = await fetch(url("/api/auth/callback/credentials"), {
      method: "POST",
      redirect: "manual",
      headers: { ...headers, "content-type": "application/x-www-form-urlencoded", cookie: csrfCookies.map((c) => c.split(";")[0]).join("; ") },
      body: new URLSearchParams({ csrfToken, email: account.email, password: account.password, callbackUrl: "/" }).toString(),
    });
    await response.body?.cancel();
    for (const line of csrfCookies) expect(line, "CSRF cookie over https").toMatch(/;\s*Secure/i);
    const session = response.headers.getSetCookie().find((line) => /^__Secure-authjs\.session-token=/.test(line));
    expect(session, `Set-Cookie: ${response.headers.getSetCookie().join(" | ")}`).toBeTruthy();
    expect(session).toMatch(/;\s*HttpOnly/i);
    expect(session).toMatch(/;\s*Secure/i);
    expect(session).toMatch(/;\s*SameSite=Lax/i);

    // The workspace cookie follows the same rule: Secure behind TLS.
    const workspace = await switchWorkspace(session!.split(";")[0], headers);
    expect(workspace).toMatch(/^tributary-workspace=larkspur;/);
    expect(workspace).toMatch(/;\s*HttpOnly/i);
    expect(workspace).toMatch(/;\s*Secure/i);
    expect(workspace).toMatch(/;\s*SameSite=Lax/i);
    expect(workspace).toMatch(/;\s*Path=\/(;|$)/i);
  });
});

describe("client bundles", () => {
  function files(dir: string, keep: (name: string) => boolean): string[] {
    const found: string[] = [];
    for (const entry of readdirSync(dir, { withFileTypes: true })) {
      const full = path.join(dir, entry.name);
      if (entry.isDirectory()) found.push(...files(full, keep));
      else if (keep(entry.name)) found.push(full);
    }
    return found;
  }

  test("no secret or server-only value in anything the browser can download", () => {
    const distDir = process.env.NEXT_DIST_DIR || ".next-test";
    const shipped = [
      ...files(path.join(distDir, "static"), () => true),
      // prerendered pages and their RSC payloads are sent as they are
      ...files(path.join(distDir, "server", "app"), (name) => /\.(html|rsc|body)$/.test(name)),
    ];
    expect(shipped.length).toBeGreaterThan(10);
    const secrets = [process.env.AUTH_SECRET, process.env.DATABASE_URL, process.env.SMTP_PASS].filter((value): value is string => Boolean(value && value.length >= 8));
    expect(secrets.length, "AUTH_SECRET and DATABASE_URL are set for the run").toBeGreaterThanOrEqual(2);
    const patterns: [string, RegExp][] = [
      ["a postgres:// URL", /postgres(ql)?:\/\/[^\s"'`]*@/i],
      ["argon2 code or a hash", /\$argon2(id|i|d)\$|@node-rs\/argon2/],
      ["the database driver", /postgres\.js|drizzle-orm\/postgres-js|pg-boss/],
      ["the SMTP client or its settings", /nodemailer|SMTP_PASS|SMTP_USER/],
      ["server environment variable names", /\b(AUTH_SECRET|DATABASE_URL|NEXTAUTH_SECRET)\b/],
      ["a private key", /-----BEGIN [A-Z ]*PRIVATE KEY-----/],
    ];
    const findings: string[] = [];
    let bytes = 0;
    for (const file of shipped) {
      if (statSync(file).size > 20 * 1024 * 1024) continue;
      const text = readFileSync(file, "latin1");
      bytes += text.length;
      for (const secret of secrets) if (text.includes(secret)) findings.push(`${file}: the value of a server secret`);
      for (const [what, pattern] of patterns) if (pattern.test(text)) findings.push(`${file}: ${what} (${pattern.exec(text)?.[0]})`);
    }
    expect(findings).toEqual([]);
    expect(bytes).toBeGreaterThan(100_000);
  });
});

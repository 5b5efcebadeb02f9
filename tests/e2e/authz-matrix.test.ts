// The authorization matrix: EVERY API route (app/api and pages/api) × every demo role (Bearer tokens) ×
// no credentials (401) × another workspace's caller on this workspace's objects (404).
//
// Adding a route? Add one line to `routes` below: who may call it, the status an allowed caller gets,
// and (if it needs one) the path of a real object and a body. The first test fails while any route
// file under app/api or pages/api has a method missing here.
import type postgres from "postgres";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import type { Role } from "@/db/schema/workspaces";
import { demoChannels, demoControl } from "@/seed/history";
import { discoverRoutes } from "./support/routes";
import { api, createTokenFor, demoAccounts, testDatabase } from "./support/sign-in";

type Method = "GET" | "POST" | "PUT" | "PATCH" | "DELETE";

type Caller = { label: string; email: string; roles: readonly Role[]; workspace: string };

/** What the tests can point routes at: real objects of the Larkspur workspace, made fresh where a call changes them. */
type Fixtures = {
  sql: postgres.Sql;
  larkspurId: string;
  token: (email: string) => string;
  /** A fresh API token of `email`'s Larkspur membership (so revoking it disturbs nobody). */
  newTokenId: (email: string) => Promise<string>;
  /** A fresh Larkspur member (analyst) to change or remove. */
  newMemberId: () => Promise<string>;
  /** The seeded demo spend history of Larkspur. */
  datasetId: () => Promise<string>;
  /** The seeded approved and draft demo fits of Larkspur. */
  fitId: (status: "approved" | "draft") => Promise<string>;
  /** A copy of the seeded draft fit built by `authorEmail`, for calls that move it along its states. */
  newDraftFitId: (authorEmail: string) => Promise<string>;
  /** A scenario on the approved demo fit, started through the API by the planner. */
  scenarioId: () => Promise<string>;
  /** A background job record of Larkspur. */
  jobId: () => Promise<string>;
};

type RouteCase = {
  method: Method;
  /** The route as on disk, e.g. "/api/tokens/[id]". */
  route: string;
  /** Who may call it: "public" (no credentials needed), "member" (any role) or the roles allowed. */
  who: "public" | "member" | readonly Role[];
  /** Status for an allowed caller (several when the outcome depends on the object's state). */
  ok: number | readonly number[];
  /** Concrete path (objects of Larkspur); default: the route itself. */
  path?: (fx: Fixtures, caller: Caller) => string | Promise<string>;
  body?: unknown | ((fx: Fixtures) => unknown | Promise<unknown>);
  /** For routes with an object in the path: a caller from another workspace gets 404 (default true). */
  foreign?: boolean;
};

const larkspurMember = (caller: Caller) => (caller.workspace === "larkspur" ? caller.email : "planner@larkspur.example");

// Spend histories: the seeded demo history of Larkspur (an approved fit uses it, so its roles are frozen).
const demoDatasetPath = async (fx: Fixtures, rest = "") => {
  const [row] = await fx.sql<{ id: string }[]>`select id from datasets where workspace_id = ${fx.larkspurId} order by uploaded_at limit 1`;
  if (!row) throw new Error("the seed has no spend history in larkspur");
  return `/api/datasets/${row.id}${rest}`;
};
const datasetReaders = ["admin", "analyst", "reviewer"] as const;

// Side by side (issue 6): one comparison of two saved versions (the matrix scenario's version 1 and
// a second scenario's), made once through the API by the planner.
let matrixComparison: Promise<string> | undefined;
const comparisonId = (fx: Fixtures) =>
  (matrixComparison ??= (async () => {
    const token = fx.token("planner@larkspur.example");
    const started = await (await api("/api/scenarios", { method: "POST", token, json: { fitId: await fx.fitId("approved"), name: "Authz matrix comparison" } })).json();
    const { allocation, controls, horizon, total } = started.baseline;
    await api(`/api/scenarios/${started.id}/versions`, { method: "POST", token, json: { baseVersion: 0, mode: "fixed", allocation, controls, horizon, total } });
    const versions = [{ scenarioId: await fx.scenarioId(), version: 1 }, { scenarioId: started.id, version: 1 }];
    const created = await (await api("/api/comparisons", { method: "POST", token, json: { name: "Authz matrix comparison", versions } })).json();
    if (!created.id) throw new Error(`could not save a comparison: ${JSON.stringify(created)}`);
    return created.id as string;
  })());

// One line per route handler method. Keep it sorted by route.
const routes: RouteCase[] = [
  { method: "GET", route: "/api/auth/[...nextauth]", who: "public", ok: 200, path: () => "/api/auth/providers" },
  // Auth.js's own endpoints: a credentials POST without its CSRF token is turned away with a redirect.
  { method: "POST", route: "/api/auth/[...nextauth]", who: "public", ok: 302, path: () => "/api/auth/callback/credentials", body: {} },
  { method: "GET", route: "/api/datasets", who: ["admin", "analyst", "reviewer"], ok: 200 },
  // An empty upload: analysts reach the file checks (422) and nothing is stored.
  { method: "POST", route: "/api/datasets", who: ["analyst"], ok: 422, body: "" },
  { method: "GET", route: "/api/datasets/[id]", who: ["admin", "analyst", "reviewer"], ok: 200, path: async (fx) => `/api/datasets/${await fx.datasetId()}` },
  { method: "GET", route: "/api/datasets/[id]/correlations", who: ["admin", "analyst", "reviewer"], ok: 200, path: async (fx) => `/api/datasets/${await fx.datasetId()}/correlations` },
  { method: "GET", route: "/api/datasets/[id]/export", who: ["admin", "analyst", "reviewer"], ok: 200, path: async (fx) => `/api/datasets/${await fx.datasetId()}/export` },
  { method: "GET", route: "/api/datasets/[id]/file", who: ["admin", "analyst", "reviewer"], ok: 200, path: async (fx) => `/api/datasets/${await fx.datasetId()}/file` },
  // An empty body is refused (422) before the history is looked up, so there is no foreign-workspace case here.
  { method: "PUT", route: "/api/datasets/[id]/roles", who: ["analyst"], ok: 422, path: async (fx) => `/api/datasets/${await fx.datasetId()}/roles`, body: {}, foreign: false },
  { method: "GET", route: "/api/datasets/[id]/rows", who: ["admin", "analyst", "reviewer"], ok: 200, path: async (fx) => `/api/datasets/${await fx.datasetId()}/rows` },
  { method: "GET", route: "/api/comparisons", who: ["admin", "planner", "finance"], ok: 200 },
  // An empty body: allowed roles reach validation (422) and nothing is saved.
  { method: "POST", route: "/api/comparisons", who: ["planner", "finance"], ok: 422, body: {} },
  { method: "GET", route: "/api/comparisons/[id]", who: ["admin", "planner", "finance"], ok: 200, path: async (fx) => `/api/comparisons/${await comparisonId(fx)}` },
  { method: "GET", route: "/api/comparisons/[id]/export.csv", who: ["admin", "planner", "finance"], ok: 200, path: async (fx) => `/api/comparisons/${await comparisonId(fx)}/export.csv` },
  { method: "GET", route: "/api/comparisons/[id]/export.pdf", who: ["admin", "planner", "finance"], ok: 200, path: async (fx) => `/api/comparisons/${await comparisonId(fx)}/export.pdf` },
  { method: "POST", route: "/api/comparisons/[id]/share", who: ["planner"], ok: 201, path: async (fx) => `/api/comparisons/${await comparisonId(fx)}/share`, body: { recipients: ["finance@larkspur.example"] } },
  { method: "GET", route: "/api/datasets", who: datasetReaders, ok: 200 },
  // JSON instead of a CSV: analysts reach the content check (422) and nothing is stored.
  { method: "POST", route: "/api/datasets", who: ["analyst"], ok: 422, body: {} },
  { method: "GET", route: "/api/datasets/[id]", who: datasetReaders, ok: 200, path: (fx) => demoDatasetPath(fx) },
  { method: "GET", route: "/api/datasets/[id]/correlations", who: datasetReaders, ok: 200, path: (fx) => demoDatasetPath(fx, "/correlations") },
  { method: "GET", route: "/api/datasets/[id]/export", who: datasetReaders, ok: 200, path: (fx) => demoDatasetPath(fx, "/export") },
  { method: "GET", route: "/api/datasets/[id]/file", who: datasetReaders, ok: 200, path: (fx) => demoDatasetPath(fx, "/file") },
  // The demo history is frozen by the approved demo fit: analysts get 409 and its roles stay as they are.
  { method: "PUT", route: "/api/datasets/[id]/roles", who: ["analyst"], ok: [409, 422], path: (fx) => demoDatasetPath(fx, "/roles"), body: { roles: { week_start: { role: "period" } } } },
  { method: "GET", route: "/api/datasets/[id]/rows", who: datasetReaders, ok: 200, path: (fx) => demoDatasetPath(fx, "/rows?limit=5") },
  { method: "GET", route: "/api/fits", who: ["admin", "analyst", "reviewer", "planner", "finance"], ok: 200 },
  // An empty body: allowed roles reach validation (422) and nothing is created.
  { method: "POST", route: "/api/fits", who: ["analyst"], ok: 422, body: {} },
  { method: "GET", route: "/api/fits/[id]", who: ["admin", "analyst", "reviewer", "planner", "finance"], ok: 200, path: async (fx) => `/api/fits/${await fx.fitId("approved")}` },
  { method: "GET", route: "/api/fits/compare", who: ["admin", "analyst", "reviewer", "planner", "finance"], ok: 200, path: async (fx) => `/api/fits/compare?ids=${await fx.fitId("approved")},${await fx.fitId("draft")}` },
  // An empty body is refused (422) before the fit is looked up, so there is no foreign-workspace case here.
  { method: "PUT", route: "/api/fits/[id]", who: ["analyst"], ok: 422, path: async (fx) => `/api/fits/${await fx.fitId("draft")}`, body: {}, foreign: false },
  {
    method: "POST",
    route: "/api/fits/[id]/predict",
    who: ["analyst", "reviewer", "planner"],
    ok: 200,
    path: async (fx) => `/api/fits/${await fx.fitId("approved")}/predict`,
    body: { allocation: Object.fromEntries(demoChannels.map((c) => [c.column, 40_000])), controls: { [demoControl.column]: 2 }, horizon: 13 },
  },
  { method: "POST", route: "/api/fits/[id]/suggest", who: ["analyst", "reviewer", "planner"], ok: 200, path: async (fx) => `/api/fits/${await fx.fitId("approved")}/suggest`, body: { allocation: Object.fromEntries(demoChannels.map((c) => [c.column, 40_000])), controls: { [demoControl.column]: 2 }, horizon: 13 } },
  { method: "POST", route: "/api/fits/[id]/retire", who: ["analyst", "reviewer"], ok: 200, path: async (fx, caller) => `/api/fits/${await fx.newDraftFitId(larkspurMember(caller))}/retire`, body: {} },
  // The approved demo fit cannot be approved again: allowed reviewers get 409, and it stays as it is.
  { method: "POST", route: "/api/fits/[id]/review", who: ["reviewer"], ok: 409, path: async (fx) => `/api/fits/${await fx.fitId("approved")}/review`, body: { decision: "approve" } },
  // The caller's own draft (only its author may send a fit for review).
  { method: "POST", route: "/api/fits/[id]/submit", who: ["analyst"], ok: 200, path: async (fx, caller) => `/api/fits/${await fx.newDraftFitId(larkspurMember(caller))}/submit`, body: {} },
  { method: "GET", route: "/api/health", who: "public", ok: 200 },
  { method: "GET", route: "/api/jobs/[id]", who: "member", ok: 200, path: async (fx) => `/api/jobs/${await fx.jobId()}` },
  { method: "GET", route: "/api/me", who: "member", ok: 200 },
  { method: "GET", route: "/api/notifications", who: "member", ok: 200 },
  // An id that is nobody's: 200 with nothing marked.
  { method: "POST", route: "/api/notifications/read", who: "member", ok: 200, body: { ids: ["00000000-0000-4000-8000-000000000000"] } },
  { method: "GET", route: "/api/openapi", who: "public", ok: 200 },
  { method: "GET", route: "/api/ping", who: "public", ok: 200 },
  { method: "GET", route: "/api/scenarios", who: ["admin", "reviewer", "planner", "finance"], ok: 200 },
  // An empty body: planners reach validation (422) and nothing is created.
  { method: "POST", route: "/api/scenarios", who: ["planner"], ok: 422, body: {} },
  { method: "GET", route: "/api/scenarios/[id]", who: ["admin", "reviewer", "planner", "finance"], ok: 200, path: async (fx) => `/api/scenarios/${await fx.scenarioId()}` },
  { method: "GET", route: "/api/scenarios/[id]/versions", who: ["admin", "reviewer", "planner", "finance"], ok: 200, path: async (fx) => `/api/scenarios/${await fx.scenarioId()}/versions` },
  // Restoring version 1 on a stale base version: planners get 409 and no version is added.
  {
    method: "POST",
    route: "/api/scenarios/[id]/versions",
    who: ["planner"],
    ok: 409,
    path: async (fx) => `/api/scenarios/${await fx.scenarioId()}/versions`,
    body: { baseVersion: 0, restoreFrom: 1 },
  },
  { method: "GET", route: "/api/scenarios/[id]/versions/[n]", who: ["admin", "reviewer", "planner", "finance"], ok: 200, path: async (fx) => `/api/scenarios/${await fx.scenarioId()}/versions/1` },
  { method: "GET", route: "/api/scenarios/[id]/versions/[n]/comments", who: ["admin", "reviewer", "planner", "finance"], ok: 200, path: async (fx) => `/api/scenarios/${await fx.scenarioId()}/versions/1/comments` },
  { method: "POST", route: "/api/scenarios/[id]/versions/[n]/comments", who: ["planner", "finance"], ok: 201, path: async (fx) => `/api/scenarios/${await fx.scenarioId()}/versions/1/comments`, body: { body: "Authz matrix comment" } },
  { method: "POST", route: "/api/scenarios/[id]/versions/[n]/share", who: ["planner"], ok: 201, path: async (fx) => `/api/scenarios/${await fx.scenarioId()}/versions/1/share`, body: { recipients: ["finance@larkspur.example"] } },
  { method: "GET", route: "/api/scenarios/[id]/versions/[n]/signoff", who: ["admin", "reviewer", "planner", "finance"], ok: 200, path: async (fx) => `/api/scenarios/${await fx.scenarioId()}/versions/1/signoff` },
  { method: "POST", route: "/api/scenarios/[id]/versions/[n]/signoff", who: ["finance"], ok: 201, path: async (fx) => `/api/scenarios/${await fx.scenarioId()}/versions/1/signoff`, body: { decision: "declined", reason: "Authz matrix" } },
  { method: "GET", route: "/api/tokens", who: "member", ok: 200 },
  { method: "POST", route: "/api/tokens", who: "member", ok: 201, body: { name: "authz matrix" } },
  { method: "DELETE", route: "/api/tokens/[id]", who: "member", ok: 200, path: async (fx, caller) => `/api/tokens/${await fx.newTokenId(larkspurMember(caller))}` },
  { method: "GET", route: "/api/workspace", who: "member", ok: 200 },
  { method: "PATCH", route: "/api/workspace", who: ["admin"], ok: 200, body: { currency: "EUR" } },
  { method: "GET", route: "/api/workspace/audit", who: ["admin", "reviewer"], ok: 200 },
  { method: "GET", route: "/api/workspace/members", who: ["admin"], ok: 200 },
  {
    method: "PATCH",
    route: "/api/workspace/members/[userId]",
    who: ["admin"],
    ok: 200,
    path: async (fx) => `/api/workspace/members/${await fx.newMemberId()}`,
    body: { roles: ["analyst", "finance"] },
  },
  { method: "DELETE", route: "/api/workspace/members/[userId]", who: ["admin"], ok: 204, path: async (fx) => `/api/workspace/members/${await fx.newMemberId()}` },
];

// --- discovery: tests/e2e/support/routes.ts (route handlers under app/api, API routes under pages/api) ---



// --- callers ------------------------------------------------------------------------------------------

const larkspurCallers: Caller[] = demoAccounts
  .filter((account) => account.workspace === "larkspur")
  .map((account) => ({ label: account.roles.join("+"), email: account.email, roles: account.roles, workspace: account.workspace }));
const foreignCaller: Caller = (() => {
  const account = demoAccounts.find((a) => a.workspace === "foreign")!;
  return { label: "foreign workspace", email: account.email, roles: account.roles, workspace: account.workspace };
})();

const allowed = (entry: RouteCase, caller: Caller) =>
  entry.who === "public" || entry.who === "member" || caller.roles.some((role) => (entry.who as readonly Role[]).includes(role));
const okStatuses = (entry: RouteCase) => (typeof entry.ok === "number" ? [entry.ok] : [...entry.ok]);

// --- fixtures -----------------------------------------------------------------------------------------

let fx: Fixtures;
let sql: postgres.Sql;

function once<T>(make: () => Promise<T>): () => Promise<T> {
  let value: Promise<T> | undefined;
  return () => (value ??= make());
}

beforeAll(async () => {
  sql = testDatabase();
  const tokens: Record<string, string> = {};
  for (const caller of [...larkspurCallers, foreignCaller]) {
    tokens[caller.email] = (await createTokenFor(sql, caller.email, caller.workspace, "authz matrix")).token;
  }
  const [{ id: larkspurId }] = await sql<{ id: string }[]>`select id from workspaces where slug = 'larkspur'`;
  const fitId = async (status: "approved" | "draft") => {
    const [row] = await sql<{ id: string }[]>`select id from fits where workspace_id = ${larkspurId} and status = ${status} order by created_at limit 1`;
    if (!row) throw new Error(`the seed has no ${status} demo fit in larkspur`);
    return row.id;
  };
  const approvedFit = once(() => fitId("approved"));
  const draftFit = once(() => fitId("draft"));
  fx = {
    sql,
    larkspurId,
    token: (email) => tokens[email],
    newTokenId: async (email) => (await createTokenFor(sql, email, "larkspur", "authz matrix (to revoke)")).id,
    newMemberId: async () => {
      const id = crypto.randomUUID();
      await sql`insert into "user" (id, email, name) values (${id}, ${`matrix-${id}@larkspur.example`}, 'Matrix Member')`;
      await sql`insert into memberships (workspace_id, user_id, roles) values (${larkspurId}, ${id}, ${["analyst"]})`;
      return id;
    },
    datasetId: once(async () => {
      const [row] = await sql<{ id: string }[]>`select id from datasets where workspace_id = ${larkspurId} order by uploaded_at limit 1`;
      if (!row) throw new Error("the seed has no demo spend history in larkspur");
      return row.id;
    }),
    fitId: (status) => (status === "approved" ? approvedFit() : draftFit()),
    newDraftFitId: async (authorEmail) => {
      const source = await draftFit();
      // Copies every column whatever the fits table holds, with a new id, name and author.
      return sql.begin(async (tx) => {
        await tx`create temporary table matrix_fit on commit drop as select * from fits where id = ${source}`;
        await tx`update matrix_fit set id = gen_random_uuid(), name = name || ' (authz matrix copy)',
                 author_id = (select id from "user" where email = ${authorEmail})`;
        const [row] = await tx<{ id: string }[]>`insert into fits select * from matrix_fit returning id`;
        return row.id;
      }) as Promise<string>;
    },
    scenarioId: once(async () => {
      // One scenario with a saved version is enough; reuse the one an earlier run left.
      const [existing] = await sql<{ id: string }[]>`
        select s.id from scenarios s where s.workspace_id = ${larkspurId} and s.name = 'Authz matrix scenario'
          and exists (select 1 from scenario_versions v where v.scenario_id = s.id and v.number = 1) limit 1`;
      if (existing) return existing.id;
      const response = await api("/api/scenarios", {
        method: "POST",
        token: tokens["planner@larkspur.example"],
        json: { fitId: await approvedFit(), name: "Authz matrix scenario" },
      });
      const body = (await response.json()) as { id?: string; scenario?: { id: string } };
      if (response.status !== 201) throw new Error(`could not start a scenario: ${response.status} ${JSON.stringify(body)}`);
      const id = body.id ?? body.scenario?.id;
      const started = (await (await api(`/api/scenarios/${id}`, { token: tokens["planner@larkspur.example"] })).json()) as {
        baseline: { allocation: Record<string, number>; controls: Record<string, number>; horizon: number; total: number };
      };
      const { allocation, controls, horizon, total } = started.baseline;
      const saved = await api(`/api/scenarios/${id}/versions`, {
        method: "POST",
        token: tokens["planner@larkspur.example"],
        json: { baseVersion: 0, mode: "fixed", allocation, controls, horizon, total, note: "first version for the authz matrix" },
      });
      if (saved.status !== 201) throw new Error(`could not save version 1: ${saved.status} ${await saved.text()}`);
      return id!;
    }),
    jobId: once(async () => {
      const [row] = await sql<{ id: string }[]>`
        insert into job_runs (workspace_id, kind, status, input, finished_at)
        values (${larkspurId}, 'authz-matrix', 'succeeded', ${sql.json({})}, now()) returning id`;
      return row.id;
    }),
  };
});

afterAll(async () => {
  // Leave the shared test database as the seed made it: throwaway members, their and our tokens go.
  if (!sql) return;
  await sql`delete from "user" where email like 'matrix-%@larkspur.example'`;
  await sql`delete from api_tokens where name like 'authz matrix%'`;
  // Copies of the draft fit that are still drafts or in review (retired ones are frozen by design).
  await sql`delete from fits where name like '%(authz matrix copy)' and status in ('draft', 'in_review')`.catch(() => {});
  await sql.end();
});

async function call(entry: RouteCase, caller: Caller | null) {
  const target = entry.path ? await entry.path(fx, caller ?? larkspurCallers[0]) : entry.route;
  const body = typeof entry.body === "function" ? await (entry.body as (f: Fixtures) => unknown)(fx) : entry.body;
  const response = await api(target, { method: entry.method, token: caller ? fx.token(caller.email) : undefined, json: body });
  const text = await response.text();
  return { status: response.status, text: text.slice(0, 300) };
}

// --- the matrix ---------------------------------------------------------------------------------------

test("every API route (app/api and pages/api) has a line in the matrix", () => {
  const listed = routes.map((entry) => `${entry.method} ${entry.route}`).sort();
  const onDisk = discoverRoutes();
  expect(onDisk.filter((route) => !listed.includes(route)), "route handlers missing from the authz matrix").toEqual([]);
  expect(listed.filter((route) => !onDisk.includes(route)), "matrix lines for routes that no longer exist").toEqual([]);
});

describe.each(routes.map((entry) => [`${entry.method} ${entry.route}`, entry] as const))("%s", (_name, entry) => {
  const hasObject = /\[[^\]]+\]/.test(entry.route) && !entry.route.includes("[...");

  if (entry.who === "public") {
    test(`anyone, without credentials → ${okStatuses(entry).join("/")}`, async () => {
      const { status, text } = await call(entry, null);
      expect(okStatuses(entry), text).toContain(status);
    });
    return;
  }

  test("no credentials → 401", async () => {
    const { status, text } = await call(entry, null);
    expect(status, text).toBe(401);
    expect(JSON.parse(text)).toMatchObject({ error: expect.any(String), details: [] });
  });

  test.each(larkspurCallers.map((caller) => [caller.label, caller] as const))("%s", async (_label, caller) => {
    const { status, text } = await call(entry, caller);
    if (allowed(entry, caller)) expect(okStatuses(entry), `${caller.label}: ${text}`).toContain(status);
    else expect(status, `${caller.label}: ${text}`).toBe(403);
  });

  if (hasObject && entry.foreign !== false) {
    test("a caller from another workspace (holding every role) → 404", async () => {
      const { status, text } = await call(entry, foreignCaller);
      expect(status, text).toBe(404);
    });
  }
});

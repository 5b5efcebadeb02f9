// Property-based fuzzing (fast-check) of every JSON route handler that changes data (POST/PUT/PATCH/DELETE
// under app/api and pages/api, found on disk like the authorization matrix does), through HTTP against the running app,
// as a Larkspur member holding every role (Bearer token), so each request gets past 401/403 to the body.
// Bodies: random JSON of every top-level type, malformed and truncated JSON, one field of a valid body
// replaced by a value of another type, deep nesting (arrays and objects, 1,000 to 100,000 levels, whole
// body or one field), extreme numbers (±1e308, 1e400 = Infinity, 2^53 + 1, 5e-324, -0), invalid UTF-8,
// the wrong Content-Type, random path segments, and bodies over the route's limit (with and without
// Content-Length: exactly 413). Properties: never a 5xx, errors in the standard shape, and no change in
// the database: every table's row count and an order-independent checksum of its rows are equal before
// and after each route's fuzzing. Excluded from the checksum: `api_tokens.last_used_at` (authentication
// stamps it on every call, legitimately), `local_mail` (written by the SMTP sink process), the pg-boss
// queue schema (the worker's own bookkeeping) and job_runs rows of earlier tests still running when the
// fuzzing starts (the worker updates them; new job rows are still caught). Two handlers are not JSON and are not fuzzed here: POST
// /api/datasets (a CSV upload: the CSV reader is fuzzed in tests/unit/fuzz and tests/unit/datasets) and
// Auth.js's POST /api/auth/[...nextauth] (form posts with its own CSRF check).
//
// Deterministic: a fixed seed (FUZZ_SEED to change it) and a bounded number of runs per route (FUZZ_RUNS,
// default 50) keep the whole file well under two minutes (about 10–40 s on these machines).
import { readFileSync } from "node:fs";
import { request as httpRequest } from "node:http";
import fc from "fast-check";
import type postgres from "postgres";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { url } from "./support/env";
import { discoverRoutes, routeSourceFile } from "./support/routes";
import { api, createTokenFor, testDatabase } from "./support/sign-in";

const SEED = Number(process.env.FUZZ_SEED ?? 20261201);
const RUNS = Number(process.env.FUZZ_RUNS ?? 50);
const FUZZ_EMAIL = `fuzz-${Date.now().toString(36)}@larkspur.example`;

type Method = "POST" | "PUT" | "PATCH" | "DELETE";
type Fixtures = {
  datasetId: string;
  approvedFitId: string;
  draftFitId: string;
  scenarioId: string;
  baseline: { allocation: Record<string, number>; controls: Record<string, number>; horizon: number; total: number };
};
type Entry = {
  method: Method;
  route: string;
  /** The path to call: a real object where the body can reach code past validation, else one that does not exist. */
  path: (fx: Fixtures) => string;
  /** A valid body (mutated one field at a time into an invalid one). */
  sample: (fx: Fixtures) => Record<string, unknown>;
  /** Also send valid-shaped bodies with extreme numbers (routes that change nothing even when they accept them). */
  extremeNumbers?: (fx: Fixtures, n: (a: fc.Arbitrary<number>) => fc.Arbitrary<unknown>) => fc.Arbitrary<unknown>;
};

const none = "00000000-0000-4000-8000-000000000000"; // a uuid no object has

const routes: Entry[] = [
  {
    method: "POST",
    route: "/api/comparisons",
    path: () => "/api/comparisons",
    sample: (fx) => ({ name: "Fuzz", versions: [{ scenarioId: fx.scenarioId, version: 1 }, { scenarioId: fx.scenarioId, version: 1 }], baseline: 0 }),
  },
  { method: "POST", route: "/api/comparisons/[id]/share", path: () => `/api/comparisons/${none}/share`, sample: () => ({ recipients: ["finance@larkspur.example"], note: "fuzz" }) },
  {
    method: "PUT",
    route: "/api/datasets/[id]/roles",
    path: (fx) => `/api/datasets/${fx.datasetId}/roles`,
    sample: () => ({ roles: { week: { role: "period" }, sales: { role: "outcome", unit: "EUR" } }, missingPolicy: "reject" }),
  },
  {
    method: "POST",
    route: "/api/fits",
    path: () => "/api/fits",
    sample: (fx) => ({ datasetId: fx.datasetId, outcome: "sales", terms: ["search", { column: "social", transform: "log1p" }], intercept: true, level: 0.95 }),
  },
  {
    method: "PUT",
    route: "/api/fits/[id]",
    path: (fx) => `/api/fits/${fx.draftFitId}`,
    sample: (fx) => ({ datasetId: fx.datasetId, outcome: "sales", terms: ["search"], intercept: true, level: 0.9 }),
  },
  {
    method: "POST",
    route: "/api/fits/[id]/predict",
    path: (fx) => `/api/fits/${fx.approvedFitId}/predict`,
    sample: (fx) => ({ allocation: fx.baseline.allocation, controls: fx.baseline.controls, horizon: fx.baseline.horizon, level: 0.9 }),
    // Read-only: any plan may be accepted (200); none may crash it.
    extremeNumbers: (fx, n) =>
      fc.record({
        allocation: fc.record(Object.fromEntries(Object.keys(fx.baseline.allocation).map((k) => [k, n(fc.double())]))),
        controls: fc.record(Object.fromEntries(Object.keys(fx.baseline.controls).map((k) => [k, n(fc.double())]))),
        horizon: n(fc.integer({ min: -5, max: 600 })),
        level: n(fc.double({ min: 0, max: 1 })),
      }),
  },
  {
    method: "POST",
    route: "/api/fits/[id]/suggest",
    path: (fx) => `/api/fits/${fx.approvedFitId}/suggest`,
    sample: (fx) => ({ allocation: fx.baseline.allocation, controls: fx.baseline.controls, horizon: fx.baseline.horizon, mode: "fixed", total: fx.baseline.total }),
    // Nothing is saved: any plan may be accepted (200); none may crash it.
    extremeNumbers: (fx, n) =>
      fc.record({
        allocation: fc.record(Object.fromEntries(Object.keys(fx.baseline.allocation).map((k) => [k, n(fc.double({ min: 0, max: 1e7 }))]))),
        controls: fc.record(Object.fromEntries(Object.keys(fx.baseline.controls).map((k) => [k, n(fc.double({ min: 0, max: 10 }))]))),
        horizon: n(fc.integer({ min: -5, max: 600 })),
        mode: fc.constant("fixed"),
        total: n(fc.double({ min: 0, max: 1e8 })),
        floors: fc.record(Object.fromEntries(Object.keys(fx.baseline.allocation).slice(0, 2).map((k) => [k, n(fc.double({ min: 0, max: 1e6 }))]))),
      }),
  },
  { method: "POST", route: "/api/fits/[id]/retire", path: () => `/api/fits/${none}/retire`, sample: () => ({ comment: "fuzz" }) },
  { method: "POST", route: "/api/fits/[id]/review", path: (fx) => `/api/fits/${fx.approvedFitId}/review`, sample: () => ({ decision: "approve", comment: "fuzz" }) },
  { method: "POST", route: "/api/fits/[id]/submit", path: () => `/api/fits/${none}/submit`, sample: () => ({ comment: "fuzz" }) },
  // The fuzzing member has no notifications: even an accepted body changes nothing.
  { method: "POST", route: "/api/notifications/read", path: () => "/api/notifications/read", sample: () => ({ all: true }) },
  { method: "POST", route: "/api/scenarios", path: () => "/api/scenarios", sample: (fx) => ({ fitId: fx.approvedFitId, name: "Fuzz scenario", horizon: 13 }) },
  {
    method: "POST",
    route: "/api/scenarios/[id]/versions",
    path: (fx) => `/api/scenarios/${fx.scenarioId}/versions`,
    // baseVersion 0 is stale (version 1 exists): a plan that passes every check still gets 409, never stored.
    sample: (fx) => ({ baseVersion: 0, mode: "fixed", ...fx.baseline, note: "fuzz" }),
    extremeNumbers: (fx, n) =>
      fc.record({
        baseVersion: fc.constantFrom(0, 0, 0, 1e308, -1, 2 ** 53 + 1),
        mode: fc.constantFrom("fixed", "growing"),
        allocation: fc.record(Object.fromEntries(Object.keys(fx.baseline.allocation).map((k) => [k, n(fc.double())]))),
        controls: fc.record(Object.fromEntries(Object.keys(fx.baseline.controls).map((k) => [k, n(fc.double())]))),
        horizon: n(fc.integer({ min: -5, max: 600 })),
        total: n(fc.double()),
        ceiling: n(fc.double()),
        settings: fc.record(Object.fromEntries(Object.keys(fx.baseline.allocation).slice(0, 2).map((k) => [k, fc.record({ locked: fc.boolean(), floorCents: n(fc.integer()), ceilingCents: n(fc.integer()) })]))),
      }),
  },
  { method: "POST", route: "/api/scenarios/[id]/versions/[n]/comments", path: (fx) => `/api/scenarios/${fx.scenarioId}/versions/1/comments`, sample: () => ({ body: "fuzz" }) },
  { method: "POST", route: "/api/scenarios/[id]/versions/[n]/share", path: (fx) => `/api/scenarios/${fx.scenarioId}/versions/1/share`, sample: () => ({ recipients: ["finance@larkspur.example"], acknowledgement: "ok" }) },
  { method: "POST", route: "/api/scenarios/[id]/versions/[n]/signoff", path: (fx) => `/api/scenarios/${fx.scenarioId}/versions/1/signoff`, sample: () => ({ decision: "signed_off" }) },
  { method: "POST", route: "/api/tokens", path: () => "/api/tokens", sample: () => ({ name: "fuzz", expiresAt: "2099-01-01" }) },
  { method: "DELETE", route: "/api/tokens/[id]", path: () => `/api/tokens/${none}`, sample: () => ({}) },
  { method: "PATCH", route: "/api/workspace", path: () => "/api/workspace", sample: () => ({ currency: "EUR", locale: "en-IE", name: "Larkspur Outfitters" }) },
  { method: "PATCH", route: "/api/workspace/members/[userId]", path: () => "/api/workspace/members/no-such-member", sample: () => ({ roles: ["analyst"] }) },
  { method: "DELETE", route: "/api/workspace/members/[userId]", path: () => "/api/workspace/members/no-such-member", sample: () => ({}) },
];
const notJson = ["POST /api/auth/[...nextauth]", "POST /api/datasets"];

// --- discovery: support/routes.ts -------------------------------------------------------------------------

const discoverMutations = () => discoverRoutes(["POST", "PUT", "PATCH", "DELETE"]);


/** The route's body limit: its `maxBodyBytes`, else the wrapper's default (1 MB). */
function bodyLimit(route: string): number {
  const source = readFileSync(routeSourceFile(route), "utf8");
  const match = /maxBodyBytes:\s*([\d_]+)/.exec(source);
  return match ? Number(match[1].replaceAll("_", "")) : 1_000_000;
}

// --- the database, before and after -------------------------------------------------------------------

let sql: postgres.Sql;
let token: string;
let fx: Fixtures;

/** Jobs still queued or running when the fuzzing starts (left by earlier tests): the worker may change them. */
let busyJobIds: string[] = [];

async function snapshot(): Promise<Record<string, string>> {
  const tables = await sql<{ name: string }[]>`
    select quote_ident(table_name) as name from information_schema.tables
    where table_schema = 'public' and table_type = 'BASE TABLE' and table_name <> 'local_mail' order by table_name`;
  const result: Record<string, string> = {};
  for (const { name } of tables) {
    const busy = name === "job_runs" && busyJobIds.length > 0 ? `where not (t.id = any('{${busyJobIds.join(",")}}'::uuid[]))` : "";
    const [row] = await sql.unsafe<{ n: string; sum: string }[]>(
      `select count(*)::text as n, coalesce(sum(hashtextextended((to_jsonb(t) - 'last_used_at')::text, 0)::numeric), 0)::text as sum from public.${name} t ${busy}`,
    );
    result[name] = `${row.n} rows, checksum ${row.sum}`;
  }
  return result;
}

/** Waits (at most 20 s) for earlier tests' background jobs; those still busy then are left out of the checksum. */
async function settleJobs(): Promise<void> {
  for (let i = 0; i < 40; i++) {
    const rows = await sql<{ id: string }[]>`select id from job_runs where status in ('queued', 'running')`;
    busyJobIds = rows.map((row) => row.id);
    if (busyJobIds.length === 0) return;
    await new Promise((resolve) => setTimeout(resolve, 500));
  }
  console.log(`[fuzz] ${busyJobIds.length} background job(s) of earlier tests still busy: left out of the job_runs checksum`);
}

beforeAll(async () => {
  sql = testDatabase();
  const [{ id: workspaceId }] = await sql<{ id: string }[]>`select id from workspaces where slug = 'larkspur'`;
  const userId = crypto.randomUUID();
  await sql`insert into "user" (id, email, name) values (${userId}, ${FUZZ_EMAIL}, 'Fuzz Every Role')`;
  await sql`insert into memberships (workspace_id, user_id, roles) values (${workspaceId}, ${userId}, ${["admin", "analyst", "reviewer", "planner", "finance"]})`;
  token = (await createTokenFor(sql, FUZZ_EMAIL, "larkspur", "fuzz")).token;
  const first = async (query: Promise<{ id: string }[]>, what: string) => {
    const [row] = await query;
    if (!row) throw new Error(`the seed has no ${what}`);
    return row.id;
  };
  const datasetId = await first(sql`select id from datasets where workspace_id = ${workspaceId} order by uploaded_at limit 1`, "dataset");
  const approvedFitId = await first(sql`select id from fits where workspace_id = ${workspaceId} and status = 'approved' order by approved_at limit 1`, "approved fit");
  const draftFitId = await first(sql`select id from fits where workspace_id = ${workspaceId} and status = 'draft' order by created_at limit 1`, "draft fit");
  const created = await api("/api/scenarios", { method: "POST", token, json: { fitId: approvedFitId, name: "Fuzz target" } });
  const body = (await created.json()) as { id?: string; scenario?: { id: string } };
  if (created.status !== 201) throw new Error(`could not start a scenario: ${created.status} ${JSON.stringify(body)}`);
  const scenarioId = (body.id ?? body.scenario?.id)!;
  const { baseline } = (await (await api(`/api/scenarios/${scenarioId}`, { token })).json()) as Pick<Fixtures, "baseline">;
  const saved = await api(`/api/scenarios/${scenarioId}/versions`, { method: "POST", token, json: { baseVersion: 0, mode: "fixed", ...baseline, note: "fuzz v1" } });
  if (saved.status !== 201) throw new Error(`could not save version 1: ${saved.status} ${await saved.text()}`);
  fx = { datasetId, approvedFitId, draftFitId, scenarioId, baseline };
  await settleJobs();
});

afterAll(async () => {
  if (!sql) return;
  // The fuzzing member's admin role must go whatever else fails: later tests rely on Larkspur's one admin.
  await sql`delete from memberships where user_id in (select id from "user" where email = ${FUZZ_EMAIL})`;
  // Best effort: the fuzzing member and what it made before the fuzzing (its scenario and version 1).
  await sql`delete from scenarios where id = ${fx?.scenarioId ?? none}`.catch(() => {});
  await sql`delete from api_tokens where name = 'fuzz'`.catch(() => {});
  await sql`delete from "user" where email = ${FUZZ_EMAIL}`.catch(() => {});
  await sql.end();
});

// --- requests -----------------------------------------------------------------------------------------

type Sent = { body: string | Uint8Array | ReadableStream<Uint8Array> | null; contentType?: string | null; path?: string; label: string };

async function send(entry: Entry, sent: Sent): Promise<{ status: number; text: string }> {
  const headers: Record<string, string> = { authorization: `Bearer ${token}` };
  if (sent.contentType !== null) headers["content-type"] = sent.contentType ?? "application/json";
  const response = await fetch(url(sent.path ?? entry.path(fx)), {
    method: entry.method,
    headers,
    body: sent.body,
    redirect: "manual",
    ...(sent.body instanceof ReadableStream ? { duplex: "half" } : {}),
  } as RequestInit);
  return { status: response.status, text: await response.text() };
}

/**
 * A body over the limit, on a connection of its own (node:http, no keep-alive pool). With Content-Length the
 * server must refuse it from the header alone: only the headers are sent. Without (chunked) it can only
 * count while reading: exactly limit + 1 bytes are sent, one piece after the other, and then nothing more,
 * so when the server answers 413 it has read everything sent (no unread bytes: no reset that could swallow
 * the answer). DELETE handlers read no body: headers only.
 */
function oversized(entry: Entry, declaredBytes: number, chunked: boolean): Promise<{ status: number; text: string }> {
  return new Promise((resolve, reject) => {
    const request = httpRequest(url(entry.path(fx)), {
      method: entry.method,
      agent: false,
      headers: { authorization: `Bearer ${token}`, "content-type": "application/json", ...(chunked ? {} : { "content-length": String(declaredBytes) }) },
    });
    let answered = false;
    const timer = setTimeout(() => {
      request.destroy();
      reject(new Error(`no answer within 30 s to ${chunked ? "a streamed" : "a declared"} body of ${declaredBytes} bytes`));
    }, 30_000);
    request.on("response", (response) => {
      answered = true;
      let text = "";
      response.setEncoding("utf8");
      response.on("data", (part: string) => (text += part));
      const done = () => {
        clearTimeout(timer);
        request.destroy();
        resolve({ status: response.statusCode ?? 0, text: text.slice(0, 300) });
      };
      response.on("end", done);
      response.on("error", done);
    });
    request.on("error", () => {}); // the answer (or the timeout) decides
    request.flushHeaders();
    if (!chunked || entry.method === "DELETE") return;
    const total = bodyLimit(entry.route) + 1;
    let sent = 0;
    const next = () => {
      if (answered || sent >= total) return;
      const size = Math.min(16 * 1024, total - sent);
      sent += size;
      request.write(Buffer.alloc(size, 0x78), () => setImmediate(next));
    };
    next();
  });
}

function expectClientError(entry: Entry, sent: Sent, result: { status: number; text: string }, accepted: number[] = []) {
  const where = `${entry.method} ${entry.route} with ${sent.label}: ${result.status} ${result.text.slice(0, 500)}`;
  expect(result.status, where).toBeLessThan(500);
  if (accepted.includes(result.status)) return;
  expect(result.status, where).toBeGreaterThanOrEqual(400);
  // A path that matches no route at all gets Next's own 404 page; everything our wrapper answers is JSON.
  if (sent.path && result.status === 404 && !result.text.startsWith("{")) return;
  expect(JSON.parse(result.text), where).toMatchObject({ error: expect.any(String), details: expect.any(Array) });
}

// --- arbitraries --------------------------------------------------------------------------------------

const extreme = fc.constantFrom(1e308, -1e308, Number.MAX_VALUE, Number.MIN_VALUE, 2 ** 53 + 1, -(2 ** 53 + 1), -0, 0, 1e-320, 123456789012.345);
/** A number arbitrary widened with extremes (as JS numbers: JSON.stringify turns non-finite ones into null). */
const withExtremes = (a: fc.Arbitrary<number>) => fc.oneof(a, extreme);

/** A value of a different JSON type than `value` (so the field is invalid whatever its schema accepts of that type). */
function otherType(value: unknown): fc.Arbitrary<unknown> {
  const kinds: Record<string, fc.Arbitrary<unknown>> = {
    string: fc.string({ maxLength: 20 }),
    number: fc.oneof(fc.integer(), fc.double({ noNaN: true, noDefaultInfinity: true }), extreme),
    boolean: fc.boolean(),
    array: fc.array(fc.jsonValue({ maxDepth: 2 }), { maxLength: 4 }),
    object: fc.dictionary(fc.string({ maxLength: 8 }), fc.jsonValue({ maxDepth: 2 }), { maxKeys: 3 }),
    // (never null: some fields are nullable, and null would make the body valid)
  };
  const kind = value === null ? "null" : Array.isArray(value) ? "array" : typeof value;
  return fc.oneof(...Object.entries(kinds).filter(([name]) => name !== kind).map(([, arb]) => arb));
}

const deep = (depth: number, shape: "array" | "object") => (shape === "array" ? "[".repeat(depth) + "]".repeat(depth) : '{"a":'.repeat(depth) + "1" + "}".repeat(depth));

function bodies(entry: Entry): fc.Arbitrary<Sent> {
  const sample = entry.sample(fx);
  const keys = Object.keys(sample);
  const json = (value: unknown, label: string): Sent => ({ body: JSON.stringify(value), label });
  const arbitraries: fc.Arbitrary<Sent>[] = [
    // random JSON of any top-level type except objects the schema might accept (objects come below)
    fc.oneof(fc.array(fc.jsonValue({ maxDepth: 3 }), { maxLength: 5 }), fc.string(), fc.double({ noNaN: true }), fc.boolean(), fc.constant(null)).map((v) => json(v, `JSON ${JSON.stringify(v).slice(0, 60)}`)),
    // random objects with random keys (never empty: `{}` is a valid body for some routes)
    fc.dictionary(fc.string({ minLength: 1, maxLength: 10 }), fc.jsonValue({ maxDepth: 3 }), { minKeys: 1, maxKeys: 5 })
      .filter((o) => !Object.keys(o).some((k) => keys.includes(k)))
      .map((o) => json(o, `object ${JSON.stringify(o).slice(0, 60)}`)),
    // malformed JSON: random text, truncations of the valid body, classic mistakes
    fc.string({ minLength: 1, maxLength: 200, unit: "binary" }).filter((text) => {
      try {
        JSON.parse(text);
        return false;
      } catch {
        return true;
      }
    }).map((text) => ({ body: text, label: `text ${JSON.stringify(text).slice(0, 60)}` })),
    fc.integer({ min: 1, max: Math.max(1, JSON.stringify(sample).length - 1) }).map((cut) => ({ body: JSON.stringify(sample).slice(0, cut), label: `valid body cut at ${cut}` })),
    fc.constantFrom("{", "[", '{"a":', "{'a':1}", '{"a":1,}', "NaN", "undefined", "\u0000", '{"__proto__":{"x":1}', "\uFEFF{}").map((text) => ({ body: text, label: `text ${JSON.stringify(text)}` })),
    // one field of the valid body with a value of another type
    ...(keys.length
      ? [
          fc.constantFrom(...keys).chain((key) => otherType(sample[key]).map((value) => json({ ...sample, [key]: value }, `${key} = ${JSON.stringify(value)?.slice(0, 60)}`))),
          // huge numbers as JSON text (1e400 parses to Infinity) in the place of one field
          fc.tuple(fc.constantFrom(...keys), fc.constantFrom("1e400", "-1e400", "1e308", "123456789012345678901234567890", "-0", "5e-324")).map(([key, number]) => ({
            body: JSON.stringify({ ...sample, [key]: "__N__" }).replace('"__N__"', number),
            label: `${key} = ${number} (as JSON text)`,
          })),
          // deep nesting in one field
          fc.tuple(fc.constantFrom(...keys), fc.constantFrom(1_000, 10_000), fc.constantFrom("array" as const, "object" as const)).map(([key, depth, shape]) => ({
            body: JSON.stringify({ ...sample, [key]: "__D__" }).replace('"__D__"', deep(depth, shape)),
            label: `${key} nested ${depth} ${shape}s deep`,
          })),
        ]
      : []),
    // deep nesting as the whole body
    fc.tuple(fc.constantFrom(1_000, 10_000, 100_000), fc.constantFrom("array" as const, "object" as const)).map(([depth, shape]) => ({ body: deep(depth, shape), label: `body nested ${depth} ${shape}s deep` })),
    // the valid body under the wrong Content-Type (or none)
    fc.constantFrom("text/plain", "application/x-www-form-urlencoded", "multipart/form-data; boundary=x", null).map((contentType) => ({
      body: JSON.stringify(sample),
      contentType,
      label: `valid body as ${contentType ?? "no Content-Type"}`,
    })),
    // invalid UTF-8 inside a string
    fc.constantFrom(...keys.length ? keys : ["x"]).map((key) => {
      const text = JSON.stringify({ ...sample, [key]: "__U__" });
      const [before, after] = text.split('"__U__"');
      return { body: new Uint8Array([...Buffer.from(`${before}"`), 0xff, 0xfe, 0xc3, ...Buffer.from(`"${after}`)]), label: `${key} with invalid UTF-8` };
    }),
    // random path segments (bodies stay invalid)
    ...(/\[/.test(entry.route)
      ? [
          fc.tuple(fc.oneof(fc.string({ minLength: 1, maxLength: 40 }), fc.constantFrom("1e400", "-1", "0", "99999999999999999999", "%00", "null", "undefined", "x".repeat(300))), fc.jsonValue({ maxDepth: 1 }))
            .filter(([segment]) => !/^\.+$/.test(segment) && segment.trim() !== "")
            .map(([segment, value]) => {
              const encoded = encodeURIComponent(segment);
              let replaced = false;
              // replace the route's last parameter segment with the random one
              const parts = entry.path(fx).split("/");
              const routeParts = entry.route.split("/");
              for (let i = routeParts.length - 1; i >= 0 && !replaced; i--) {
                if (routeParts[i].startsWith("[")) {
                  parts[i] = encoded;
                  replaced = true;
                }
              }
              return { body: JSON.stringify(Array.isArray(value) ? value : [value]), path: parts.join("/"), label: `path segment ${JSON.stringify(segment).slice(0, 40)}` };
            }),
        ]
      : []),
  ];
  return fc.oneof(...arbitraries);
}

// --- the properties -----------------------------------------------------------------------------------

test("every data-changing API route (app/api, pages/api) is fuzzed here (or named as not JSON)", () => {
  const listed = [...routes.map((e) => `${e.method} ${e.route}`), ...notJson].sort();
  expect(discoverMutations().filter((route) => !listed.includes(route)), "routes missing from the fuzz table").toEqual([]);
  expect(listed.filter((route) => !discoverMutations().includes(route)), "fuzz lines for routes that no longer exist").toEqual([]);
});

describe.each(routes.map((entry) => [`${entry.method} ${entry.route}`, entry] as const))("%s", (_name, entry) => {
  test("random, malformed, mistyped, deeply nested and oversized bodies: never a 5xx, the database unchanged", async () => {
    const before = await snapshot();
    const seen = new Map<number, number>();
    await fc.assert(
      fc.asyncProperty(bodies(entry), async (sent) => {
        const result = await send(entry, sent);
        seen.set(result.status, (seen.get(result.status) ?? 0) + 1);
        expectClientError(entry, sent, result);
      }),
      { seed: SEED, numRuns: RUNS, endOnFailure: true },
    );
    if (entry.extremeNumbers) {
      const accepted = [200, 409];
      await fc.assert(
        fc.asyncProperty(entry.extremeNumbers(fx, withExtremes), async (value) => {
          const sent = { body: JSON.stringify(value), label: `extreme numbers ${JSON.stringify(value).slice(0, 200)}` };
          const result = await send(entry, sent);
          seen.set(result.status, (seen.get(result.status) ?? 0) + 1);
          expectClientError(entry, sent, result, accepted);
        }),
        { seed: SEED, numRuns: RUNS, endOnFailure: true },
      );
    }
    // Over the limit: with Content-Length (refused before reading) and streamed without it (counted while reading).
    const limit = bodyLimit(entry.route);
    for (const chunked of [false, true]) {
      const result = await oversized(entry, limit + 1024, chunked);
      const where = `${entry.method} ${entry.route} with ${chunked ? `${limit + 1} bytes streamed without Content-Length` : `Content-Length ${limit + 1024}`}: ${result.status} ${result.text}`;
      // DELETE handlers read no body (404 for the missing object); everyone else refuses it.
      if (entry.method !== "DELETE") expect(result.status, where).toBe(413);
      expect(result.status, where).toBeLessThan(500);
    }

    const after = await snapshot();
    const changed = Object.keys({ ...before, ...after }).filter((table) => before[table] !== after[table]);
    expect(changed.map((table) => `${table}: ${before[table]} → ${after[table]}`), `statuses seen: ${JSON.stringify(Object.fromEntries(seen))}`).toEqual([]);
  }, 120_000);
});

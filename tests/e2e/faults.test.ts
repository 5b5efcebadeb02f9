// Faults against real processes, on a Tributary of its own (tests/e2e/faults-stack.ts: its own PostgreSQL
// cluster and its own `next start` of the build under test, on free ports), so stopping the database or
// killing the web server never disturbs the other browser tests, whatever order vitest runs the files in.
//
// 1. PostgreSQL stopped while the app serves → /api/health and data routes answer 503 with the standard
//    error body (never 500, never a hang); PostgreSQL started again → the same app process (same pid)
//    answers 200 and saves again, without a restart.
// 2. The web server SIGKILLed while many scenario versions are being saved → afterwards every version
//    exists whole or not at all: numbering 1..n without gaps, every field present, exactly one audit entry
//    per version (written in the same transaction), every acknowledged (201) save present; and saving goes
//    on after a restart.
import { createHash, randomBytes } from "node:crypto";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { startOwnStack, type OwnStack } from "./faults-stack";

let stack: OwnStack;
let token: string;
let fitId: string;

type Baseline = { allocation: Record<string, number>; controls: Record<string, number>; horizon: number; total: number };

function call(path: string, init: { method?: string; json?: unknown } = {}) {
  return fetch(new URL(path, stack.baseUrl), {
    method: init.method ?? "GET",
    headers: { authorization: `Bearer ${token}`, ...(init.json === undefined ? {} : { "content-type": "application/json" }) },
    body: init.json === undefined ? undefined : JSON.stringify(init.json),
    redirect: "manual",
    // A database outage must give a quick answer, not a hanging request.
    signal: AbortSignal.timeout(30_000),
  });
}

async function startScenario(name: string): Promise<{ id: string; baseline: Baseline }> {
  const created = await call("/api/scenarios", { method: "POST", json: { fitId, name } });
  const body = (await created.json()) as { id?: string; scenario?: { id: string } };
  expect(created.status, JSON.stringify(body)).toBe(201);
  const id = (body.id ?? body.scenario?.id)!;
  const { baseline } = (await (await call(`/api/scenarios/${id}`)).json()) as { baseline: Baseline };
  return { id, baseline };
}

const saveBody = (baseline: Baseline, baseVersion: number, note: string) => ({
  baseVersion,
  mode: "fixed",
  allocation: baseline.allocation,
  controls: baseline.controls,
  horizon: baseline.horizon,
  total: baseline.total,
  note,
});

beforeAll(async () => {
  stack = await startOwnStack();
  token = `trib_${randomBytes(32).toString("base64url")}`;
  await stack.sql`
    insert into api_tokens (workspace_id, user_id, name, token_hash, prefix)
    select m.workspace_id, m.user_id, 'faults', ${createHash("sha256").update(token).digest("hex")}, ${token.slice(0, 9)}
    from memberships m join "user" u on u.id = m.user_id join workspaces w on w.id = m.workspace_id
    where u.email = 'planner@larkspur.example' and w.slug = 'larkspur'`;
  const [fit] = await stack.sql<{ id: string }[]>`
    select f.id from fits f join workspaces w on w.id = f.workspace_id where w.slug = 'larkspur' and f.status = 'approved' limit 1`;
  fitId = fit.id;
}, 300_000);

afterAll(async () => {
  await stack?.stop();
}, 120_000);

describe("PostgreSQL stops while the app serves", () => {
  test("health and data routes answer 503 (not 500) while it is down, and the same app process recovers by itself once it is back", async () => {
    const { id, baseline } = await startScenario("Outage scenario");
    expect((await call("/api/health")).status).toBe(200);
    const pidBefore = stack.webPid();
    // The caller's identity is still in the 5-second actor cache at first: these fail on their own queries.
    const reads = ["/api/scenarios", `/api/scenarios/${id}`, `/api/scenarios/${id}/versions`, `/api/fits/${fitId}`];

    await stack.stopDatabase();
    let databaseDown = true;
    try {
      const health = await call("/api/health");
      expect(health.status).toBe(503);
      expect(await health.json()).toMatchObject({ status: "unavailable", db: "unreachable" });
      for (const path of reads) {
        const response = await call(path);
        const body = await response.json();
        expect(response.status, `${path}: ${JSON.stringify(body)}`).toBe(503);
        expect(body).toEqual({ error: expect.stringMatching(/database/i), details: [] });
        expect(response.headers.get("retry-after")).toBe("5");
      }
      const save = await call(`/api/scenarios/${id}/versions`, { method: "POST", json: saveBody(baseline, 0, "while the database is down") });
      expect(save.status, await save.text()).toBe(503);
      // Once the cache has expired, checking the token itself needs the database: 503 too, never 401.
      await new Promise((resolve) => setTimeout(resolve, 5_500));
      const me = await call("/api/me");
      expect(me.status, await me.clone().text()).toBe(503);
      expect(await me.json()).toEqual({ error: expect.stringMatching(/database/i), details: [] });

      await stack.startDatabase();
      databaseDown = false;
    } finally {
      if (databaseDown) await stack.startDatabase(); // leave it running for the next test
    }

    // No restart of the app: its pool reconnects on the next query.
    let status = 0;
    for (let attempt = 0; attempt < 60 && status !== 200; attempt++) {
      status = (await call("/api/health")).status;
      if (status !== 200) await new Promise((resolve) => setTimeout(resolve, 500));
    }
    expect(status).toBe(200);
    for (const path of [...reads, "/api/me"]) expect((await call(path)).status, path).toBe(200);
    const saved = await call(`/api/scenarios/${id}/versions`, { method: "POST", json: saveBody(baseline, 0, "after the outage") });
    expect(saved.status, await saved.text()).toBe(201);
    expect(stack.webPid()).toBe(pidBefore);
    const [{ n }] = await stack.sql<{ n: number }[]>`select count(*)::int as n from scenario_versions where scenario_id = ${id}`;
    expect(n).toBe(1); // the save refused during the outage left nothing behind
  }, 180_000);
});

describe("the web server is killed (SIGKILL) during saves", () => {
  test("every version exists whole or not at all: gapless numbering, all fields, one audit entry each, every acknowledged save kept", async () => {
    const scenarios = [];
    for (let i = 0; i < 10; i++) scenarios.push(await startScenario(`Kill scenario ${i}`));
    const acknowledged: { scenarioId: string; number: number; note: string }[] = [];
    let inFlight = 0;
    let inFlightAtKill = -1;
    let killed = false;
    let failure: unknown = null;

    // Each scenario saves version after version as fast as the server answers, until the server is gone.
    const chains = scenarios.map(async ({ id, baseline }) => {
      for (let base = 0; ; base++) {
        const note = `kill test ${id.slice(0, 8)} v${base + 1}`;
        inFlight += 1;
        try {
          const response = await call(`/api/scenarios/${id}/versions`, { method: "POST", json: saveBody(baseline, base, note) });
          if (response.status !== 201) throw new Error(`save answered ${response.status}: ${await response.text()}`);
          acknowledged.push({ scenarioId: id, number: base + 1, note });
        } catch (error) {
          if (killed) return; // the connection died with the server
          throw error;
        } finally {
          inFlight -= 1;
        }
      }
    });
    const guarded = chains.map((chain) =>
      chain.catch((error: unknown) => {
        failure ??= error;
      }),
    );
    const killer = (async () => {
      while (acknowledged.length < 25 && failure === null) await new Promise((resolve) => setTimeout(resolve, 20));
      inFlightAtKill = inFlight;
      killed = true;
      stack.killWeb();
    })();
    await Promise.all([killer, ...guarded]);
    if (failure) throw failure;
    expect(inFlightAtKill, "saves in flight when the server was killed").toBeGreaterThan(0);

    const ids = scenarios.map((s) => s.id);
    const rows = await stack.sql<
      { scenarioId: string; number: number; note: string; complete: boolean; audits: number }[]
    >`
      select v.scenario_id as "scenarioId", v.number, v.note,
        (v.allocation is not null and v.allocation <> '{}'::jsonb and v.prediction ? 'horizonTotal' and v.fit_checksum <> ''
          and v.author_id is not null and v.total_cents > 0 and v.horizon_periods > 0 and v.controls is not null
          and v.mode = 'fixed' and v.note like 'kill test %') as complete,
        (select count(*)::int from audit_log a where a.object_id = v.scenario_id::text and a.action = 'scenario.version_saved'
          and (a.details->>'number')::int = v.number) as audits
      from scenario_versions v where v.scenario_id = any(${ids}::uuid[]) order by v.scenario_id, v.number`;
    for (const id of ids) {
      const numbers = rows.filter((row) => row.scenarioId === id).map((row) => row.number);
      expect(numbers, `versions of ${id}`).toEqual(numbers.map((_, index) => index + 1));
    }
    for (const row of rows) {
      expect(row.complete, `version ${row.number} of ${row.scenarioId} is complete`).toBe(true);
      expect(row.audits, `audit entries of version ${row.number} of ${row.scenarioId}`).toBe(1);
      expect(row.note).toBe(`kill test ${row.scenarioId.slice(0, 8)} v${row.number}`);
    }
    // No audit entry without its version (the pair commits together or not at all).
    const [{ orphans }] = await stack.sql<{ orphans: number }[]>`
      select count(*)::int as orphans from audit_log a
      where a.action = 'scenario.version_saved' and a.object_id = any(${ids}::text[])
        and not exists (select 1 from scenario_versions v where v.scenario_id::text = a.object_id and v.number = (a.details->>'number')::int)`;
    expect(orphans).toBe(0);
    for (const ack of acknowledged) {
      expect(rows.some((row) => row.scenarioId === ack.scenarioId && row.number === ack.number), `acknowledged v${ack.number} of ${ack.scenarioId}`).toBe(true);
    }
    // At most one save per chain was cut off: committed without its answer, or rolled back.
    expect(rows.length - acknowledged.length).toBeGreaterThanOrEqual(0);
    expect(rows.length - acknowledged.length).toBeLessThanOrEqual(ids.length);

    // A new server process takes over; the next save of each scenario follows its last version.
    await stack.startWeb();
    for (const { id, baseline } of scenarios.slice(0, 3)) {
      const latest = rows.filter((row) => row.scenarioId === id).length;
      const response = await call(`/api/scenarios/${id}/versions`, { method: "POST", json: saveBody(baseline, latest, `kill test ${id.slice(0, 8)} v${latest + 1}`) });
      expect(response.status, await response.text()).toBe(201);
    }
    console.log(`[faults] SIGKILL with ${inFlightAtKill} saves in flight; ${acknowledged.length} acknowledged, ${rows.length} stored, all whole`);
  }, 240_000);
});

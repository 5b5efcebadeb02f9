// 50 saves of one scenario on the same base version at once, through HTTP against the shared e2e app:
// exactly one is stored (201), the other 49 get 409 with who saved the version that now exists, and the
// version numbers stay gapless (1, 2, … with one audit entry each). Run twice: on base 0 (the first
// version) and on base 1.
import type postgres from "postgres";
import { afterAll, beforeAll, expect, test } from "vitest";
import { api, createTokenFor, testDatabase } from "./support/sign-in";

let sql: postgres.Sql;
let planner: string;
let sam: string;
let scenario: { id: string; baseline: { allocation: Record<string, number>; controls: Record<string, number>; horizon: number; total: number } };

beforeAll(async () => {
  sql = testDatabase();
  planner = (await createTokenFor(sql, "planner@larkspur.example", "larkspur", "faults concurrent saves")).token;
  sam = (await createTokenFor(sql, "sam@larkspur.example", "larkspur", "faults concurrent saves")).token;
  const [fit] = await sql<{ id: string }[]>`
    select f.id from fits f join workspaces w on w.id = f.workspace_id where w.slug = 'larkspur' and f.status = 'approved' order by f.approved_at limit 1`;
  const created = await api("/api/scenarios", { method: "POST", token: planner, json: { fitId: fit.id, name: `Concurrent saves ${Date.now()}` } });
  const body = (await created.json()) as { id?: string; scenario?: { id: string } };
  expect(created.status).toBe(201);
  const id = (body.id ?? body.scenario?.id)!;
  scenario = { id, ...((await (await api(`/api/scenarios/${id}`, { token: planner })).json()) as Pick<typeof scenario, "baseline">) };
});

afterAll(async () => {
  await sql`delete from api_tokens where name = 'faults concurrent saves'`;
  await sql.end();
});

async function raceOn(baseVersion: number) {
  const { allocation, controls, horizon, total } = scenario.baseline;
  // Two planners (half the requests each), so the 409 names whoever won.
  const responses = await Promise.all(
    Array.from({ length: 50 }, (_, i) =>
      api(`/api/scenarios/${scenario.id}/versions`, {
        method: "POST",
        token: i % 2 === 0 ? planner : sam,
        json: { baseVersion, mode: "fixed", allocation, controls, horizon, total, note: `racer ${i} on base ${baseVersion}` },
      }).then(async (response) => ({ status: response.status, body: (await response.json()) as { error?: string; details?: { path: string; latestVersion?: number }[]; number?: number } })),
    ),
  );
  return responses;
}

test.each([0, 1])("50 concurrent saves on base version %i: exactly one 201, 49 × 409, numbering gapless", async (baseVersion) => {
  const responses = await raceOn(baseVersion);
  const statuses = responses.map((r) => r.status);
  expect(statuses.filter((s) => s === 201).length, JSON.stringify(statuses)).toBe(1);
  expect(statuses.filter((s) => s === 409).length, JSON.stringify(responses.filter((r) => r.status !== 201 && r.status !== 409))).toBe(49);
  for (const conflict of responses.filter((r) => r.status === 409)) {
    expect(conflict.body.error).toMatch(new RegExp(`^Version ${baseVersion + 1} was saved by (Priya Nair|Sam Okafor) at `));
    expect(conflict.body.details?.[0]).toMatchObject({ path: "baseVersion", latestVersion: baseVersion + 1 });
  }
  const versions = await sql<{ number: number; note: string }[]>`select number, note from scenario_versions where scenario_id = ${scenario.id} order by number`;
  expect(versions.map((v) => v.number)).toEqual(Array.from({ length: baseVersion + 1 }, (_, i) => i + 1));
  expect(versions.at(-1)!.note).toMatch(new RegExp(`^racer \\d+ on base ${baseVersion}$`));
  const [{ audits }] = await sql<{ audits: number }[]>`
    select count(*)::int as audits from audit_log where action = 'scenario.version_saved' and object_id = ${scenario.id}`;
  expect(audits).toBe(baseVersion + 1);
});

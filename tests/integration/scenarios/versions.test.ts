// Scenarios and their versions against real PostgreSQL: starting from the history, saves with
// optimistic concurrency (parallel saves on one base: exactly one wins, numbering gapless),
// server-side validation that stores nothing, immutability by trigger, restore, reads and roles.
import { beforeAll, describe, expect, it } from "vitest";
import { GET as listScenarios, POST as startScenario } from "@/app/api/scenarios/route";
import { GET as getScenario } from "@/app/api/scenarios/[id]/route";
import { GET as listVersions, POST as saveVersion } from "@/app/api/scenarios/[id]/versions/route";
import { GET as getVersion } from "@/app/api/scenarios/[id]/versions/[n]/route";
import { getDatabase } from "@/db/client";
import { listAuditEventsByWorkspaceId } from "@/server/data/audit";
import { describeAuditEvent } from "@/ui/audit-event";
import { demoChannels } from "@/seed/history";
import { amountToCents } from "@/server/planning/allocation";
import { describePlanShape } from "@/server/predict/plan-shape";
import { scenarioOutcome } from "@/server/predict/scenario-outcome";
import { createApprovedDemoFit } from "./support/approved-fit";
import { apiRequest, makePlanningWorkspace, routeContext } from "./support/workspace";

type Json = Record<string, any>;
const channels = demoChannels.map((channel) => channel.column);

let setup: Awaited<ReturnType<typeof makePlanningWorkspace>>;
let other: Awaited<ReturnType<typeof makePlanningWorkspace>>;

beforeAll(async () => {
  setup = await makePlanningWorkspace({ pat: ["planner"] });
  other = await makePlanningWorkspace();
});

async function call(handler: (request: Request, context: ReturnType<typeof routeContext>) => Promise<Response>, path: string, params: Record<string, string>, init: { method?: string; json?: unknown; token?: string } = {}) {
  const response = await handler(apiRequest(path, { method: init.method ?? "GET", json: init.json, token: init.token ?? setup.members.planner.token }), routeContext(params));
  return { status: response.status, body: (await response.json()) as Json };
}

async function start(name = "Spring plan", extra: Json = {}, token?: string, fitId = setup.fit.fitId) {
  return call(startScenario, "/api/scenarios", {}, { method: "POST", json: { fitId, name, ...extra }, token });
}

function save(id: string, body: Json, token?: string) {
  return call(saveVersion, `/api/scenarios/${id}/versions`, { id }, { method: "POST", json: body, token });
}

async function versionNumbers(id: string): Promise<number[]> {
  const { sql } = getDatabase();
  const rows = await sql<{ number: number }[]>`select number from scenario_versions where scenario_id = ${id} order by number`;
  return rows.map((row) => row.number);
}

/** A fixed-total plan moving `amount` from display to search, from the scenario's baseline. */
function fixedPlan(baseline: Json, amount = 0, extra: Json = {}) {
  const allocation = { ...baseline.allocation, search_eur: baseline.allocation.search_eur + amount, display_eur: baseline.allocation.display_eur - amount };
  const total = Object.values(allocation as Record<string, number>).reduce((sum, value) => sum + amountToCents(value), 0) / 100;
  return { mode: "fixed", allocation, total, horizon: baseline.horizon, controls: baseline.controls, ...extra };
}

describe("starting a scenario", () => {
  it("defaults to 13 weeks and the spend of the most recent 13 weeks of the history, exact to the cent", async () => {
    const { status, body } = await start();
    expect(status).toBe(201);
    expect(body.horizon).toBe(13);
    expect(body.latestVersion).toBeNull();
    const last13 = setup.fit.rows.slice(-13);
    for (const channel of channels) {
      const cents = last13.reduce((sum, row) => sum + amountToCents(row[channel as keyof typeof row] as number), 0);
      expect(amountToCents(body.baseline.allocation[channel])).toBe(cents);
    }
    expect(body.baseline.controls.promo_week).toBe(last13.filter((row) => row.promo_week === 1).length);
    expect(body.baseline.description).toMatch(/^Spend of the last 13 weeks in the history \(\d{4}-\d\d-\d\d to \d{4}-\d\d-\d\d\)$/);
    expect(body.baseline.source).toBe("history");
  });

  it("takes another horizon and controls, and refuses an unknown control or a fit of another workspace", async () => {
    const { status, body } = await start("Half year", { horizon: 26, controls: { promo_week: 5 } });
    expect(status).toBe(201);
    expect(body.baseline.horizon).toBe(26);
    expect(body.baseline.controls.promo_week).toBe(5);
    expect((await start("Bad", { controls: { weather: 3 } })).status).toBe(422);
    expect((await start("Foreign", {}, undefined, other.fit.fitId)).status).toBe(404);
  });

  it("is for planners: finance and reviewers may read but not start", async () => {
    expect((await start("Finance try", {}, setup.members.finance.token)).status).toBe(403);
    expect((await start("Reviewer try", {}, setup.members.reviewer.token)).status).toBe(403);
    const list = await call(listScenarios, `/api/scenarios?fitId=${setup.fit.fitId}`, {}, { token: setup.members.finance.token });
    expect(list.status).toBe(200);
    expect(list.body.scenarios.length).toBeGreaterThanOrEqual(2);
    expect(list.body.scenarios.every((scenario: Json) => scenario.fitId === setup.fit.fitId)).toBe(true);
    const foreignList = await call(listScenarios, "/api/scenarios", {}, { token: other.members.planner.token });
    expect(foreignList.body.scenarios).toEqual([]);
  });
});

describe("saving versions", () => {
  it("saves version 1 with the server's own prediction, never the client's numbers", async () => {
    const { body: scenario } = await start("Server numbers");
    const plan = fixedPlan(scenario.baseline, 13_000);
    const { status, body } = await save(scenario.id, { baseVersion: 0, note: "First cut", ...plan, prediction: { horizonTotal: { mean: 1 } }, warnings: [] });
    expect(status).toBe(201);
    expect(body.number).toBe(1);
    expect(body.basedOn).toBeNull();
    expect(body.authorName).toBe("Planner");
    const shape = describePlanShape(setup.fit.record, { periodNoun: "week", outcomeUnit: "EUR" });
    const expected = scenarioOutcome(setup.fit.record, shape, plan, {
      money: { currency: "EUR", locale: "en-IE" },
      compareTo: { allocation: scenario.baseline.allocation, controls: scenario.baseline.controls, horizon: scenario.baseline.horizon },
    });
    expect(body.prediction.horizonTotal).toEqual(expected.horizonTotal);
    expect(body.prediction.difference).toEqual(expected.difference);
    expect(body.fitChecksum).toBe(setup.fit.record.checksum);
    const read = await call(getVersion, `/api/scenarios/${scenario.id}/versions/1`, { id: scenario.id, n: "1" }, { token: setup.members.finance.token });
    expect(read.status).toBe(200);
    expect(read.body.allocation).toEqual(plan.allocation);
    expect(read.body.note).toBe("First cut");
  });

  it("two parallel saves on the same base: exactly one succeeds, the other gets 409, none lost or duplicated", async () => {
    const { body: scenario } = await start("Race of two");
    expect((await save(scenario.id, { baseVersion: 0, ...fixedPlan(scenario.baseline) })).status).toBe(201);
    const [first, second] = await Promise.all([
      save(scenario.id, { baseVersion: 1, note: "mine", ...fixedPlan(scenario.baseline, 1_000) }),
      save(scenario.id, { baseVersion: 1, note: "Pat's", ...fixedPlan(scenario.baseline, 2_000) }, setup.members.pat.token),
    ]);
    expect([first.status, second.status].sort()).toEqual([201, 409]);
    const loser = first.status === 409 ? first : second;
    const winner = first.status === 201 ? first : second;
    expect(loser.body.error).toMatch(/^Version 2 was saved by (Planner|Pat) at \d\d:\d\d UTC after you started from version 1\. Reload to see it; your changes are kept in this page\.$/);
    expect(loser.body.details[0]).toMatchObject({ path: "baseVersion", latestVersion: 2 });
    expect(await versionNumbers(scenario.id)).toEqual([1, 2]);
    const stored = await call(getVersion, `/api/scenarios/${scenario.id}/versions/2`, { id: scenario.id, n: "2" });
    expect(stored.body.note).toBe(winner.body.note);
  });

  it("fifty concurrent saves on one base: one success, 49 conflicts, gapless numbering", async () => {
    const { body: scenario } = await start("Race of fifty");
    const results = await Promise.all(
      Array.from({ length: 50 }, (_, index) => save(scenario.id, { baseVersion: 0, note: `attempt ${index}`, ...fixedPlan(scenario.baseline, index * 100) })),
    );
    const statuses = results.map((result) => result.status);
    expect(statuses.filter((status) => status === 201)).toHaveLength(1);
    expect(statuses.filter((status) => status === 409)).toHaveLength(49);
    expect(await versionNumbers(scenario.id)).toEqual([1]);
    // And fifty saves one after another, each on the latest: 2 … 51 with no gap.
    for (let base = 1; base <= 10; base++) expect((await save(scenario.id, { baseVersion: base, ...fixedPlan(scenario.baseline, base) })).status).toBe(201);
    expect(await versionNumbers(scenario.id)).toEqual(Array.from({ length: 11 }, (_, index) => index + 1));
  });

  it("refuses a save based on an old version with 409, and a base that does not exist with 422", async () => {
    const { body: scenario } = await start("Stale base");
    await save(scenario.id, { baseVersion: 0, ...fixedPlan(scenario.baseline) });
    await save(scenario.id, { baseVersion: 1, ...fixedPlan(scenario.baseline, 500) });
    const stale = await save(scenario.id, { baseVersion: 1, ...fixedPlan(scenario.baseline, 700) });
    expect(stale.status).toBe(409);
    expect(stale.body.error).toMatch(/^Version 2 was saved by Planner at/);
    const ahead = await save(scenario.id, { baseVersion: 5, ...fixedPlan(scenario.baseline, 700) });
    expect(ahead.status).toBe(422);
    expect(await versionNumbers(scenario.id)).toEqual([1, 2]);
  });

  it("refuses invalid versions with clear errors and stores nothing", async () => {
    const { body: scenario } = await start("Validation");
    const baseline = scenario.baseline;
    const cases: [Json, number, RegExp][] = [
      [fixedPlan(baseline, 0, { total: fixedPlan(baseline).total + 0.02 }), 422, /add up to .* but the fixed total is/],
      [fixedPlan(baseline, 0, { allocation: { ...baseline.allocation, email_eur: -10 } }), 422, /can't be negative/],
      [fixedPlan(baseline, 0, { allocation: { ...baseline.allocation, radio_eur: 10 } }), 422, /no channel "radio_eur"/],
      [fixedPlan(baseline, 0, { allocation: { ...baseline.allocation, email_eur: baseline.allocation.email_eur + 0.005 } }), 422, /whole cents/],
      [{ ...fixedPlan(baseline), mode: "growing", ceiling: 1 }, 422, /above the ceiling/],
      [{ ...fixedPlan(baseline), controls: { promo_week: 40 } }, 422, /whole number from 0 to 13/],
      [{ ...fixedPlan(baseline), mode: undefined }, 422, /fixed.*growing/],
    ];
    for (const [body, status, message] of cases) {
      const result = await save(scenario.id, { baseVersion: 0, ...body });
      expect(result.status, JSON.stringify(result.body)).toBe(status);
      expect(result.body.error).toMatch(message);
    }
    // Within ±0.01 of the total is accepted.
    expect(await versionNumbers(scenario.id)).toEqual([]);
    expect((await save(scenario.id, { baseVersion: 0, ...fixedPlan(baseline, 0, { total: fixedPlan(baseline).total + 0.01 }) })).status).toBe(201);
    expect(await versionNumbers(scenario.id)).toEqual([1]);
  });

  it("refuses saves with 409 once the fit is no longer approved, storing nothing", async () => {
    const { sql } = getDatabase();
    const fit = await createApprovedDemoFit(sql, { workspaceId: setup.workspace.id, authorId: setup.members.analyst.id, approverId: setup.members.reviewer.id });
    const { body: scenario } = await start("On a fit that retires", {}, undefined, fit.fitId);
    await sql`update fits set status = 'retired', retired_at = now(), retired_by = ${setup.members.reviewer.id} where id = ${fit.fitId}`;
    const refused = await save(scenario.id, { baseVersion: 0, ...fixedPlan(scenario.baseline) });
    expect(refused.status).toBe(409);
    expect(refused.body.error).toMatch(/retired/);
    expect(await versionNumbers(scenario.id)).toEqual([]);
    expect((await start("After retirement", {}, undefined, fit.fitId)).status).toBe(409);
  });

  it("saves a warned version and keeps its warnings", async () => {
    const { body: scenario } = await start("Bold podcast");
    const podcastMax = setup.fit.record.columnRanges.podcast_eur.maximum;
    const plan = fixedPlan(scenario.baseline);
    const extra = (podcastMax + 2_000) * 13 - plan.allocation.podcast_eur;
    const allocation = { ...plan.allocation, podcast_eur: plan.allocation.podcast_eur + extra, search_eur: plan.allocation.search_eur - extra };
    const { status, body } = await save(scenario.id, { baseVersion: 0, ...plan, allocation });
    expect(status).toBe(201);
    expect(body.warnings).toContainEqual(expect.objectContaining({ kind: "outside-range", column: "podcast_eur" }));
    const list = await call(listVersions, `/api/scenarios/${scenario.id}/versions`, { id: scenario.id });
    expect(list.body.versions[0].warningKinds).toContain("outside-range");
  });

  it("restores an old version as a new one", async () => {
    const { body: scenario } = await start("Restore");
    const v1 = await save(scenario.id, { baseVersion: 0, note: "v1", ...fixedPlan(scenario.baseline, 3_000) });
    await save(scenario.id, { baseVersion: 1, note: "v2", ...fixedPlan(scenario.baseline, -3_000) });
    const restored = await save(scenario.id, { baseVersion: 2, restoreFrom: 1 });
    expect(restored.status).toBe(201);
    expect(restored.body).toMatchObject({ number: 3, basedOn: 2, restoredFrom: 1, note: "Restored version 1", allocation: v1.body.allocation, total: v1.body.total });
    expect(restored.body.prediction.horizonTotal).toEqual(v1.body.prediction.horizonTotal);
    expect((await save(scenario.id, { baseVersion: 3, restoreFrom: 9 })).status).toBe(422);

    // The workspace's recent activity names the scenario and each version (home page).
    const events = await listAuditEventsByWorkspaceId({ workspaceId: setup.workspace.id, limit: 200 });
    const phrases = events.filter((event) => event.objectId === scenario.id).map((event) => describeAuditEvent(event));
    expect(phrases).toEqual([
      "saved version 3 of “Restore”, restored from version 1",
      "saved version 2 of “Restore”",
      "saved version 1 of “Restore”",
      "started the scenario “Restore”",
    ]);
  });

  it("growing mode stores its ceiling and the total within it", async () => {
    const { body: scenario } = await start("Growing");
    const plan = fixedPlan(scenario.baseline);
    const allocation = { ...plan.allocation, podcast_eur: plan.allocation.podcast_eur + 5_000 };
    const { status, body } = await save(scenario.id, { baseVersion: 0, mode: "growing", allocation, ceiling: plan.total * 1.1, horizon: 13, controls: plan.controls });
    expect(status).toBe(201);
    expect(body.mode).toBe("growing");
    expect(body.total).toBeCloseTo(plan.total + 5_000, 2);
    expect(body.ceiling).toBeCloseTo(plan.total * 1.1, 2);
  });
});

describe("reading scenarios", () => {
  it("lets finance and reviewers read, hides other workspaces' scenarios and versions (404)", async () => {
    const { body: scenario } = await start("Readable");
    await save(scenario.id, { baseVersion: 0, ...fixedPlan(scenario.baseline) });
    for (const token of [setup.members.finance.token, setup.members.reviewer.token]) {
      const read = await call(getScenario, `/api/scenarios/${scenario.id}`, { id: scenario.id }, { token });
      expect(read.status).toBe(200);
      expect(read.body.versions.map((version: Json) => version.number)).toEqual([1]);
      expect((await save(scenario.id, { baseVersion: 1, ...fixedPlan(scenario.baseline) }, token)).status).toBe(403);
    }
    const foreign = other.members.planner.token;
    expect((await call(getScenario, `/api/scenarios/${scenario.id}`, { id: scenario.id }, { token: foreign })).status).toBe(404);
    expect((await call(getVersion, `/api/scenarios/${scenario.id}/versions/1`, { id: scenario.id, n: "1" }, { token: foreign })).status).toBe(404);
    expect((await save(scenario.id, { baseVersion: 1, ...fixedPlan(scenario.baseline) }, foreign)).status).toBe(404);
    expect((await call(getVersion, `/api/scenarios/${scenario.id}/versions/7`, { id: scenario.id, n: "7" })).status).toBe(404);
  });
});

describe("immutability", () => {
  it("the database refuses UPDATE and DELETE of a saved version", async () => {
    const { body: scenario } = await start("Frozen");
    await save(scenario.id, { baseVersion: 0, ...fixedPlan(scenario.baseline) });
    const { sql } = getDatabase();
    await expect(sql`update scenario_versions set note = 'changed' where scenario_id = ${scenario.id}`).rejects.toMatchObject({
      code: "23001",
      message: expect.stringMatching(/immutable: update refused/),
    });
    await expect(sql`delete from scenario_versions where scenario_id = ${scenario.id}`).rejects.toMatchObject({ code: "23001" });
    expect(await versionNumbers(scenario.id)).toEqual([1]);
  });
});

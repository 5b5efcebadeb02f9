// The demo seed's scenarios against the seeded PostgreSQL (npm test seeds the database before this
// copy of it is made): what a planner and finance find right after `npm start` — two scenarios with
// server-computed versions, a saved comparison and a finance comment — and that `npm run seed` (the
// package script, as a person would type it) runs again without adding anything.
import { execFile } from "node:child_process";
import { promisify } from "node:util";
import { describe, expect, it } from "vitest";
import { getDatabase } from "@/db/client";
import { demoAccountFor } from "@/seed/demo-accounts";
import { type DemoVersion, demoComparisonName, demoGrowthScenarioName, demoSpringScenarioName, saveMissingVersions } from "@/seed/demo-scenarios";
import { actorForScript } from "@/server/authz/member-actor";
import { startScenario } from "@/server/scenarios/create";
import { saveScenarioVersion } from "@/server/scenarios/save-version";
import { getScenarioById } from "@/server/scenarios/store";
import { listScenarioSignoffSummaries } from "@/server/signoffs/summary";
import { makePlanningWorkspace } from "../scenarios/support/workspace";
import { getCachedFit } from "@/server/predict/fit-cache";
import { scenarioOutcome, type ScenarioOutcome, type ScenarioWarning } from "@/server/predict/scenario-outcome";

type VersionRow = {
  number: number;
  mode: string;
  allocation: Record<string, number>;
  totalCents: number;
  ceilingCents: number | null;
  horizonPeriods: number;
  controls: Record<string, number>;
  prediction: ScenarioOutcome;
  warnings: ScenarioWarning[];
  authorEmail: string;
};

async function demoScenario(name: string) {
  const { sql } = getDatabase();
  const [scenario] = await sql<{ id: string; fitId: string; ownerEmail: string; baseline: { allocationCents: Record<string, number>; controls: Record<string, number>; horizon: number } }[]>`
    select s.id, s.fit_id as "fitId", u.email as "ownerEmail", s.baseline
    from scenarios s join workspaces w on w.id = s.workspace_id join "user" u on u.id = s.owner_id
    where w.slug = 'larkspur' and s.name = ${name}`;
  expect(scenario, `the seed's scenario "${name}"`).toBeDefined();
  const versions = await sql<VersionRow[]>`
    select v.number, v.mode, v.allocation, v.total_cents::float8 as "totalCents", v.ceiling_cents::float8 as "ceilingCents",
           v.horizon_periods as "horizonPeriods", v.controls, v.prediction, v.warnings, u.email as "authorEmail"
    from scenario_versions v join "user" u on u.id = v.author_id
    where v.scenario_id = ${scenario.id} order by v.number`;
  return { ...scenario, versions };
}

const sumOf = (cents: Record<string, number>) => Object.values(cents).reduce((sum, value) => sum + value, 0);

/** The stored snapshot is the engine's answer for the stored plan (measured against the scenario's starting plan). */
async function expectServerPrediction(fitId: string, baseline: { allocationCents: Record<string, number>; controls: Record<string, number>; horizon: number }, version: VersionRow) {
  const fit = await getCachedFit(fitId, { fresh: true });
  expect(fit).not.toBeNull();
  const toAmounts = (cents: Record<string, number>) => Object.fromEntries(Object.entries(cents).map(([name, value]) => [name, value / 100]));
  const expected = scenarioOutcome(
    fit!.record,
    fit!.shape,
    { allocation: toAmounts(version.allocation), controls: version.controls, horizon: version.horizonPeriods },
    { money: { currency: "EUR", locale: "en-IE" }, compareTo: { allocation: toAmounts(baseline.allocationCents), controls: baseline.controls, horizon: baseline.horizon } },
  );
  expect(version.prediction.horizonTotal.mean).toBeCloseTo(expected.horizonTotal.mean, 6);
  expect(version.prediction.horizonTotal.prediction[0]).toBeCloseTo(expected.horizonTotal.prediction[0], 6);
  expect(version.prediction.horizonTotal.prediction[1]).toBeCloseTo(expected.horizonTotal.prediction[1], 6);
  expect(version.warnings.map((warning) => warning.kind).sort()).toEqual(expected.warnings.map((warning) => warning.kind).sort());
}

describe("the demo seed's scenarios", () => {
  it("a fixed-total shift from display to search: version 1 is last quarter's split, version 2 moves money at the same total", async () => {
    const spring = await demoScenario(demoSpringScenarioName);
    expect(spring.ownerEmail).toBe(demoAccountFor("planner").email);
    expect(spring.versions.map((version) => version.number)).toEqual([1, 2]);
    const [first, second] = spring.versions;
    expect(first.allocation).toEqual(spring.baseline.allocationCents);
    for (const version of spring.versions) {
      expect(version.mode).toBe("fixed");
      expect(version.authorEmail).toBe(demoAccountFor("planner").email);
      expect(sumOf(version.allocation)).toBe(version.totalCents);
      expect(version.totalCents).toBe(sumOf(spring.baseline.allocationCents));
      await expectServerPrediction(spring.fitId, spring.baseline, version);
    }
    const moved = second.allocation.search_eur - first.allocation.search_eur;
    expect(moved).toBeGreaterThan(0);
    expect(first.allocation.display_eur - second.allocation.display_eur).toBe(moved);
    // Display falls while online video, which it always moved with, stays: a combination the history never had.
    expect(first.warnings).toEqual([]);
    expect(second.warnings.map((warning) => warning.kind)).toContain("hidden-extrapolation");
  });

  it("a growing total within a ceiling of 10% more, with e-mail past its observed range", async () => {
    const growth = await demoScenario(demoGrowthScenarioName);
    expect(growth.versions).toHaveLength(1);
    const [version] = growth.versions;
    expect(version.mode).toBe("growing");
    const base = sumOf(growth.baseline.allocationCents);
    expect(version.ceilingCents).toBe(Math.round(base * 1.1));
    expect(version.totalCents).toBe(sumOf(version.allocation));
    expect(version.totalCents).toBeGreaterThan(base);
    expect(version.totalCents).toBeLessThanOrEqual(version.ceilingCents!);
    const outside = version.warnings.filter((warning) => warning.kind === "outside-range");
    expect(outside.map((warning) => warning.kind === "outside-range" && warning.column)).toEqual(["email_eur"]);
    await expectServerPrediction(growth.fitId, growth.baseline, version);
  });

  it("a saved comparison of the three versions, shared with finance and awaiting sign-off, with finance's comment on the shift", async () => {
    const { sql } = getDatabase();
    const spring = await demoScenario(demoSpringScenarioName);
    const growth = await demoScenario(demoGrowthScenarioName);
    const columns = await sql<{ scenarioId: string; version: number; baselinePosition: number }[]>`
      select cv.scenario_id as "scenarioId", cv.version_number as version, c.baseline_position as "baselinePosition"
      from comparisons c join comparison_versions cv on cv.comparison_id = c.id join workspaces w on w.id = c.workspace_id
      where w.slug = 'larkspur' and c.name = ${demoComparisonName} order by cv.position`;
    expect(columns.map((column) => [column.scenarioId, column.version])).toEqual([
      [spring.id, 1],
      [spring.id, 2],
      [growth.id, 1],
    ]);
    expect(columns[0].baselinePosition).toBe(0);
    const comments = await sql<{ version: number; email: string }[]>`
      select c.version_number as version, u.email from comments c join "user" u on u.id = c.author_id where c.scenario_id = ${spring.id}`;
    expect(comments).toEqual([{ version: 2, email: demoAccountFor("finance").email }]);

    // Shared by the planner with finance, the warnings acknowledged (both changed plans carry some).
    const shared = await sql<{ sharedBy: string; recipient: string; acknowledgement: string | null; objectType: string }[]>`
      select sb.email as "sharedBy", u.email as recipient, s.acknowledgement, s.object_type as "objectType"
      from shares s join comparisons c on c.id = s.comparison_id join share_recipients r on r.share_id = s.id
      join "user" u on u.id = r.user_id join "user" sb on sb.id = s.shared_by
      where c.name = ${demoComparisonName}`;
    expect(shared).toHaveLength(1);
    expect(shared[0]).toMatchObject({ sharedBy: demoAccountFor("planner").email, recipient: demoAccountFor("finance").email, objectType: "comparison" });
    expect(shared[0].acknowledgement).toMatch(/no data/);
    const notified = await sql<{ kind: string; title: string }[]>`
      select n.kind, n.title from notifications n join "user" u on u.id = n.user_id
      where u.email = ${demoAccountFor("finance").email} and n.kind = 'share'`;
    expect(notified.map((n) => n.title)).toEqual([`${demoAccountFor("planner").name} shared the comparison “${demoComparisonName}” with you.`]);

    // So finance's home page finds both scenarios' latest versions awaiting a decision.
    const [workspace] = await sql<{ id: string }[]>`select id from workspaces where slug = 'larkspur'`;
    const summaries = await listScenarioSignoffSummaries(workspace.id);
    expect(summaries.get(spring.id)).toMatchObject({ state: "awaiting", latestVersion: 2 });
    expect(summaries.get(growth.id)).toMatchObject({ state: "awaiting", latestVersion: 1 });
  });

  it("`npm run seed` runs again and adds nothing", async () => {
    const { sql } = getDatabase();
    const counts = async () =>
      (await sql<{ scenarios: number; versions: number; comparisons: number; comments: number; shares: number; notifications: number }[]>`
        select (select count(*)::int from scenarios) as scenarios, (select count(*)::int from scenario_versions) as versions,
               (select count(*)::int from comparisons) as comparisons, (select count(*)::int from comments) as comments,
               (select count(*)::int from shares) as shares, (select count(*)::int from notifications) as notifications`)[0];
    const before = await counts();
    const { stdout } = await promisify(execFile)("npm", ["run", "--silent", "seed"], { env: process.env, timeout: 120_000 });
    expect(stdout).toContain("seed: demo scenarios");
    expect(await counts()).toEqual(before);
  }, 180_000);

  it("adds the demo versions a scenario lacks, and none once a person has saved a version of their own", async () => {
    const { workspace, members, fit } = await makePlanningWorkspace();
    const planner = await actorForScript(members.planner.id, workspace.slug);
    const notes = (scenario: { versions: { note: string }[] }) => scenario.versions.map((version) => version.note).sort();
    const reload = async (id: string) => (await getScenarioById(id))!;
    const demoVersions = (scenario: Awaited<ReturnType<typeof reload>>): DemoVersion[] =>
      ["first", "second"].map((note) => ({ mode: "fixed", allocation: scenario.baseline.allocation, total: scenario.baseline.total, note }));

    // Interrupted after version 1: the second is added, and a further run adds nothing.
    const interrupted = await reload((await startScenario(planner, { fitId: fit.fitId, name: "Interrupted demo" })).id);
    await saveScenarioVersion(planner, interrupted.id, { ...demoVersions(interrupted)[0], baseVersion: 0, horizon: interrupted.baseline.horizon, controls: interrupted.baseline.controls });
    expect(await saveMissingVersions(planner, await reload(interrupted.id), demoVersions(interrupted))).toBe(true);
    expect(notes(await reload(interrupted.id))).toEqual(["first", "second"]);
    expect(await saveMissingVersions(planner, await reload(interrupted.id), demoVersions(interrupted))).toBe(true);
    expect((await reload(interrupted.id)).versions).toHaveLength(2);

    // Someone saved their own version 1: the demo's are not stacked on top of it.
    const taken = await reload((await startScenario(planner, { fitId: fit.fitId, name: "Taken over" })).id);
    await saveScenarioVersion(planner, taken.id, { ...demoVersions(taken)[0], note: "my own plan", baseVersion: 0, horizon: taken.baseline.horizon, controls: taken.baseline.controls });
    expect(await saveMissingVersions(planner, await reload(taken.id), demoVersions(taken))).toBe(false);
    expect(notes(await reload(taken.id))).toEqual(["my own plan"]);
  });
});

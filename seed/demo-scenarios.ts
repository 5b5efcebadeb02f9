import { and, eq } from "drizzle-orm";
import type { Database } from "@/db/client";
import { comparisons, fits, scenarios } from "@/db/schema";
import { actorForScript } from "@/server/authz/member-actor";
import { postComment } from "@/server/comments/store";
import { shareComparison } from "@/server/comparisons/share";
import { createComparison } from "@/server/comparisons/store";
import { startScenario } from "@/server/scenarios/create";
import { saveScenarioVersion, type SaveVersionInput } from "@/server/scenarios/save-version";
import { getScenarioById } from "@/server/scenarios/store";
import type { ScenarioDto } from "@/server/scenarios/types";
import type { Actor } from "@/server/authz/actor";
import { demoAccountFor } from "./demo-accounts";
import { demoWorkspaceId, userIdByEmail } from "./lookup";
import { demoApprovedFitName, demoComparisonName, demoGrowthScenarioName, demoSpringScenarioName } from "./demo-names";

type Db = Database["db"];

export { demoComparisonName, demoGrowthScenarioName, demoSpringScenarioName };

/** Amounts per horizon with whole cents, as the API takes them. */
const cents = (amount: number) => Math.round(amount * 100) / 100;

/** The planner's scenario of this name on the fit, started (from the history's last 13 weeks) if missing. */
async function ensureScenario(db: Db, planner: Actor, fitId: string, name: string): Promise<ScenarioDto> {
  const [existing] = await db
    .select({ id: scenarios.id })
    .from(scenarios)
    .where(and(eq(scenarios.workspaceId, planner.workspaceId), eq(scenarios.fitId, fitId), eq(scenarios.ownerId, planner.userId), eq(scenarios.name, name)));
  const id = existing?.id ?? (await startScenario(planner, { fitId, name })).id;
  const scenario = await getScenarioById(id);
  if (!scenario) throw new Error(`seed: scenario "${name}" vanished`);
  return scenario;
}

export type DemoVersion = Omit<SaveVersionInput, "baseVersion" | "horizon" | "controls"> & { note: string };

/**
 * Saves the demo versions a scenario does not have yet (over its starting plan's horizon and controls).
 * Versions already there must be the seed's own, in order (same notes); once someone else has saved a
 * version, nothing more is added. True when the scenario holds exactly the demo versions at the end.
 */
export async function saveMissingVersions(actor: Actor, scenario: ScenarioDto, versions: DemoVersion[]): Promise<boolean> {
  const saved = [...scenario.versions].sort((a, b) => a.number - b.number);
  if (saved.length > versions.length || saved.some((version, index) => version.note !== versions[index].note)) return false;
  for (let index = saved.length; index < versions.length; index++) {
    await saveScenarioVersion(actor, scenario.id, { ...versions[index], baseVersion: index, horizon: scenario.baseline.horizon, controls: scenario.baseline.controls });
  }
  return true;
}

/**
 * Two scenarios on the approved demo fit, saved by the planner through the same functions the API
 * uses (so every prediction is the server's): a fixed-total shift of €40,000 from display to search
 * (version 1 is last quarter's split, version 2 the shift, warned as a combination never seen: display
 * falls while online video stays), and a growing total up to 10% more, with the extra money in podcast
 * and e-mail (warned: e-mail above its observed range). A saved comparison of the three versions, shared
 * with finance (the warnings acknowledged) and so awaiting sign-off, and a finance comment on the shift
 * give the finance screens something to show. Idempotent: finds scenarios and the
 * comparison by name and adds only the versions and objects that are missing (and none to a scenario a
 * person has saved versions of since).
 */
export async function seedDemoScenarios(db: Db): Promise<void> {
  const workspaceId = await demoWorkspaceId(db);
  const [fit] = await db
    .select({ id: fits.id })
    .from(fits)
    .where(and(eq(fits.workspaceId, workspaceId), eq(fits.name, demoApprovedFitName), eq(fits.status, "approved")));
  if (!fit) {
    console.log("demo scenarios: skipped (the approved demo fit is not there, e.g. it was retired)");
    return;
  }
  const planner = await actorForScript(await userIdByEmail(db, demoAccountFor("planner").email), "larkspur");
  const finance = await actorForScript(await userIdByEmail(db, demoAccountFor("finance").email), "larkspur");

  const spring = await ensureScenario(db, planner, fit.id, demoSpringScenarioName);
  const lastQuarter = spring.baseline.allocation;
  const shift = Math.min(40_000, Math.floor(lastQuarter.display_eur / 2));
  const springVersions: DemoVersion[] = [
    { mode: "fixed", allocation: lastQuarter, total: spring.baseline.total, note: "Last quarter's split, kept as the reference." },
    {
      mode: "fixed",
      allocation: { ...lastQuarter, search_eur: cents(lastQuarter.search_eur + shift), display_eur: cents(lastQuarter.display_eur - shift) },
      total: spring.baseline.total,
      note: `€${shift.toLocaleString("en")} from display to search: search's association with sales is the clearest; display's is uncertain (it moves with online video).`,
    },
  ];
  const springComplete = await saveMissingVersions(planner, spring, springVersions);

  const growth = await ensureScenario(db, planner, fit.id, demoGrowthScenarioName);
  const base = growth.baseline.allocation;
  const ceiling = cents(growth.baseline.total * 1.1);
  const extra = Math.floor((ceiling - growth.baseline.total) * 0.9);
  const growthAllocation = { ...base, podcast_eur: cents(base.podcast_eur + Math.round(extra * 0.6)), email_eur: cents(base.email_eur + (extra - Math.round(extra * 0.6))) };
  const growthComplete = await saveMissingVersions(planner, growth, [
    {
      mode: "growing",
      allocation: growthAllocation,
      total: cents(Object.values(growthAllocation).reduce((sum, amount) => sum + amount, 0)),
      ceiling,
      note: "Most of the headroom into podcast and e-mail. E-mail goes past the most it has had in a quarter: read its warning before trusting that part.",
    },
  ]);

  const [existingComparison] = await db
    .select({ id: comparisons.id })
    .from(comparisons)
    .where(and(eq(comparisons.workspaceId, workspaceId), eq(comparisons.name, demoComparisonName)));
  // Only over the seed's own versions: a scenario someone changed since keeps its versions to itself.
  if (!existingComparison && springComplete && growthComplete) {
    const comparisonId = await createComparison(planner, {
      name: demoComparisonName,
      versions: [
        { scenarioId: spring.id, version: 1 },
        { scenarioId: spring.id, version: 2 },
        { scenarioId: growth.id, version: 1 },
      ],
      baseline: 0,
    });
    // Recorded with finance's notification but no e-mail: the seed runs before the mail sink starts.
    await shareComparison(
      planner,
      {
        comparisonId,
        recipients: [demoAccountFor("finance").email],
        note: "The display-to-search shift against last quarter and against growing the budget. Please sign off one of them.",
        acknowledgement: "Both changed plans go where the history has no data (display without online video; e-mail above the most it has had). Read as directions, not amounts.",
      },
      { mail: false },
    );
    await postComment(finance, {
      scenarioId: spring.id,
      version: 2,
      comparisonId,
      body: "Search at this level is near the top of what we have spent in a quarter. Can we run the shift in two regions for six weeks before committing the whole budget?",
    });
  }
  console.log(`demo scenarios: "${demoSpringScenarioName}" ${spring.id}, "${demoGrowthScenarioName}" ${growth.id}`);
}

import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { can, requirePageActor, roleLabels } from "@/server/authz";
import { getFitHoldoutSummary } from "@/server/fits/store";
import { getCachedFit } from "@/server/predict/fit-cache";
import { amountToCents } from "@/server/planning/allocation";
import { scenarioOutcome } from "@/server/predict/scenario-outcome";
import { moneyOf } from "@/server/predict/service";
import { getScenarioById, getScenarioVersion } from "@/server/scenarios/store";
import { getScenarioSignoffSummary } from "@/server/signoffs/summary";
import { SignoffSummary } from "@/ui/compare/signoff-summary";
import { ReadOnlyBanner } from "@/ui/scenario/read-only-banner";
import { allocationFromPlan, planOf } from "@/ui/scenario/room-plan";
import { ScenarioRoom } from "@/ui/scenario/scenario-room";
import { ScenarioReviewSection } from "../../compare/_review/scenario-review-section";
import { textLinkClass } from "@/ui/button-class";

export const metadata: Metadata = { title: "Scenario" };

export default async function ScenarioPage({ params }: { params: Promise<{ id: string }> }) {
  const actor = await requirePageActor("scenario:read");
  const { id } = await params;
  if (!/^[0-9a-f-]{36}$/i.test(id)) notFound();
  const scenario = await getScenarioById(id);
  if (!scenario || scenario.workspaceId !== actor.workspaceId) notFound();
  const fit = await getCachedFit(scenario.fitId);
  if (!fit || fit.workspaceId !== actor.workspaceId) notFound();
  const [latest, signoff, heldOut] = await Promise.all([
    scenario.latestVersion === null ? null : getScenarioVersion(scenario.id, scenario.latestVersion),
    getScenarioSignoffSummary(actor.workspaceId, scenario.id),
    getFitHoldoutSummary({ workspaceId: actor.workspaceId, id: fit.id }),
  ]);
  const approved = fit.status === "approved";
  const money = moneyOf(actor);
  // The opening plan's outcome, computed here with the engine the room previews with (its chunk loads
  // after the first paint), exactly as the room would compute it.
  const opening = initialOutcome(fit, scenario, latest, money);
  const plans = can(actor, "scenario:write");
  return (
    <div className="space-y-4">
      <div>
        <p className="text-sm text-slate-600">
          <Link href="/scenarios" className={textLinkClass}>
            Scenarios
          </Link>{" "}
          / on the fit <strong>{fit.name}</strong>
        </p>
        <h1 className="text-2xl font-semibold text-river">{scenario.name}</h1>
        {signoff ? (
          <p className="mt-1 flex flex-wrap items-center gap-2 text-sm text-slate-700" data-testid="scenario-header-signoff">
            <span>Finance:</span>
            <SignoffSummary summary={signoff} />
            {signoff.latestVersion !== null ? (
              <a href="#review" className={textLinkClass}>
                Finance review
              </a>
            ) : null}
          </p>
        ) : null}
      </div>
      {!plans ? (
        <ReadOnlyBanner
          roles={actor.roles.map((role) => roleLabels[role]).join(" · ")}
          can={{ compare: can(actor, "comparison:read"), comment: can(actor, "comment:write"), decide: can(actor, "signoff:decide") }}
        />
      ) : null}
      {!approved ? (
        <p role="alert" className="rounded-md border-l-4 border-ember bg-white px-4 py-3 text-sm">
          The fit “{fit.name}” is {fit.status.replace("_", " ")}: it no longer predicts, so this scenario can be read but not changed or saved.
        </p>
      ) : null}
      <ScenarioRoom
        scenario={scenario}
        fit={{ id: fit.id, name: fit.name, status: fit.status, record: fit.record, shape: fit.shape }}
        initialVersion={latest}
        initialOutcome={opening}
        money={money}
        canWrite={approved && plans}
        canPredict={approved && can(actor, "fit:predict")}
        heldOut={heldOut}
      />
      <ScenarioReviewSection actor={actor} scenario={scenario} />
    </div>
  );
}

function initialOutcome(
  fit: NonNullable<Awaited<ReturnType<typeof getCachedFit>>>,
  scenario: NonNullable<Awaited<ReturnType<typeof getScenarioById>>>,
  latest: Awaited<ReturnType<typeof getScenarioVersion>> | null,
  money: ReturnType<typeof moneyOf>,
) {
  const start = latest ?? scenario.baseline;
  const allocation = allocationFromPlan(fit.shape, start, amountToCents(scenario.baseline.total));
  const baseline = { allocation: scenario.baseline.allocation, controls: scenario.baseline.controls, horizon: scenario.baseline.horizon };
  try {
    return scenarioOutcome(fit.record, fit.shape, planOf(allocation, { ...start.controls }), { money, compareTo: baseline });
  } catch {
    return null; // the room shows the problem once its preview runs
  }
}

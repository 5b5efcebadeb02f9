import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { can, requirePageActor, roleLabels } from "@/server/authz";
import { getCachedFit } from "@/server/predict/fit-cache";
import { moneyOf } from "@/server/predict/service";
import { getScenarioById, getScenarioVersion } from "@/server/scenarios/store";
import { getScenarioSignoffSummary } from "@/server/signoffs/summary";
import { SignoffSummary } from "@/ui/compare/signoff-summary";
import { ReadOnlyBanner } from "@/ui/scenario/read-only-banner";
import { ScenarioRoom } from "@/ui/scenario/scenario-room";
import { ScenarioReviewSection } from "../../compare/_review/scenario-review-section";

export const metadata: Metadata = { title: "Scenario" };

export default async function ScenarioPage({ params }: { params: Promise<{ id: string }> }) {
  const actor = await requirePageActor("scenario:read");
  const { id } = await params;
  if (!/^[0-9a-f-]{36}$/i.test(id)) notFound();
  const scenario = await getScenarioById(id);
  if (!scenario || scenario.workspaceId !== actor.workspaceId) notFound();
  const fit = await getCachedFit(scenario.fitId);
  if (!fit || fit.workspaceId !== actor.workspaceId) notFound();
  const [latest, signoff] = await Promise.all([
    scenario.latestVersion === null ? null : getScenarioVersion(scenario.id, scenario.latestVersion),
    getScenarioSignoffSummary(actor.workspaceId, scenario.id),
  ]);
  const approved = fit.status === "approved";
  const plans = can(actor, "scenario:write");
  return (
    <div className="space-y-4">
      <div>
        <p className="text-sm text-slate-600">
          <Link href="/scenarios" className="text-shallows hover:underline">
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
              <a href="#review" className="text-shallows hover:underline">
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
        money={moneyOf(actor)}
        canWrite={approved && plans}
        canPredict={approved && can(actor, "fit:predict")}
      />
      <ScenarioReviewSection actor={actor} scenario={scenario} />
    </div>
  );
}

import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { can, requirePageActor } from "@/server/authz";
import { getCachedFit } from "@/server/predict/fit-cache";
import { moneyOf } from "@/server/predict/service";
import { getScenarioById, getScenarioVersion } from "@/server/scenarios/store";
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
  const latest = scenario.latestVersion === null ? null : await getScenarioVersion(scenario.id, scenario.latestVersion);
  const approved = fit.status === "approved";
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
      </div>
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
        canWrite={approved && can(actor, "scenario:write")}
        canPredict={approved && can(actor, "fit:predict")}
      />
      <ScenarioReviewSection actor={actor} scenario={scenario} />
    </div>
  );
}

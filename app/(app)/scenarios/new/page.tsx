import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { requirePageActor } from "@/server/authz";
import { AppError } from "@/server/errors";
import { moneyOf, requirePredictableFit } from "@/server/predict/service";
import { centsToAmounts, defaultHorizon, startingPlanFromHistory } from "@/server/scenarios/start";
import { listScenariosByWorkspace } from "@/server/scenarios/store";
import { PageHeading } from "@/ui/section";
import { StartScenarioForm } from "@/ui/scenario/start-form";

export const metadata: Metadata = { title: "Start a scenario" };

export default async function NewScenarioPage({ searchParams }: { searchParams: Promise<{ fitId?: string }> }) {
  const actor = await requirePageActor("scenario:write");
  const { fitId } = await searchParams;
  if (!fitId || !/^[0-9a-f-]{36}$/i.test(fitId)) notFound();
  let fit;
  try {
    fit = await requirePredictableFit(actor, fitId, { fresh: true });
  } catch (error) {
    if (error instanceof AppError && error.type === "not_found") notFound();
    if (error instanceof AppError && error.type === "conflict") {
      return (
        <div>
          <PageHeading title="Start a scenario" />
          <p role="alert" className="rounded-md border-l-4 border-ember bg-white px-4 py-3 text-sm">
            {error.message}
          </p>
        </div>
      );
    }
    throw error;
  }
  const horizon = defaultHorizon(fit.shape.periodNoun, fit.record.observationCount);
  const start = await startingPlanFromHistory(fit, horizon);
  const others = (await listScenariosByWorkspace({ workspaceId: actor.workspaceId, fitId: fit.id })).filter((scenario) => scenario.latestVersion !== null);
  return (
    <div className="space-y-6">
      <PageHeading title="Start a scenario">
        On <strong>{fit.name}</strong>: {fit.shape.channels.length} channels, fitted on {fit.record.observationCount} {fit.shape.periodNoun}s of history.
      </PageHeading>
      <StartScenarioForm
        fitId={fit.id}
        shape={fit.shape}
        money={moneyOf(actor)}
        defaultHorizon={horizon}
        maxHorizon={Math.min(520, fit.record.observationCount)}
        defaultStart={{ allocation: centsToAmounts(start.allocationCents), controls: start.controls, description: start.description }}
        versionsToStartFrom={others.map((scenario) => ({ scenarioId: scenario.id, name: scenario.name, latestVersion: scenario.latestVersion as number }))}
      />
    </div>
  );
}

import "server-only";
import type { ScenarioBaseline } from "@/db/schema/scenarios";
import type { Actor } from "@/server/authz/actor";
import { assertInWorkspace } from "@/server/authz/scope";
import { AppError, type ErrorDetail } from "@/server/errors";
import { amountToCents } from "@/server/planning/allocation";
import { periodsWord } from "@/server/predict/plan-shape";
import { assertPlanFits, requirePredictableFit } from "@/server/predict/service";
import { defaultHorizon, startingPlanFromHistory } from "./start";
import { createScenario, getScenarioById, getScenarioHead, getScenarioVersionRow } from "./store";
import type { ScenarioDto } from "./types";

export type StartScenarioInput = {
  fitId: string;
  name: string;
  /** Periods the plan covers; default a quarter of a year in the fit's periods (13 weeks). */
  horizon?: number;
  /** Controls over the horizon; default those of the most recent periods. */
  controls?: Record<string, number>;
  /** Starting amounts per channel for the horizon; default the spend of the most recent horizon. */
  allocation?: Record<string, number>;
  /** Or start from a saved version of another scenario on the same fit. */
  startFrom?: { scenarioId: string; version: number };
};

async function baselineFromVersion(actor: Actor, fitId: string, from: { scenarioId: string; version: number }): Promise<ScenarioBaseline> {
  const source = await getScenarioHead(from.scenarioId);
  assertInWorkspace(actor, source, "scenario");
  if (source.fitId !== fitId) {
    throw new AppError("invalid:scenario", "Start from a version of a scenario on the same fit.", { details: [{ path: "startFrom.scenarioId", message: "Other fit." }] });
  }
  const row = await getScenarioVersionRow(from.scenarioId, from.version);
  if (!row) throw new AppError("invalid:scenario", `"${source.name}" has no version ${from.version}.`, { details: [{ path: "startFrom.version", message: "No such version." }] });
  return {
    allocationCents: row.allocation,
    controls: row.controls,
    horizon: row.horizonPeriods,
    source: "version",
    description: `Version ${from.version} of "${source.name}"`,
  };
}

/**
 * Starts a scenario on an approved fit (404 for another workspace's, 409 when not approved) with
 * its starting plan: given amounts, a saved version, or the spend of the most recent horizon in the
 * history. No version is saved yet; the first save is version 1.
 */
export async function startScenario(actor: Actor, input: StartScenarioInput): Promise<ScenarioDto> {
  const fit = await requirePredictableFit(actor, input.fitId, { fresh: true });
  let baseline: ScenarioBaseline;
  if (input.startFrom) {
    baseline = await baselineFromVersion(actor, fit.id, input.startFrom);
  } else {
    const horizon = input.horizon ?? defaultHorizon(fit.shape.periodNoun, fit.record.observationCount);
    const history = await startingPlanFromHistory(fit, horizon);
    let allocationCents = history.allocationCents;
    let description = history.description;
    let source: ScenarioBaseline["source"] = "history";
    if (input.allocation) {
      const details: ErrorDetail[] = [];
      allocationCents = {};
      for (const [name, amount] of Object.entries(input.allocation)) {
        allocationCents[name] = amountToCents(amount);
        if (Math.abs(amount * 100 - allocationCents[name]) > 1e-6) details.push({ path: `allocation.${name}`, message: `Amounts are in whole cents (got ${amount}).` });
      }
      if (details.length > 0) throw new AppError("invalid:scenario", details[0].message, { details });
      description = `Amounts entered when the scenario was started (${periodsWord(horizon, fit.shape.periodNoun)})`;
      source = "custom";
    }
    baseline = { allocationCents, controls: { ...history.controls, ...(input.controls ?? {}) }, horizon, source, description };
  }
  assertPlanFits(fit, {
    allocation: Object.fromEntries(Object.entries(baseline.allocationCents).map(([name, cents]) => [name, cents / 100])),
    controls: baseline.controls,
    horizon: baseline.horizon,
  });
  const id = await createScenario({
    workspaceId: actor.workspaceId,
    fitId: fit.id,
    name: input.name,
    ownerId: actor.userId,
    horizon: baseline.horizon,
    baseline,
  });
  const created = await getScenarioById(id);
  if (!created) throw new AppError("internal");
  return created;
}

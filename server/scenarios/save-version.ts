import "server-only";
import { eq, sql } from "drizzle-orm";
import { db } from "@/db/client";
import { type ChannelSettings, type ScenarioMode, scenarioVersions } from "@/db/schema/scenarios";
import type { Actor } from "@/server/authz/actor";
import { assertInWorkspace } from "@/server/authz/scope";
import { recordAudit } from "@/server/data/audit";
import { AppError, type ErrorDetail, postgresCode } from "@/server/errors";
import {
  type AllocationState,
  amountToCents,
  centsFormatter,
  centsToAmount,
  validateAllocation,
} from "@/server/planning/allocation";
import type { CachedFit } from "@/server/predict/fit-cache";
import type { ScenarioPlan } from "@/server/predict/scenario-outcome";
import { scenarioOutcome } from "@/server/predict/scenario-outcome";
import { assertPlanFits, moneyOf, requirePredictableFit } from "@/server/predict/service";
import { getScenarioHead, getScenarioVersion, getScenarioVersionRow } from "./store";
import type { VersionDto } from "./types";

/** A save as the API takes it (amounts per horizon in currency units), or a restore of an older version. */
export type SaveVersionInput = {
  /** The version the author started from; 0 when the scenario has none yet. */
  baseVersion: number;
  note?: string;
  /** Copy this older version's plan into the new version (the body's plan fields are then ignored). */
  restoreFrom?: number;
  mode?: ScenarioMode;
  allocation?: Record<string, number>;
  /** Fixed mode: the total the amounts must add up to (±0.01). Growing mode: optional, must equal the sum. */
  total?: number;
  /** Growing mode: the ceiling the total may rise to. */
  ceiling?: number | null;
  horizon?: number;
  controls?: Record<string, number>;
  settings?: ChannelSettings;
};

type PlanCents = {
  mode: ScenarioMode;
  allocationCents: Record<string, number>;
  totalCents: number;
  ceilingCents: number | null;
  horizon: number;
  controls: Record<string, number>;
  settings: ChannelSettings;
};

function invalid(message: string, details: ErrorDetail[]): AppError {
  return new AppError("invalid:version", message, { details });
}

/** Currency amount → cents, refusing fractions of a cent (amounts are exact). */
function exactCents(amount: number, path: string, details: ErrorDetail[]): number {
  const cents = amountToCents(amount);
  if (Math.abs(amount * 100 - cents) > 1e-6) details.push({ path, message: `Amounts are in whole cents (got ${amount}).` });
  return cents;
}

function planFromBody(input: SaveVersionInput): PlanCents {
  const details: ErrorDetail[] = [];
  const required = <T>(value: T | undefined, path: string, message: string): T => {
    if (value === undefined) details.push({ path, message });
    return value as T;
  };
  const mode = required(input.mode, "mode", 'Say whether the total is "fixed" or "growing".');
  const allocation = required(input.allocation, "allocation", "Give the amount per channel.");
  const horizon = required(input.horizon, "horizon", "Give the horizon in periods.");
  const controls = input.controls ?? {};
  const allocationCents: Record<string, number> = {};
  for (const [name, amount] of Object.entries(allocation ?? {})) allocationCents[name] = exactCents(amount, `allocation.${name}`, details);
  const sum = Object.values(allocationCents).reduce((total, cents) => total + cents, 0);
  let totalCents = sum;
  let ceilingCents: number | null = null;
  if (mode === "fixed") {
    const total = required(input.total, "total", "A fixed-total version needs its total.");
    if (total !== undefined) totalCents = exactCents(total, "total", details);
  } else if (mode === "growing") {
    const ceiling = required(input.ceiling ?? undefined, "ceiling", "A growing-total version needs its ceiling.");
    if (ceiling !== undefined) ceilingCents = exactCents(ceiling, "ceiling", details);
    if (input.total !== undefined) totalCents = exactCents(input.total, "total", details);
  }
  if (details.length > 0) throw invalid(details[0].message, details);
  return { mode, allocationCents, totalCents, ceilingCents, horizon, controls, settings: input.settings ?? {} };
}

/**
 * Server-side checks of a plan before anything is stored: channels and controls the fit has, no
 * negative amounts, whole cents, bounds, fixed total = sum of the amounts (±0.01), growing total
 * within its ceiling. @throws AppError 422 listing every problem.
 */
function checkPlan(fit: CachedFit, plan: PlanCents, actor: Actor): ScenarioPlan {
  const apiPlan: ScenarioPlan = {
    allocation: Object.fromEntries(Object.entries(plan.allocationCents).map(([name, cents]) => [name, centsToAmount(cents)])),
    controls: plan.controls,
    horizon: plan.horizon,
  };
  assertPlanFits(fit, apiPlan);
  const unknownSettings = Object.keys(plan.settings).filter((name) => !fit.shape.channels.some((channel) => channel.name === name));
  if (unknownSettings.length > 0) {
    throw invalid(`This fit has no channel "${unknownSettings[0]}".`, unknownSettings.map((name) => ({ path: `settings.${name}`, message: "Unknown channel." })));
  }
  const state: AllocationState = {
    mode: plan.mode,
    channels: fit.shape.channels.map((channel) => ({
      name: channel.name,
      label: channel.label,
      amountCents: plan.allocationCents[channel.name],
      locked: plan.settings[channel.name]?.locked ?? false,
      floorCents: plan.settings[channel.name]?.floorCents,
      ceilingCents: plan.settings[channel.name]?.ceilingCents,
    })),
    totalCents: plan.totalCents,
    baseTotalCents: plan.totalCents,
    ceilingCents: plan.ceilingCents ?? plan.totalCents,
    horizonPeriods: plan.horizon,
  };
  const { problems } = validateAllocation(state, { format: centsFormatter(moneyOf(actor)) });
  if (problems.length > 0) throw invalid(problems[0].message, problems.map((problem) => ({ path: problem.path.replace(/^channels\./, "allocation."), message: problem.message })));
  return apiPlan;
}

/** 409 naming who saved the version that now follows the author's base, and when. */
async function conflictAfter(scenarioId: string, baseVersion: number, latest: number, locale: string): Promise<AppError> {
  const version = await getScenarioVersion(scenarioId, latest);
  const who = version?.authorName ?? "someone";
  const at = version ? new Date(version.createdAt) : new Date();
  const time = new Intl.DateTimeFormat(locale, { hour: "2-digit", minute: "2-digit", timeZone: "UTC" }).format(at);
  const startedFrom = baseVersion === 0 ? "you started" : `you started from version ${baseVersion}`;
  return new AppError(
    "conflict:version",
    `Version ${latest} was saved by ${who} at ${time} UTC after ${startedFrom}. Reload to see it; your changes are kept in this page.`,
    {
      details: [{ path: "baseVersion", message: `Version ${latest} exists`, latestVersion: latest, savedBy: who, savedAt: version?.createdAt ?? null }],
    },
  );
}

/**
 * Saves a new version of a scenario: checks the plan (422), that the fit is still approved (409),
 * recomputes the prediction on the server (the client's numbers are never stored), then inserts
 * number = baseVersion + 1 in a transaction. Two saves on the same base collide on the primary key
 * (scenario_id, number): one commits, the other gets 409 and nothing is stored; numbering has no
 * gaps. A base older than the latest version is 409 too (someone saved in between).
 */
export async function saveScenarioVersion(actor: Actor, scenarioId: string, input: SaveVersionInput): Promise<VersionDto> {
  const head = await getScenarioHead(scenarioId);
  assertInWorkspace(actor, head, "scenario");
  const fit = await requirePredictableFit(actor, head.fitId, { fresh: true });

  let plan: PlanCents;
  if (input.restoreFrom !== undefined) {
    const source = await getScenarioVersionRow(scenarioId, input.restoreFrom);
    if (!source) throw invalid(`There is no version ${input.restoreFrom} to restore.`, [{ path: "restoreFrom", message: "No such version." }]);
    plan = {
      mode: source.mode,
      allocationCents: source.allocation,
      totalCents: source.totalCents,
      ceilingCents: source.ceilingCents,
      horizon: source.horizonPeriods,
      controls: source.controls,
      settings: source.settings,
    };
  } else {
    plan = planFromBody(input);
  }
  const apiPlan = checkPlan(fit, plan, actor);
  const baseline = head.baseline;
  const compareTo: ScenarioPlan = {
    allocation: Object.fromEntries(Object.entries(baseline.allocationCents).map(([name, cents]) => [name, centsToAmount(cents)])),
    controls: baseline.controls,
    horizon: baseline.horizon,
  };
  const prediction = scenarioOutcome(fit.record, fit.shape, apiPlan, { money: moneyOf(actor), compareTo });
  const number = input.baseVersion + 1;
  const note = (input.note ?? "").trim() || (input.restoreFrom !== undefined ? `Restored version ${input.restoreFrom}` : "");

  let outcome: { kind: "saved" } | { kind: "behind"; latest: number } | { kind: "missing-base"; latest: number };
  try {
    outcome = await db.transaction(async (tx) => {
      const [{ latest }] = await tx
        .select({ latest: sql<number>`coalesce(max(${scenarioVersions.number}), 0)::int` })
        .from(scenarioVersions)
        .where(eq(scenarioVersions.scenarioId, scenarioId));
      if (input.baseVersion > latest) return { kind: "missing-base" as const, latest };
      if (input.baseVersion < latest) return { kind: "behind" as const, latest };
      await tx.insert(scenarioVersions).values({
        scenarioId,
        number,
        allocation: plan.allocationCents,
        settings: plan.settings,
        mode: plan.mode,
        totalCents: plan.totalCents,
        ceilingCents: plan.mode === "growing" ? plan.ceilingCents : null,
        horizonPeriods: plan.horizon,
        controls: plan.controls,
        prediction: prediction as unknown as Record<string, unknown>,
        warnings: prediction.warnings as unknown as Record<string, unknown>[],
        fitChecksum: fit.checksum,
        note,
        authorId: actor.userId,
        basedOn: input.baseVersion === 0 ? null : input.baseVersion,
        restoredFrom: input.restoreFrom ?? null,
      });
      await recordAudit(
        {
          workspaceId: actor.workspaceId,
          actorUserId: actor.userId,
          action: "scenario.version_saved",
          objectType: "scenario",
          objectId: scenarioId,
          details: { name: head.name, number, restoredFrom: input.restoreFrom ?? null, warnings: prediction.warnings.map((warning) => warning.kind) },
        },
        tx,
      );
      return { kind: "saved" as const };
    });
  } catch (error) {
    if (postgresCode(error) === "23505") throw await conflictAfter(scenarioId, input.baseVersion, number, actor.locale);
    throw error;
  }
  if (outcome.kind === "missing-base") {
    throw invalid(`There is no version ${input.baseVersion} to build on; the latest is ${outcome.latest}.`, [
      { path: "baseVersion", message: `The latest version is ${outcome.latest}.` },
    ]);
  }
  if (outcome.kind === "behind") throw await conflictAfter(scenarioId, input.baseVersion, outcome.latest, actor.locale);
  const saved = await getScenarioVersion(scenarioId, number);
  if (!saved) throw new AppError("internal");
  return saved;
}

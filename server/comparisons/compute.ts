import "server-only";
import type { Actor } from "@/server/authz/actor";
import { assertInWorkspace } from "@/server/authz/scope";
import { AppError } from "@/server/errors";
import { getFitById } from "@/server/fits/store";
import { type CachedFit, getCachedFit } from "@/server/predict/fit-cache";
import { planDifference, type ScenarioPlan } from "@/server/predict/scenario-outcome";
import { getScenarioById } from "@/server/scenarios/store";
import type { VersionDto } from "@/server/scenarios/types";
import { latestSignoffsFor, signoffKey } from "@/server/signoffs/store";
import { checkVersionRefs, getComparisonRecord } from "./store";
import type { ComparisonColumnDto, ComparisonDifference, ComparisonDto, ComparisonFitDto, VersionRef } from "./types";
import { requireVersion } from "./versions";

const planOf = (version: VersionDto): ScenarioPlan => ({ allocation: version.allocation, controls: version.controls, horizon: version.horizon });

const iso = (value: Date | null) => (value ? value.toISOString() : null);

/**
 * The difference of a version from the baseline version with its own confidence interval.
 *
 * On one fit both expected totals come from the same estimates β̂, so their difference
 * (a_A − a_B)ᵀβ̂ has variance (a_A − a_B)ᵀ V (a_A − a_B) with V the fit's covariance: the predict
 * service's `planDifference` (engine `predictDifference`). Subtracting the two totals' intervals
 * would ignore that covariance and be far too wide. On two different fits the estimates have no
 * joint distribution, so there is no interval for the difference at all.
 */
export function differenceFromBaseline(
  column: { version: VersionDto; fitId: string; fitName: string },
  baseline: { version: VersionDto; fitId: string; fitName: string },
  fit: CachedFit | null,
): ComparisonDifference {
  if (column.fitId !== baseline.fitId || column.version.fitChecksum !== baseline.version.fitChecksum) {
    return {
      kind: "none",
      reason:
        column.fitId !== baseline.fitId
          ? `This version is predicted on the fit “${column.fitName}” and the baseline on “${baseline.fitName}”: no joint interval exists for the difference, so each outcome is shown alone.`
          : "The two versions were predicted from different records of the fit: no joint interval exists for the difference, so each outcome is shown alone.",
    };
  }
  if (!fit || fit.checksum !== column.version.fitChecksum) {
    return { kind: "none", reason: "The fit record these versions were predicted on is no longer available: no interval for the difference can be computed." };
  }
  const level = fit.record.confidenceLevel;
  const difference = planDifference(fit.record, fit.shape, planOf(column.version), planOf(baseline.version), level);
  return { kind: "joint", mean: difference.mean, confidence: difference.confidence, level, horizonsDiffer: column.version.horizon !== baseline.version.horizon };
}

/**
 * The side-by-side view of 2–4 versions of the actor's workspace: each version's spend, its saved
 * prediction (horizon total with CI and PI), warnings, fit and approval, sign-off decision, and its
 * difference from the baseline version (see `differenceFromBaseline`).
 */
export async function buildComparison(
  actor: Pick<Actor, "workspaceId">,
  input: { refs: VersionRef[]; baselinePosition: number; saved?: { id: string; name: string; createdByName: string | null; createdAt: string } },
): Promise<ComparisonDto> {
  await checkVersionRefs(actor, input.refs, input.baselinePosition);
  const loaded = await Promise.all(
    input.refs.map(async (ref) => {
      const { head, version } = await requireVersion(actor, ref.scenarioId, ref.version);
      return { head, version };
    }),
  );
  const fitIds = [...new Set(loaded.map((item) => item.head.fitId))];
  const fitRows = new Map(await Promise.all(fitIds.map(async (id) => [id, await getFitById(id)] as const)));
  const cached = new Map(await Promise.all(fitIds.map(async (id) => [id, await getCachedFit(id)] as const)));
  const scenarioIds = [...new Set(loaded.map((item) => item.head.id))];
  const latest = new Map(
    await Promise.all(scenarioIds.map(async (id) => [id, (await getScenarioById(id))?.latestVersion ?? 0] as const)),
  );
  const decisions = await latestSignoffsFor(input.refs);

  const fitOf = (fitId: string): ComparisonFitDto => {
    const row = fitRows.get(fitId);
    if (!row) throw new AppError("internal");
    return {
      id: row.id,
      name: row.name,
      status: row.status,
      approvedByName: row.approvedByName,
      approvedAt: iso(row.approvedAt),
      level: row.level,
    };
  };
  const baseline = loaded[input.baselinePosition];
  const baselineRef = { version: baseline.version, fitId: baseline.head.fitId, fitName: fitOf(baseline.head.fitId).name };

  const channels: { name: string; label: string }[] = [];
  for (const fitId of fitIds) {
    for (const channel of cached.get(fitId)?.shape.channels ?? []) {
      if (!channels.some((known) => known.name === channel.name)) channels.push({ name: channel.name, label: channel.label });
    }
  }
  for (const { version } of loaded) {
    for (const name of Object.keys(version.allocation)) if (!channels.some((known) => known.name === name)) channels.push({ name, label: name });
  }

  const columns: ComparisonColumnDto[] = loaded.map(({ head, version }, position) => {
    const fit = fitOf(head.fitId);
    const shape = cached.get(head.fitId)?.shape;
    return {
      position,
      scenarioId: head.id,
      scenarioName: head.name,
      version: version.number,
      latestVersion: latest.get(head.id) ?? version.number,
      note: version.note,
      savedByName: version.authorName,
      savedAt: version.createdAt,
      mode: version.mode,
      horizon: version.horizon,
      periodNoun: version.prediction.periodNoun ?? shape?.periodNoun ?? "period",
      allocation: version.allocation,
      totalSpend: version.total,
      controls: version.controls,
      outcome: version.prediction.horizonTotal,
      level: version.prediction.level,
      warnings: version.warnings,
      fit,
      outcomeShape: shape?.outcome ?? { name: "outcome", label: "Outcome", unit: null },
      difference:
        position === input.baselinePosition
          ? { kind: "baseline" }
          : differenceFromBaseline({ version, fitId: head.fitId, fitName: fit.name }, baselineRef, cached.get(head.fitId) ?? null),
      signoff: decisions.get(signoffKey(head.id, version.number)) ?? null,
    };
  });

  return {
    id: input.saved?.id ?? null,
    name: input.saved?.name ?? null,
    workspaceId: actor.workspaceId,
    createdByName: input.saved?.createdByName ?? null,
    createdAt: input.saved?.createdAt ?? null,
    baselinePosition: input.baselinePosition,
    channels,
    columns,
    oneFit: fitIds.length === 1,
  };
}

/** A saved comparison of the actor's workspace (404 otherwise), optionally against another baseline. */
export async function getComparisonView(actor: Pick<Actor, "workspaceId">, id: string, baselinePosition?: number): Promise<ComparisonDto> {
  const record = await getComparisonRecord(id);
  assertInWorkspace(actor, record, "comparison");
  const baseline = baselinePosition !== undefined && baselinePosition >= 0 && baselinePosition < record.versions.length ? baselinePosition : record.baselinePosition;
  return buildComparison(actor, {
    refs: record.versions,
    baselinePosition: baseline,
    saved: { id: record.id, name: record.name, createdByName: record.createdByName, createdAt: record.createdAt },
  });
}

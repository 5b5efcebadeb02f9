import "server-only";
import { asc, desc, eq, inArray } from "drizzle-orm";
import { db } from "@/db/client";
import { comparisonVersions, comparisons, scenarios, users } from "@/db/schema";
import type { Actor } from "@/server/authz";
import { recordAudit } from "@/server/data/audit";
import { AppError, type ErrorDetail } from "@/server/errors";
import { latestSignoffsFor, signoffKey } from "@/server/signoffs/store";
import type { ComparisonSummaryDto, VersionRef } from "./types";
import { requireVersion } from "./versions";

export const MIN_COLUMNS = 2;
export const MAX_COLUMNS = 4;

export type ComparisonRecord = {
  id: string;
  workspaceId: string;
  name: string;
  baselinePosition: number;
  createdById: string | null;
  createdByName: string | null;
  createdAt: string;
  versions: VersionRef[];
};

/**
 * 422 unless there are 2–4 distinct versions and the baseline is one of them; 404 for a scenario of
 * another workspace or a version that does not exist.
 */
export async function checkVersionRefs(actor: Pick<Actor, "workspaceId">, refs: VersionRef[], baselinePosition: number): Promise<void> {
  const details: ErrorDetail[] = [];
  if (refs.length < MIN_COLUMNS || refs.length > MAX_COLUMNS) {
    details.push({ path: "versions", message: `Pick ${MIN_COLUMNS} to ${MAX_COLUMNS} versions (got ${refs.length}).` });
  }
  const seen = new Set<string>();
  refs.forEach((ref, index) => {
    const key = `${ref.scenarioId}#${ref.version}`;
    if (seen.has(key)) details.push({ path: `versions.${index}`, message: "This version is already in the comparison." });
    seen.add(key);
  });
  if (!Number.isInteger(baselinePosition) || baselinePosition < 0 || baselinePosition >= refs.length) {
    details.push({ path: "baseline", message: `The baseline is the position of one of the versions (0 to ${Math.max(0, refs.length - 1)}).` });
  }
  if (details.length > 0) throw new AppError("invalid:comparison", details[0].message, { details });
  for (const ref of refs) await requireVersion(actor, ref.scenarioId, ref.version);
}

/** Saves a named comparison of 2–4 versions (checked as `checkVersionRefs`) with its audit entry. */
export async function createComparison(actor: Actor, input: { name: string; versions: VersionRef[]; baseline: number }): Promise<string> {
  await checkVersionRefs(actor, input.versions, input.baseline);
  const name = input.name.trim();
  if (name === "") throw new AppError("invalid:comparison", "Give the comparison a name.", { details: [{ path: "name", message: "Empty name." }] });
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(comparisons)
      .values({ workspaceId: actor.workspaceId, name, baselinePosition: input.baseline, createdBy: actor.userId })
      .returning({ id: comparisons.id });
    await tx.insert(comparisonVersions).values(
      input.versions.map((ref, position) => ({ comparisonId: row.id, position, scenarioId: ref.scenarioId, versionNumber: ref.version })),
    );
    await recordAudit(
      {
        workspaceId: actor.workspaceId,
        actorUserId: actor.userId,
        action: "comparison.created",
        objectType: "comparison",
        objectId: row.id,
        details: { name, versions: input.versions.map((ref) => `${ref.scenarioId}#${ref.version}`), baseline: input.baseline },
      },
      tx,
    );
    return row.id;
  });
}

/** A saved comparison with its versions in column order, or null. Callers check the workspace. */
export async function getComparisonRecord(id: string): Promise<ComparisonRecord | null> {
  const [row] = await db
    .select({
      id: comparisons.id,
      workspaceId: comparisons.workspaceId,
      name: comparisons.name,
      baselinePosition: comparisons.baselinePosition,
      createdById: comparisons.createdBy,
      createdByName: users.name,
      createdAt: comparisons.createdAt,
    })
    .from(comparisons)
    .leftJoin(users, eq(users.id, comparisons.createdBy))
    .where(eq(comparisons.id, id));
  if (!row) return null;
  const versions = await db
    .select({ scenarioId: comparisonVersions.scenarioId, version: comparisonVersions.versionNumber })
    .from(comparisonVersions)
    .where(eq(comparisonVersions.comparisonId, id))
    .orderBy(asc(comparisonVersions.position));
  return { ...row, createdAt: row.createdAt.toISOString(), versions };
}

/** The workspace's saved comparisons, newest first, each with its versions' sign-off decisions. */
export async function listComparisonsByWorkspace(workspaceId: string): Promise<ComparisonSummaryDto[]> {
  const rows = await db
    .select({
      id: comparisons.id,
      name: comparisons.name,
      baselinePosition: comparisons.baselinePosition,
      createdByName: users.name,
      createdAt: comparisons.createdAt,
    })
    .from(comparisons)
    .leftJoin(users, eq(users.id, comparisons.createdBy))
    .where(eq(comparisons.workspaceId, workspaceId))
    .orderBy(desc(comparisons.createdAt))
    .limit(200);
  if (rows.length === 0) return [];
  const versions = await db
    .select({
      comparisonId: comparisonVersions.comparisonId,
      scenarioId: comparisonVersions.scenarioId,
      version: comparisonVersions.versionNumber,
      scenarioName: scenarios.name,
    })
    .from(comparisonVersions)
    .innerJoin(scenarios, eq(scenarios.id, comparisonVersions.scenarioId))
    .where(inArray(comparisonVersions.comparisonId, rows.map((row) => row.id)))
    .orderBy(asc(comparisonVersions.comparisonId), asc(comparisonVersions.position));
  const decisions = await latestSignoffsFor(versions);
  return rows.map((row) => ({
    ...row,
    createdAt: row.createdAt.toISOString(),
    versions: versions
      .filter((version) => version.comparisonId === row.id)
      .map(({ comparisonId: _comparisonId, ...version }) => ({ ...version, decision: decisions.get(signoffKey(version.scenarioId, version.version))?.decision ?? null })),
  }));
}

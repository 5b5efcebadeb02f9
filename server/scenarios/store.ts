import "server-only";
import { and, asc, desc, eq, sql } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import { db } from "@/db/client";
import { users } from "@/db/schema/auth";
import { fits } from "@/db/schema/fits";
import { type ScenarioBaseline, type ScenarioVersionRow, scenarioVersions, scenarios } from "@/db/schema/scenarios";
import { recordAudit } from "@/server/data/audit";
import { centsToAmount } from "@/server/planning/allocation";
import type { ScenarioOutcome, ScenarioWarning } from "@/server/predict/scenario-outcome";
import { centsToAmounts } from "./start";
import type { ScenarioDto, ScenarioSummaryDto, VersionDto, VersionSummaryDto } from "./types";

const owners = alias(users, "owner");

const latestVersion = sql<number | null>`(select max(${scenarioVersions.number}) from ${scenarioVersions} where ${scenarioVersions.scenarioId} = ${scenarios.id})`;
const latestSavedAt = sql<string | null>`(select max(${scenarioVersions.createdAt}) from ${scenarioVersions} where ${scenarioVersions.scenarioId} = ${scenarios.id})`;

const summaryColumns = {
  id: scenarios.id,
  name: scenarios.name,
  fitId: scenarios.fitId,
  fitName: fits.name,
  fitStatus: fits.status,
  ownerName: owners.name,
  createdAt: scenarios.createdAt,
  horizon: scenarios.horizonPeriods,
  latestVersion,
  latestSavedAt,
};

function iso(value: Date | string | null): string | null {
  if (value === null) return null;
  return (value instanceof Date ? value : new Date(value)).toISOString();
}

type SummaryRow = { [K in keyof typeof summaryColumns]: unknown } & {
  id: string;
  name: string;
  fitId: string;
  fitName: string;
  fitStatus: string;
  ownerName: string | null;
  createdAt: Date;
  horizon: number;
  latestVersion: number | null;
  latestSavedAt: string | Date | null;
};

function toSummary(row: SummaryRow): ScenarioSummaryDto {
  return {
    id: row.id,
    name: row.name,
    fitId: row.fitId,
    fitName: row.fitName,
    fitStatus: row.fitStatus,
    ownerName: row.ownerName,
    createdAt: iso(row.createdAt) as string,
    horizon: row.horizon,
    latestVersion: row.latestVersion === null ? null : Number(row.latestVersion),
    latestSavedAt: iso(row.latestSavedAt),
  };
}

/** Creates a scenario (no version yet: the first save is version 1) and records it in the audit log. */
export async function createScenario(input: {
  workspaceId: string;
  fitId: string;
  name: string;
  ownerId: string;
  horizon: number;
  baseline: ScenarioBaseline;
}): Promise<string> {
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(scenarios)
      .values({
        workspaceId: input.workspaceId,
        fitId: input.fitId,
        name: input.name,
        ownerId: input.ownerId,
        horizonPeriods: input.horizon,
        baseline: input.baseline,
      })
      .returning({ id: scenarios.id });
    await recordAudit(
      {
        workspaceId: input.workspaceId,
        actorUserId: input.ownerId,
        action: "scenario.created",
        objectType: "scenario",
        objectId: row.id,
        details: { fitId: input.fitId, name: input.name, horizon: input.horizon },
      },
      tx,
    );
    return row.id;
  });
}

/** The workspace's scenarios, newest first, optionally on one fit. */
export async function listScenariosByWorkspace(input: { workspaceId: string; fitId?: string }): Promise<ScenarioSummaryDto[]> {
  const rows = await db
    .select(summaryColumns)
    .from(scenarios)
    .innerJoin(fits, eq(fits.id, scenarios.fitId))
    .leftJoin(owners, eq(owners.id, scenarios.ownerId))
    .where(input.fitId ? and(eq(scenarios.workspaceId, input.workspaceId), eq(scenarios.fitId, input.fitId)) : eq(scenarios.workspaceId, input.workspaceId))
    .orderBy(desc(scenarios.createdAt))
    .limit(500);
  return rows.map((row) => toSummary(row as SummaryRow));
}

/** One scenario with its baseline and version list, or null. Callers check the workspace. */
export async function getScenarioById(id: string): Promise<ScenarioDto | null> {
  const [row] = await db
    .select({ ...summaryColumns, workspaceId: scenarios.workspaceId, ownerId: scenarios.ownerId, baseline: scenarios.baseline })
    .from(scenarios)
    .innerJoin(fits, eq(fits.id, scenarios.fitId))
    .leftJoin(owners, eq(owners.id, scenarios.ownerId))
    .where(eq(scenarios.id, id));
  if (!row) return null;
  const baseline = row.baseline;
  return {
    ...toSummary(row as SummaryRow),
    workspaceId: row.workspaceId,
    ownerId: row.ownerId,
    baseline: {
      allocation: centsToAmounts(baseline.allocationCents),
      controls: baseline.controls,
      horizon: baseline.horizon,
      source: baseline.source,
      description: baseline.description,
      total: centsToAmount(Object.values(baseline.allocationCents).reduce((sum, cents) => sum + cents, 0)),
    },
    versions: await listVersionSummaries(id),
  };
}

/** The raw baseline (cents) of a scenario, for saves. */
export async function getScenarioHead(id: string) {
  const [row] = await db
    .select({ id: scenarios.id, workspaceId: scenarios.workspaceId, fitId: scenarios.fitId, name: scenarios.name, baseline: scenarios.baseline })
    .from(scenarios)
    .where(eq(scenarios.id, id));
  return row ?? null;
}

/** Versions of a scenario, oldest first. */
export async function listVersionSummaries(scenarioId: string): Promise<VersionSummaryDto[]> {
  const rows = await db
    .select({
      number: scenarioVersions.number,
      mode: scenarioVersions.mode,
      totalCents: scenarioVersions.totalCents,
      horizon: scenarioVersions.horizonPeriods,
      note: scenarioVersions.note,
      authorName: users.name,
      createdAt: scenarioVersions.createdAt,
      basedOn: scenarioVersions.basedOn,
      restoredFrom: scenarioVersions.restoredFrom,
      horizonTotal: sql<ScenarioOutcome["horizonTotal"]>`${scenarioVersions.prediction} -> 'horizonTotal'`,
      warnings: scenarioVersions.warnings,
    })
    .from(scenarioVersions)
    .leftJoin(users, eq(users.id, scenarioVersions.authorId))
    .where(eq(scenarioVersions.scenarioId, scenarioId))
    .orderBy(asc(scenarioVersions.number));
  return rows.map((row) => ({
    number: row.number,
    mode: row.mode,
    total: centsToAmount(row.totalCents),
    horizon: row.horizon,
    note: row.note,
    authorName: row.authorName,
    createdAt: iso(row.createdAt) as string,
    basedOn: row.basedOn,
    restoredFrom: row.restoredFrom,
    horizonTotal: row.horizonTotal,
    warningKinds: [...new Set((row.warnings as ScenarioWarning[]).map((warning) => warning.kind))],
  }));
}

function toVersionDto(row: ScenarioVersionRow & { authorName: string | null }): VersionDto {
  return {
    scenarioId: row.scenarioId,
    number: row.number,
    allocation: centsToAmounts(row.allocation),
    controls: row.controls,
    horizon: row.horizonPeriods,
    mode: row.mode,
    total: centsToAmount(row.totalCents),
    ceiling: row.ceilingCents === null ? null : centsToAmount(row.ceilingCents),
    settings: row.settings,
    prediction: row.prediction as unknown as ScenarioOutcome,
    warnings: row.warnings as unknown as ScenarioWarning[],
    fitChecksum: row.fitChecksum,
    note: row.note,
    authorId: row.authorId,
    authorName: row.authorName,
    createdAt: iso(row.createdAt) as string,
    basedOn: row.basedOn,
    restoredFrom: row.restoredFrom,
  };
}

/** One version with its plan and the server's prediction snapshot, or null. */
export async function getScenarioVersion(scenarioId: string, number: number): Promise<VersionDto | null> {
  const [row] = await db
    .select({ version: scenarioVersions, authorName: users.name })
    .from(scenarioVersions)
    .leftJoin(users, eq(users.id, scenarioVersions.authorId))
    .where(and(eq(scenarioVersions.scenarioId, scenarioId), eq(scenarioVersions.number, number)));
  return row ? toVersionDto({ ...row.version, authorName: row.authorName }) : null;
}

/** The raw row (cents) of a version, for restoring it. */
export async function getScenarioVersionRow(scenarioId: string, number: number): Promise<ScenarioVersionRow | null> {
  const [row] = await db
    .select()
    .from(scenarioVersions)
    .where(and(eq(scenarioVersions.scenarioId, scenarioId), eq(scenarioVersions.number, number)));
  return row ?? null;
}

/** Approved fits of a workspace, newest approval first: what a scenario can start from. */
export async function listApprovedFits(workspaceId: string): Promise<{ id: string; name: string; approvedAt: string | null }[]> {
  const rows = await db
    .select({ id: fits.id, name: fits.name, approvedAt: fits.approvedAt })
    .from(fits)
    .where(and(eq(fits.workspaceId, workspaceId), eq(fits.status, "approved")))
    .orderBy(desc(fits.approvedAt))
    .limit(100);
  return rows.map((row) => ({ id: row.id, name: row.name, approvedAt: iso(row.approvedAt) }));
}

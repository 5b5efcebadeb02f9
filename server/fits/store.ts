import "server-only";
import { and, desc, eq, inArray, sql } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import { db } from "@/db/client";
import { auditLog, datasets, fits, users, type FitRow } from "@/db/schema";
import { recordAudit, type DbExecutor } from "@/server/data/audit";
import type { FitRecord, ModelSpecification } from "@/server/stats";
import type { CovarianceInput, FitDto, FitInput, FitReport, FitStatus, FitSummaryDto, FitTrailEntry, HeldOutSummary } from "./types";

const approvers = alias(users, "approvers");

const summaryColumns = {
  id: fits.id,
  workspaceId: fits.workspaceId,
  name: fits.name,
  status: fits.status,
  datasetId: fits.datasetId,
  datasetName: datasets.name,
  outcome: sql<string>`${fits.specification} ->> 'outcome'`,
  termCount: sql<number>`jsonb_array_length(${fits.specification} -> 'terms')`,
  n: sql<number>`(${fits.record} ->> 'observationCount')::int`,
  rSquared: sql<number>`(${fits.record} -> 'summary' ->> 'rSquared')::float8`,
  authorId: fits.authorId,
  authorName: users.name,
  createdAt: fits.createdAt,
  updatedAt: fits.updatedAt,
  submittedAt: fits.submittedAt,
  approvedAt: fits.approvedAt,
  retiredAt: fits.retiredAt,
};

/** Fits of a workspace, newest change first, optionally of some states only. */
export async function listFitsByWorkspaceId(input: { workspaceId: string; statuses?: FitStatus[] }): Promise<FitSummaryDto[]> {
  const conditions = [eq(fits.workspaceId, input.workspaceId)];
  if (input.statuses?.length) conditions.push(inArray(fits.status, input.statuses));
  const rows = await db
    .select(summaryColumns)
    .from(fits)
    .leftJoin(datasets, eq(datasets.id, fits.datasetId))
    .leftJoin(users, eq(users.id, fits.authorId))
    .where(and(...conditions))
    .orderBy(desc(fits.updatedAt));
  return rows.map(({ workspaceId: _workspaceId, ...summary }) => summary);
}

/** A fit with its report, or null. Callers check the workspace with assertInWorkspace (404 for others). */
export async function getFitById(id: string, executor: DbExecutor = db): Promise<FitDto | null> {
  const [row] = await executor
    .select({
      ...summaryColumns,
      specification: fits.specification,
      input: fits.input,
      level: fits.confidenceLevel,
      covarianceType: fits.covarianceType,
      neweyWestLag: fits.neweyWestLag,
      recordChecksum: fits.recordChecksum,
      approvedBy: fits.approvedBy,
      approvedByName: approvers.name,
      report: fits.report,
    })
    .from(fits)
    .leftJoin(datasets, eq(datasets.id, fits.datasetId))
    .leftJoin(users, eq(users.id, fits.authorId))
    .leftJoin(approvers, eq(approvers.id, fits.approvedBy))
    .where(eq(fits.id, id));
  if (!row) return null;
  const { covarianceType, neweyWestLag, ...rest } = row;
  return {
    ...rest,
    specification: row.specification as unknown as ModelSpecification,
    input: row.input as unknown as FitInput,
    covariance: { type: covarianceType as FitDto["covariance"]["type"], lag: neweyWestLag },
    report: row.report as unknown as FitReport,
  };
}

/**
 * The held-out check's outcome of a fit (not its rows), read out of the stored report without loading the
 * rest of it: the scenario room shows it beside the intervals. Null for reports stored before the check.
 */
export async function getFitHoldoutSummary(input: { workspaceId: string; id: string }): Promise<HeldOutSummary | null> {
  const [row] = await db
    .select({
      status: sql<string | null>`${fits.report} -> 'holdout' ->> 'status'`,
      inside: sql<number | null>`(${fits.report} -> 'holdout' ->> 'inside')::int`,
      periods: sql<number | null>`(${fits.report} -> 'holdout' ->> 'periods')::int`,
      level: sql<number | null>`(${fits.report} -> 'holdout' ->> 'level')::float8`,
      fewer: sql<boolean | null>`(${fits.report} -> 'holdout' ->> 'fewerInsideThanExpected')::boolean`,
    })
    .from(fits)
    .where(and(eq(fits.id, input.id), eq(fits.workspaceId, input.workspaceId)));
  if (!row || row.status !== "done" || row.inside === null || row.periods === null || row.level === null) return null;
  return { inside: row.inside, periods: row.periods, level: row.level, fewerInsideThanExpected: row.fewer === true };
}

/** The stored fit record (what prediction reads); verify it with parseFitRecord before use. */
export async function getFitRecordById(input: { workspaceId: string; id: string }): Promise<{ status: FitStatus; record: unknown } | null> {
  const [row] = await db
    .select({ status: fits.status, record: fits.record })
    .from(fits)
    .where(and(eq(fits.id, input.id), eq(fits.workspaceId, input.workspaceId)));
  return row ?? null;
}

/** The raw row, locked for update inside a transaction (state transitions). */
export async function lockFitRow(tx: DbExecutor, id: string): Promise<FitRow | null> {
  const [row] = await tx.select().from(fits).where(eq(fits.id, id)).for("update");
  return row ?? null;
}

export type StoredNumbers = {
  specification: ModelSpecification;
  input: FitInput;
  level: number;
  covariance: CovarianceInput;
  record: FitRecord;
  report: FitReport;
};

function numbersColumns(numbers: StoredNumbers) {
  return {
    specification: numbers.specification as unknown as Record<string, unknown>,
    input: numbers.input as unknown as Record<string, unknown>,
    confidenceLevel: numbers.level,
    covarianceType: numbers.record.covarianceType,
    neweyWestLag: numbers.record.neweyWestLag,
    record: numbers.record as unknown as Record<string, unknown>,
    report: numbers.report as unknown as Record<string, unknown>,
    recordChecksum: numbers.record.checksum,
  };
}

/** Stores a new draft fit and its "fit.created" audit entry in one transaction; returns its id. */
export async function insertDraftFit(input: StoredNumbers & { workspaceId: string; datasetId: string; name: string; authorId: string }): Promise<string> {
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(fits)
      .values({ workspaceId: input.workspaceId, datasetId: input.datasetId, name: input.name, authorId: input.authorId, status: "draft", ...numbersColumns(input) })
      .returning({ id: fits.id });
    await recordAudit(
      {
        workspaceId: input.workspaceId,
        actorUserId: input.authorId,
        action: "fit.created",
        objectType: "fit",
        objectId: row.id,
        details: { name: input.name, to: "draft", datasetId: input.datasetId, checksum: input.record.checksum },
      },
      tx,
    );
    return row.id;
  });
}

/** Replaces a draft's numbers (a refit); the caller has checked the state under a row lock. */
export async function updateFitNumbers(tx: DbExecutor, input: StoredNumbers & { id: string; datasetId: string; name: string }): Promise<void> {
  await tx
    .update(fits)
    .set({ datasetId: input.datasetId, name: input.name, ...numbersColumns(input), updatedAt: new Date() })
    .where(eq(fits.id, input.id));
}

/** The review trail of a fit: its audit entries, oldest first. */
export async function listFitTrail(input: { workspaceId: string; fitId: string }): Promise<FitTrailEntry[]> {
  const rows = await db
    .select({ id: auditLog.id, at: auditLog.at, action: auditLog.action, actorName: users.name, actorEmail: users.email, details: auditLog.details })
    .from(auditLog)
    .leftJoin(users, eq(users.id, auditLog.actorUserId))
    .where(and(eq(auditLog.workspaceId, input.workspaceId), eq(auditLog.objectType, "fit"), eq(auditLog.objectId, input.fitId)))
    .orderBy(auditLog.at, auditLog.id);
  return rows.map((row) => ({
    id: row.id,
    at: row.at,
    action: row.action,
    actorName: row.actorName,
    actorEmail: row.actorEmail,
    from: (row.details.from as FitStatus | undefined) ?? null,
    to: (row.details.to as FitStatus | undefined) ?? null,
    comment: typeof row.details.comment === "string" ? row.details.comment : null,
  }));
}

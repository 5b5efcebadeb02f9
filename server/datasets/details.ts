import "server-only";
import { getDatabase } from "@/db/client";

/**
 * What a spend history's page and API show besides the dataset itself: the people who uploaded it and
 * assigned its roles, the fits built on it, and its audit trail. Reads are scoped to the workspace.
 */

export type DatasetPeopleDto = Record<string, { name: string | null; email: string }>;

export async function getPeopleByIds(ids: (string | null)[]): Promise<DatasetPeopleDto> {
  const wanted = [...new Set(ids.filter((id): id is string => !!id))];
  if (wanted.length === 0) return {};
  const { sql } = getDatabase();
  const rows = await sql<{ id: string; name: string | null; email: string }[]>`select id, name, email from "user" where id = any(${wanted})`;
  return Object.fromEntries(rows.map((r) => [r.id, { name: r.name, email: r.email }]));
}

export type DatasetFitDto = { id: string; name: string; status: string; updatedAt: string };

/** Fits built on the dataset, newest first. */
export async function listFitsOfDataset(params: { workspaceId: string; datasetId: string }): Promise<DatasetFitDto[]> {
  const { sql } = getDatabase();
  const rows = await sql<{ id: string; name: string; status: string; updated_at: Date }[]>`
    select id, name, status, updated_at from fits
    where workspace_id = ${params.workspaceId} and dataset_id = ${params.datasetId}
    order by updated_at desc limit 100`;
  return rows.map((r) => ({ id: r.id, name: r.name, status: r.status, updatedAt: new Date(r.updated_at).toISOString() }));
}

/** True when an approved or retired fit uses the dataset: its roles, rows and file are then frozen. */
export const isFrozenByFit = (fits: DatasetFitDto[]) => fits.some((f) => f.status === "approved" || f.status === "retired");

export type DatasetAuditEntryDto = { at: string; action: string; actorName: string | null; details: Record<string, unknown> };

export async function listDatasetAudit(params: { workspaceId: string; datasetId: string }): Promise<DatasetAuditEntryDto[]> {
  const { sql } = getDatabase();
  const rows = await sql<{ at: Date; action: string; actor_name: string | null; actor_email: string | null; details: Record<string, unknown> }[]>`
    select a.at, a.action, u.name as actor_name, u.email as actor_email, a.details
    from audit_log a left join "user" u on u.id = a.actor_user_id
    where a.workspace_id = ${params.workspaceId} and a.object_type = 'dataset' and a.object_id = ${params.datasetId}
    order by a.at, a.id limit 50`;
  return rows.map((r) => ({ at: new Date(r.at).toISOString(), action: r.action, actorName: r.actor_name ?? r.actor_email, details: r.details ?? {} }));
}

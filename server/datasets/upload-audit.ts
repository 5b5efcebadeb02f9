import "server-only";
import type postgres from "postgres";

/**
 * Audit entries of spend histories, written inside the transaction that makes the change (the
 * `beforeCommit` hooks of createDataset and assignDatasetRoles), so an entry exists exactly when the
 * change does. Phrases for the home page's recent activity are in ui/audit-event.ts.
 */

/** "dataset.uploaded" with the name, file name, rows, bytes and sha256 read from the new dataset row. */
export async function recordDatasetUploaded(tx: postgres.TransactionSql, params: { datasetId: string; actorUserId: string | null; via: "inline" | "background" }) {
  await tx`
    insert into audit_log (workspace_id, actor_user_id, action, object_type, object_id, details)
    select workspace_id, ${params.actorUserId}, 'dataset.uploaded', 'dataset', id::text,
           jsonb_build_object('name', name, 'filename', original_filename, 'rows', row_count, 'columns', column_count,
                              'bytes', byte_size, 'sha256', sha256, 'status', status, 'via', ${params.via}::text)
    from datasets where id = ${params.datasetId}`;
}

/** "dataset.roles_assigned" with who is outcome, spend, control and period, and the missing-value policy. */
export async function recordDatasetRolesAssigned(
  tx: postgres.TransactionSql,
  params: { datasetId: string; actorUserId: string | null; roles: Record<string, { role: string; unit?: string }> },
) {
  const named = (role: string) => Object.entries(params.roles).filter(([, a]) => a.role === role).map(([name]) => name);
  const summary = { outcome: named("outcome")[0] ?? null, spend: named("spend"), controls: named("control"), period: named("period")[0] ?? null };
  await tx`
    insert into audit_log (workspace_id, actor_user_id, action, object_type, object_id, details)
    select workspace_id, ${params.actorUserId}, 'dataset.roles_assigned', 'dataset', id::text,
           ${JSON.stringify(summary)}::jsonb || jsonb_build_object('name', name, 'missingPolicy', missing_policy, 'droppedRows', dropped_row_count)
    from datasets where id = ${params.datasetId}`;
}

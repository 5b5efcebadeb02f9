// Test fixture: the demo company's weekly history stored as a dataset and an approved fit on it
// (sales on six channels and the promotion-week control), written straight into the database the
// way the upload and review flows leave them. Each call makes a new dataset and fit, so test files
// do not depend on each other or on the seed.
import { createHash, randomUUID } from "node:crypto";
import type { Sql } from "postgres";
import { demoChannels, demoControl, demoOutcome, demoPeriod, generateDemoHistory, type DemoWeek } from "@/seed/history";
import { type FitRecord, type ModelSpecification, createFitRecord, fitModel } from "@/server/stats";

export const demoSpecification: ModelSpecification = {
  outcome: demoOutcome.column,
  intercept: true,
  terms: [...demoChannels.map((channel) => ({ kind: "linear" as const, column: channel.column })), { kind: "control" as const, column: demoControl.column }],
};

export type ApprovedFit = {
  fitId: string;
  datasetId: string;
  workspaceId: string;
  record: FitRecord;
  rows: DemoWeek[];
  columns: string[];
};

const dayNumber = (iso: string) => Date.parse(`${iso}T00:00:00Z`) / 86_400_000;

/**
 * Inserts the demo history and a fit of it (approved unless `status` says otherwise) into a
 * workspace; `authorId` built it, `approverId` approved it (they must differ).
 */
export async function createApprovedDemoFit(
  sql: Sql,
  options: { workspaceId: string; authorId: string; approverId: string; name?: string; status?: "approved" | "draft" },
): Promise<ApprovedFit> {
  const workspace = { id: options.workspaceId };
  const analyst = options.authorId;
  const reviewer = options.approverId;
  const rows = generateDemoHistory();
  const columns = [demoPeriod.column, ...demoChannels.map((channel) => channel.column), demoControl.column, demoOutcome.column];
  const datasetId = randomUUID();
  const fitId = randomUUID();

  const named: Record<string, number[]> = {};
  for (const column of columns.slice(1)) named[column] = rows.map((row) => row[column as keyof DemoWeek] as number);
  const record = createFitRecord(fitModel(demoSpecification, named));

  await sql.begin(async (tx) => {
    await tx`
      insert into datasets (id, workspace_id, name, original_filename, byte_size, sha256, row_count, column_count, delimiter, has_bom, line_ending, status, uploaded_by)
      values (${datasetId}, ${workspace.id}, ${"Larkspur weekly history (test)"}, ${"larkspur-weekly.csv"}, ${1000}, ${createHash("sha256").update(datasetId).digest("hex")},
              ${rows.length}, ${columns.length}, ${","}, ${false}, ${"lf"}, ${"ready"}, ${analyst})`;
    for (const [index, column] of columns.entries()) {
      const role = index === 0 ? "period" : column === demoOutcome.column ? "outcome" : column === demoControl.column ? "control" : "spend";
      const unit = role === "spend" || role === "outcome" ? "EUR" : null;
      await tx`
        insert into dataset_columns (dataset_id, position, name, kind, role, unit, numeric_count, text_count, missing_count, first_period, last_period)
        values (${datasetId}, ${index + 1}, ${column}, ${index === 0 ? "period" : "numeric"}, ${role}, ${unit}, ${rows.length}, ${0}, ${0},
                ${index === 0 ? rows[0].week_start : null}, ${index === 0 ? rows.at(-1)!.week_start : null})`;
    }
    for (const [index, row] of rows.entries()) {
      const numbers = [dayNumber(row.week_start), ...columns.slice(1).map((column) => row[column as keyof DemoWeek] as number)];
      await tx`insert into dataset_rows (dataset_id, row_number, line, numbers) values (${datasetId}, ${index + 1}, ${index + 2}, ${numbers}::float8[])`;
    }
    const approved = (options.status ?? "approved") === "approved";
    await tx`
      insert into fits (id, workspace_id, dataset_id, name, status, specification, input, covariance_type, confidence_level, record, report, record_checksum,
                        author_id, submitted_at, approved_at, approved_by)
      values (${fitId}, ${workspace.id}, ${datasetId}, ${options.name ?? "Weekly sales on channel spend (test)"}, ${options.status ?? "approved"},
              ${JSON.stringify(demoSpecification)}::jsonb, ${"{}"}::jsonb, ${"classical"}, ${0.95}, ${JSON.stringify(record)}::jsonb, ${"{}"}::jsonb,
              ${record.checksum}, ${analyst}, ${approved ? new Date().toISOString() : null}::timestamptz, ${approved ? new Date().toISOString() : null}::timestamptz, ${approved ? reviewer : null})`;
  });
  return { fitId, datasetId, workspaceId: workspace.id, record, rows, columns };
}

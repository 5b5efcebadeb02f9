// Uploaded spend histories: the dataset, its original file (byte for byte, for audit), one row per
// column with its role and profile, and the parsed rows. Written by server/datasets/store.ts only.
import { sql } from "drizzle-orm";
import {
  bigint,
  boolean,
  check,
  customType,
  doublePrecision,
  index,
  integer,
  pgTable,
  primaryKey,
  text,
  timestamp,
  uuid,
} from "drizzle-orm/pg-core";
import { users } from "./auth";
import { workspaces } from "./workspaces";

const bytea = customType<{ data: Buffer; driverData: Buffer }>({ dataType: () => "bytea" });

export const datasetStatuses = ["needs-roles", "ready"] as const;
export type DatasetStatus = (typeof datasetStatuses)[number];

export const datasets = pgTable(
  "datasets",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    workspaceId: uuid("workspace_id")
      .notNull()
      .references(() => workspaces.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    originalFilename: text("original_filename").notNull(),
    byteSize: bigint("byte_size", { mode: "number" }).notNull(),
    /** Hex sha256 of the original file. */
    sha256: text("sha256").notNull(),
    rowCount: integer("row_count").notNull(),
    columnCount: integer("column_count").notNull(),
    /** "," ";" or a tab. */
    delimiter: text("delimiter").notNull(),
    hasBom: boolean("has_bom").notNull(),
    lineEnding: text("line_ending").$type<"lf" | "crlf" | "cr">().notNull(),
    /** "needs-roles" until roles pass the role-dependent checks, then "ready". */
    status: text("status").$type<DatasetStatus>().notNull(),
    missingPolicy: text("missing_policy").$type<"reject" | "drop-incomplete-rows">().notNull().default("reject"),
    /** Rows left out of fits by the drop-incomplete-rows policy (rows stay stored). */
    droppedRowCount: integer("dropped_row_count").notNull().default(0),
    minRows: integer("min_rows"),
    dateOrder: text("date_order").$type<"YMD" | "DMY" | "MDY">().notNull().default("YMD"),
    uploadedBy: text("uploaded_by").references(() => users.id, { onDelete: "set null" }),
    uploadedAt: timestamp("uploaded_at", { withTimezone: true }).notNull().defaultNow(),
    rolesAssignedBy: text("roles_assigned_by").references(() => users.id, { onDelete: "set null" }),
    rolesAssignedAt: timestamp("roles_assigned_at", { withTimezone: true }),
  },
  (table) => [
    index("datasets_workspace_uploaded_idx").on(table.workspaceId, table.uploadedAt),
    index("datasets_workspace_sha256_idx").on(table.workspaceId, table.sha256),
    check("datasets_status_check", sql`${table.status} in ('needs-roles', 'ready')`),
    check("datasets_missing_policy_check", sql`${table.missingPolicy} in ('reject', 'drop-incomplete-rows')`),
    check("datasets_sha256_check", sql`${table.sha256} ~ '^[0-9a-f]{64}$'`),
    // chr(59) is ";" and chr(9) a tab (drizzle-kit mangles both inside check SQL)
    check("datasets_delimiter_check", sql`${table.delimiter} in (',', chr(59), chr(9))`),
  ],
);

/**
 * The original file in 1 MiB chunks (seq 0, 1, …), stored uncompressed (STORAGE EXTERNAL, set in the
 * migration): CSV holds little that pglz gains on, and pglz made a 130 MB file take 8 s instead of 1.4 s.
 * Chunks rather than one bytea: a download streams them in order without holding 100+ MB in memory.
 *
 * A large upload writes its chunks here while it arrives, under the upload's id (dataset_uploads.id);
 * the dataset its ingest creates takes that id, so the file is adopted, never copied. Until then the
 * chunks have no dataset: no foreign key on purpose. A trigger on datasets deletes a dataset's chunks
 * with it; the staging code deletes the chunks of uploads that never became a dataset
 * (server/datasets/staging.ts).
 */
export const datasetFiles = pgTable(
  "dataset_files",
  {
    datasetId: uuid("dataset_id").notNull(),
    seq: integer("seq").notNull(),
    bytes: bytea("bytes").notNull(),
  },
  (table) => [primaryKey({ name: "dataset_files_pkey", columns: [table.datasetId, table.seq] })],
);

export const datasetColumns = pgTable(
  "dataset_columns",
  {
    datasetId: uuid("dataset_id")
      .notNull()
      .references(() => datasets.id, { onDelete: "cascade" }),
    /** 1-based column number: `dataset_rows.numbers[position]` is this column's number. */
    position: integer("position").notNull(),
    name: text("name").notNull(),
    kind: text("kind").$type<"numeric" | "period" | "text">().notNull(),
    /** outcome | spend | control | period | ignored; null until roles are assigned. */
    role: text("role").$type<"outcome" | "spend" | "control" | "period" | "ignored">(),
    /** Currency code (ISO 4217) for money, or a unit such as "orders". */
    unit: text("unit"),
    numericCount: integer("numeric_count").notNull(),
    textCount: integer("text_count").notNull(),
    missingCount: integer("missing_count").notNull(),
    min: doublePrecision("min"),
    max: doublePrecision("max"),
    mean: doublePrecision("mean"),
    std: doublePrecision("std"),
    firstPeriod: text("first_period"),
    lastPeriod: text("last_period"),
    sample: text("sample").array().notNull().default(sql`'{}'::text[]`),
  },
  (table) => [
    primaryKey({ name: "dataset_columns_pkey", columns: [table.datasetId, table.position] }),
    check("dataset_columns_kind_check", sql`${table.kind} in ('numeric', 'period', 'text')`),
    check(
      "dataset_columns_role_check",
      sql`${table.role} is null or ${table.role} in ('outcome', 'spend', 'control', 'period', 'ignored')`,
    ),
  ],
);

/**
 * One row per data row of the file, loaded with binary COPY. `numbers[k]` is column k's number (NULL
 * when missing or not a number); `texts[k]` column k's text when the cell is not a number (NULL
 * otherwise; trailing NULLs left out, the whole array NULL when the row has no text).
 *
 * No foreign key to datasets on purpose: PostgreSQL checks a foreign key with one trigger call per
 * inserted row, which made COPY of 1,000,000 rows 3-4x slower (measured 12-18 s instead of 3-4 s).
 * A trigger on datasets (see the migration) deletes a dataset's rows with it, and rows are only ever
 * written in the transaction that creates their dataset.
 */
export const datasetRows = pgTable(
  "dataset_rows",
  {
    datasetId: uuid("dataset_id").notNull(),
    /** 1-based data row (blank lines not counted). */
    rowNumber: integer("row_number").notNull(),
    /** The file line the row starts on. */
    line: integer("line").notNull(),
    numbers: doublePrecision("numbers").array().notNull(),
    texts: text("texts").array(),
  },
  (table) => [primaryKey({ name: "dataset_rows_pkey", columns: [table.datasetId, table.rowNumber] })],
);

export type DatasetRecord = typeof datasets.$inferSelect;
export type DatasetColumnRecord = typeof datasetColumns.$inferSelect;

// Large uploads on their way to becoming a dataset: the web server streams the request body into
// PostgreSQL chunks here while a worker (any machine) reads them, parses, checks and stores the dataset
// (server/datasets/staging.ts, server/jobs/handlers/dataset-ingest.ts). Rows live only while an upload
// is received and ingested: the ingest deletes them whatever the outcome, so nothing of a failed or
// interrupted upload stays behind.
import { sql } from "drizzle-orm";
import { bigint, check, customType, index, integer, jsonb, pgTable, primaryKey, text, timestamp, uuid } from "drizzle-orm/pg-core";
import { users } from "./auth";
import { workspaces } from "./workspaces";

const bytea = customType<{ data: Buffer; driverData: Buffer }>({ dataType: () => "bytea" });

export const datasetUploadStates = ["receiving", "received", "aborted"] as const;
export type DatasetUploadState = (typeof datasetUploadStates)[number];

export const datasetUploads = pgTable(
  "dataset_uploads",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    workspaceId: uuid("workspace_id")
      .notNull()
      .references(() => workspaces.id, { onDelete: "cascade" }),
    createdBy: text("created_by").references(() => users.id, { onDelete: "set null" }),
    originalFilename: text("original_filename").notNull(),
    /** Display name asked for by the uploader (null: from the file name). */
    name: text("name"),
    /** The upload options (datasetOptionsSchema input: roles, missingPolicy, dateOrder, …). */
    options: jsonb("options").$type<Record<string, unknown>>().notNull().default({}),
    /** Content-Length of the file when the client sent one. */
    declaredBytes: bigint("declared_bytes", { mode: "number" }),
    receivedBytes: bigint("received_bytes", { mode: "number" }).notNull().default(0),
    /** Chunks written so far; final once `state` is "received". */
    chunkCount: integer("chunk_count").notNull().default(0),
    state: text("state").$type<DatasetUploadState>().notNull().default("receiving"),
    /** Why an upload was aborted (client went away, over the size limit, …). */
    abortReason: text("abort_reason"),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    /** Touched with every chunk: a "receiving" upload untouched for long belongs to a web server that died. */
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [
    index("dataset_uploads_updated_idx").on(table.updatedAt),
    check("dataset_uploads_state_check", sql`${table.state} in ('receiving', 'received', 'aborted')`),
  ],
);

/** The received bytes in order (seq 0, 1, …), a few MiB each, stored uncompressed (set in the migration). */
export const datasetUploadChunks = pgTable(
  "dataset_upload_chunks",
  {
    uploadId: uuid("upload_id")
      .notNull()
      .references(() => datasetUploads.id, { onDelete: "cascade" }),
    seq: integer("seq").notNull(),
    bytes: bytea("bytes").notNull(),
  },
  (table) => [primaryKey({ name: "dataset_upload_chunks_pkey", columns: [table.uploadId, table.seq] })],
);

export type DatasetUploadRecord = typeof datasetUploads.$inferSelect;

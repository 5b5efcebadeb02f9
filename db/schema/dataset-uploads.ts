// Large uploads on their way to becoming a dataset: the web server streams the request body into
// PostgreSQL (1 MiB chunks in dataset_files under the upload's id) while a worker (any machine) reads
// them, parses, checks and stores the dataset, which takes the upload's id and with it the chunks as its
// original file (server/datasets/staging.ts, server/jobs/handlers/dataset-ingest.ts). A row here lives
// only while its upload is received and ingested: the ingest deletes it whatever the outcome, with the
// chunks when no dataset adopted them, so nothing of a failed or interrupted upload stays behind.
import { sql } from "drizzle-orm";
import { bigint, check, index, integer, jsonb, pgTable, text, timestamp, uuid } from "drizzle-orm/pg-core";
import { users } from "./auth";
import { workspaces } from "./workspaces";

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
    /** Chunks (dataset_files rows under this id) written so far; final once `state` is "received". */
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

export type DatasetUploadRecord = typeof datasetUploads.$inferSelect;

// Background work the browser waits on (parsing a large upload, fitting). pg-boss dispatches the work
// (its own `pgboss` schema, created by pg-boss itself); this table is what users and the UI see of it.
import { index, jsonb, pgTable, text, timestamp, uuid } from "drizzle-orm/pg-core";
import { users } from "./auth";
import { workspaces } from "./workspaces";

export const jobStatuses = ["queued", "running", "succeeded", "failed"] as const;
export type JobStatus = (typeof jobStatuses)[number];

export type JobProgress = { phase: string; done: number; total: number | null; message?: string };

export const jobRuns = pgTable(
  "job_runs",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    workspaceId: uuid("workspace_id")
      .notNull()
      .references(() => workspaces.id, { onDelete: "cascade" }),
    kind: text("kind").notNull(),
    status: text("status").$type<JobStatus>().notNull().default("queued"),
    input: jsonb("input").$type<Record<string, unknown>>().notNull(),
    progress: jsonb("progress").$type<JobProgress>(),
    result: jsonb("result").$type<Record<string, unknown>>(),
    error: jsonb("error").$type<{ message: string; details?: unknown[] }>(),
    createdBy: text("created_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    startedAt: timestamp("started_at", { withTimezone: true }),
    finishedAt: timestamp("finished_at", { withTimezone: true }),
  },
  (table) => [index("job_runs_workspace_idx").on(table.workspaceId, table.createdAt)],
);

export type JobRun = typeof jobRuns.$inferSelect;

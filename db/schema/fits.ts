// Fits: a regression of a dataset's outcome on its spend channels and controls, with the engine's
// fit record and the full report. Approved and retired fits are frozen by triggers
// (db/migrations/*_freeze_approved_fits.sql): their numbers cannot change and they cannot be deleted.
import { sql } from "drizzle-orm";
import { check, doublePrecision, index, integer, jsonb, pgTable, text, timestamp, uuid } from "drizzle-orm/pg-core";
import { users } from "./auth";
import { datasets } from "./datasets";
import { workspaces } from "./workspaces";

/** Fit states (UI words: Draft · In review · Changes requested · Approved · Retired). */
export const fitStatuses = ["draft", "in_review", "changes_requested", "approved", "retired"] as const;
export type FitStatus = (typeof fitStatuses)[number];

export const covarianceTypes = ["classical", "hc3", "newey-west"] as const;

export const fits = pgTable(
  "fits",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    // No cascade: deleting a workspace must not silently take approved fits with it.
    workspaceId: uuid("workspace_id")
      .notNull()
      .references(() => workspaces.id),
    // Drafts go with their dataset; approved fits keep it (the freeze triggers refuse the deletion).
    datasetId: uuid("dataset_id")
      .notNull()
      .references(() => datasets.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    status: text("status").$type<FitStatus>().notNull().default("draft"),
    /** The engine's ModelSpecification (outcome, terms with their kinds, intercept). */
    specification: jsonb("specification").$type<Record<string, unknown>>().notNull(),
    /** The analyst's request as the builder sent it (terms, transforms, interactions), for refits. */
    input: jsonb("input").$type<Record<string, unknown>>().notNull(),
    covarianceType: text("covariance_type").notNull(),
    neweyWestLag: integer("newey_west_lag"),
    confidenceLevel: doublePrecision("confidence_level").notNull(),
    /** The engine's fit record (everything prediction needs), with its own sha256 checksum. */
    record: jsonb("record").$type<Record<string, unknown>>().notNull(),
    /** The full report DTO (server/fits/types.ts FitReport). */
    report: jsonb("report").$type<Record<string, unknown>>().notNull(),
    recordChecksum: text("record_checksum").notNull(),
    authorId: text("author_id").references(() => users.id),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
    submittedAt: timestamp("submitted_at", { withTimezone: true }),
    approvedAt: timestamp("approved_at", { withTimezone: true }),
    approvedBy: text("approved_by").references(() => users.id),
    retiredAt: timestamp("retired_at", { withTimezone: true }),
    retiredBy: text("retired_by").references(() => users.id),
  },
  (table) => [
    index("fits_workspace_status_idx").on(table.workspaceId, table.status, table.updatedAt),
    index("fits_dataset_idx").on(table.datasetId),
    check("fits_status_check", sql`${table.status} in ('draft', 'in_review', 'changes_requested', 'approved', 'retired')`),
    check("fits_covariance_check", sql`${table.covarianceType} in ('classical', 'hc3', 'newey-west')`),
    check("fits_level_check", sql`${table.confidenceLevel} > 0 and ${table.confidenceLevel} < 1`),
    check("fits_checksum_check", sql`${table.record} ->> 'checksum' = ${table.recordChecksum}`),
    // Separation of duties, enforced by the database as well as by the API.
    check("fits_not_self_approved_check", sql`${table.approvedBy} is null or ${table.authorId} is null or ${table.approvedBy} <> ${table.authorId}`),
    check("fits_approved_has_approver_check", sql`${table.status} <> 'approved' or (${table.approvedBy} is not null and ${table.approvedAt} is not null)`),
    check("fits_retired_has_time_check", sql`${table.status} <> 'retired' or ${table.retiredAt} is not null`),
  ],
);

export type FitRow = typeof fits.$inferSelect;
export type NewFitRow = typeof fits.$inferInsert;

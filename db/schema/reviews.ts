// Finance review of scenario versions: comparisons ("Side by side"), comments, sign-offs, shares and
// in-app notifications. Everything here points at a scenario version by (scenario_id, number): the
// versions are immutable, so a sign-off or a comment stays bound to exactly the plan it was about, and
// a later version starts without one. Comments, sign-offs and shares are append-only (no cascades).
import { sql } from "drizzle-orm";
import {
  type AnyPgColumn,
  check,
  foreignKey,
  index,
  integer,
  pgTable,
  primaryKey,
  text,
  timestamp,
  uuid,
} from "drizzle-orm/pg-core";
import { users } from "./auth";
import { scenarios, scenarioVersions } from "./scenarios";
import { workspaces } from "./workspaces";

/** A saved "Side by side": 2–4 scenario versions, one of them the baseline the others are measured against. */
export const comparisons = pgTable(
  "comparisons",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    workspaceId: uuid("workspace_id")
      .notNull()
      .references(() => workspaces.id),
    name: text("name").notNull(),
    /** Position (0-based) in comparison_versions of the version the differences are measured from. */
    baselinePosition: integer("baseline_position").notNull().default(0),
    createdBy: text("created_by").references(() => users.id),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [
    index("comparisons_workspace_idx").on(table.workspaceId, table.createdAt),
    check("comparisons_name_check", sql`length(trim(${table.name})) between 1 and 200`),
    check("comparisons_baseline_check", sql`${table.baselinePosition} between 0 and 3`),
  ],
);

/** The versions of a comparison, in column order. */
export const comparisonVersions = pgTable(
  "comparison_versions",
  {
    comparisonId: uuid("comparison_id")
      .notNull()
      .references(() => comparisons.id, { onDelete: "cascade" }),
    position: integer("position").notNull(),
    scenarioId: uuid("scenario_id").notNull(),
    versionNumber: integer("version_number").notNull(),
  },
  (table) => [
    primaryKey({ name: "comparison_versions_pkey", columns: [table.comparisonId, table.position] }),
    foreignKey({
      name: "comparison_versions_version_fkey",
      columns: [table.scenarioId, table.versionNumber],
      foreignColumns: [scenarioVersions.scenarioId, scenarioVersions.number],
    }),
    check("comparison_versions_position_check", sql`${table.position} between 0 and 3`),
  ],
);

/** A comment on one scenario version; replies point at their parent (same version). */
export const comments = pgTable(
  "comments",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    workspaceId: uuid("workspace_id")
      .notNull()
      .references(() => workspaces.id),
    scenarioId: uuid("scenario_id").notNull(),
    versionNumber: integer("version_number").notNull(),
    parentId: uuid("parent_id").references((): AnyPgColumn => comments.id),
    /** The comparison the comment was written in, if any (for the link back); the comment is about the version. */
    comparisonId: uuid("comparison_id").references(() => comparisons.id, { onDelete: "set null" }),
    authorId: text("author_id").references(() => users.id),
    body: text("body").notNull(),
    /** Members mentioned with @ (user ids), e-mailed when the comment was posted. */
    mentions: text("mentions").array().notNull().default(sql`'{}'::text[]`),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [
    foreignKey({
      name: "comments_version_fkey",
      columns: [table.scenarioId, table.versionNumber],
      foreignColumns: [scenarioVersions.scenarioId, scenarioVersions.number],
    }),
    index("comments_version_idx").on(table.scenarioId, table.versionNumber, table.createdAt),
    check("comments_body_check", sql`length(trim(${table.body})) between 1 and 4000`),
  ],
);

export const signoffDecisions = ["signed_off", "declined"] as const;
export type SignoffDecision = (typeof signoffDecisions)[number];

/**
 * A finance decision on exactly one version (UI: Signed off · Declined (with reason)). Decisions are
 * kept as a history; a version's status is its latest decision. A decline needs a reason.
 */
export const signoffs = pgTable(
  "signoffs",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    workspaceId: uuid("workspace_id")
      .notNull()
      .references(() => workspaces.id),
    scenarioId: uuid("scenario_id").notNull(),
    versionNumber: integer("version_number").notNull(),
    decision: text("decision").$type<SignoffDecision>().notNull(),
    reason: text("reason").notNull().default(""),
    decidedBy: text("decided_by").references(() => users.id),
    decidedAt: timestamp("decided_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [
    foreignKey({
      name: "signoffs_version_fkey",
      columns: [table.scenarioId, table.versionNumber],
      foreignColumns: [scenarioVersions.scenarioId, scenarioVersions.number],
    }),
    index("signoffs_version_idx").on(table.scenarioId, table.versionNumber, table.decidedAt),
    check("signoffs_decision_check", sql`${table.decision} in ('signed_off', 'declined')`),
    check("signoffs_reason_check", sql`${table.decision} <> 'declined' or length(trim(${table.reason})) > 0`),
    check("signoffs_reason_length_check", sql`length(${table.reason}) <= 4000`),
  ],
);

/**
 * A planner sharing one scenario version, or a comparison, with chosen finance members (share_recipients).
 * When a shared version carries extrapolation warnings the planner writes an acknowledgement.
 */
export const shares = pgTable(
  "shares",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    workspaceId: uuid("workspace_id")
      .notNull()
      .references(() => workspaces.id),
    objectType: text("object_type").$type<"scenario" | "comparison">().notNull(),
    scenarioId: uuid("scenario_id").references(() => scenarios.id),
    versionNumber: integer("version_number"),
    comparisonId: uuid("comparison_id").references(() => comparisons.id),
    note: text("note").notNull().default(""),
    /** Required (non-empty) when a shared version has warnings; null otherwise. */
    acknowledgement: text("acknowledgement"),
    sharedBy: text("shared_by").references(() => users.id),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [
    index("shares_workspace_idx").on(table.workspaceId, table.createdAt),
    check(
      "shares_object_check",
      sql`(${table.objectType} = 'scenario' and ${table.scenarioId} is not null and ${table.versionNumber} is not null and ${table.comparisonId} is null)
        or (${table.objectType} = 'comparison' and ${table.comparisonId} is not null and ${table.scenarioId} is null and ${table.versionNumber} is null)`,
    ),
    check("shares_text_check", sql`length(${table.note}) <= 2000 and (${table.acknowledgement} is null or length(${table.acknowledgement}) <= 2000)`),
  ],
);

export const shareRecipients = pgTable(
  "share_recipients",
  {
    shareId: uuid("share_id")
      .notNull()
      .references(() => shares.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
  },
  (table) => [primaryKey({ name: "share_recipients_pkey", columns: [table.shareId, table.userId] }), index("share_recipients_user_idx").on(table.userId)],
);

export const notificationKinds = ["share", "mention", "reply", "comment", "signoff", "decline"] as const;
export type NotificationKind = (typeof notificationKinds)[number];

/** In-app notifications (the header's unread count and /notifications). */
export const notifications = pgTable(
  "notifications",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    workspaceId: uuid("workspace_id")
      .notNull()
      .references(() => workspaces.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    kind: text("kind").$type<NotificationKind>().notNull(),
    /** One sentence: "Priya Nair shared “Q3 plan” version 2 with you." */
    title: text("title").notNull(),
    /** Path inside the app, e.g. /compare/… or /scenarios/…#review. */
    link: text("link").notNull(),
    actorId: text("actor_id").references(() => users.id, { onDelete: "set null" }),
    readAt: timestamp("read_at", { withTimezone: true }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [
    index("notifications_user_idx").on(table.userId, table.workspaceId, table.createdAt),
    check("notifications_kind_check", sql`${table.kind} in ('share', 'mention', 'reply', 'comment', 'signoff', 'decline')`),
    check("notifications_link_check", sql`${table.link} like '/%'`),
  ],
);

export type ComparisonRow = typeof comparisons.$inferSelect;
export type CommentRow = typeof comments.$inferSelect;
export type SignoffRow = typeof signoffs.$inferSelect;
export type ShareRow = typeof shares.$inferSelect;
export type NotificationRow = typeof notifications.$inferSelect;

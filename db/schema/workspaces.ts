// Workspaces, who belongs to them and with which roles, how people join, personal API tokens,
// and the audit log every feature writes to.
import { sql } from "drizzle-orm";
import {
  bigserial,
  check,
  foreignKey,
  index,
  jsonb,
  pgTable,
  text,
  timestamp,
  unique,
  uuid,
} from "drizzle-orm/pg-core";
import { users } from "./auth";

/** The roles a membership can hold; a member may hold several. Permissions live in server/authz/roles.ts. */
export const roleNames = ["admin", "analyst", "reviewer", "planner", "finance"] as const;
export type Role = (typeof roleNames)[number];

const rolesCheck = (column: string) =>
  sql.raw(`cardinality(${column}) >= 1 and ${column} <@ array['admin','analyst','reviewer','planner','finance']::text[]`);

export const workspaces = pgTable("workspaces", {
  id: uuid("id").primaryKey().defaultRandom(),
  name: text("name").notNull(),
  slug: text("slug").notNull().unique(),
  /** ISO 4217 code, e.g. "EUR"; every amount in the workspace is in this currency. */
  currency: text("currency").notNull().default("EUR"),
  /** BCP 47 tag used by Intl.NumberFormat / DateTimeFormat, e.g. "en-IE". */
  locale: text("locale").notNull().default("en-IE"),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
});

export const memberships = pgTable(
  "memberships",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    workspaceId: uuid("workspace_id")
      .notNull()
      .references(() => workspaces.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    roles: text("roles").array().$type<Role[]>().notNull(),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [
    unique("memberships_workspace_user_key").on(table.workspaceId, table.userId),
    index("memberships_user_idx").on(table.userId),
    check("memberships_roles_check", rolesCheck("roles")),
  ],
);

export const invitations = pgTable(
  "invitations",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    workspaceId: uuid("workspace_id")
      .notNull()
      .references(() => workspaces.id, { onDelete: "cascade" }),
    email: text("email").notNull(),
    roles: text("roles").array().$type<Role[]>().notNull(),
    /** sha256 (hex) of the one-time link token; the token itself is only in the e-mail. */
    tokenHash: text("token_hash").notNull().unique(),
    invitedBy: text("invited_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
    acceptedAt: timestamp("accepted_at", { withTimezone: true }),
    acceptedBy: text("accepted_by").references(() => users.id, { onDelete: "set null" }),
    revokedAt: timestamp("revoked_at", { withTimezone: true }),
  },
  (table) => [index("invitations_workspace_idx").on(table.workspaceId), check("invitations_roles_check", rolesCheck("roles"))],
);

export const apiTokens = pgTable(
  "api_tokens",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    workspaceId: uuid("workspace_id").notNull(),
    userId: text("user_id").notNull(),
    name: text("name").notNull(),
    /** sha256 (hex) of the whole token; the token is shown once and never stored. */
    tokenHash: text("token_hash").notNull().unique(),
    /** The first characters of the token ("trib_AbC1"), shown so owners can tell tokens apart. */
    prefix: text("prefix").notNull(),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    expiresAt: timestamp("expires_at", { withTimezone: true }),
    lastUsedAt: timestamp("last_used_at", { withTimezone: true }),
    revokedAt: timestamp("revoked_at", { withTimezone: true }),
  },
  (table) => [
    // A token lives only as long as the membership it acts for.
    foreignKey({
      name: "api_tokens_membership_fk",
      columns: [table.workspaceId, table.userId],
      foreignColumns: [memberships.workspaceId, memberships.userId],
    }).onDelete("cascade"),
    index("api_tokens_user_idx").on(table.userId, table.workspaceId),
  ],
);

/**
 * Who did what to which object, in which workspace. Every feature appends here through
 * server/data/audit.ts; `action` is a dotted verb such as "member.roles_changed" or "fit.approved".
 */
export const auditLog = pgTable(
  "audit_log",
  {
    id: bigserial("id", { mode: "number" }).primaryKey(),
    workspaceId: uuid("workspace_id").references(() => workspaces.id, { onDelete: "cascade" }),
    actorUserId: text("actor_user_id").references(() => users.id, { onDelete: "set null" }),
    action: text("action").notNull(),
    objectType: text("object_type").notNull(),
    objectId: text("object_id"),
    details: jsonb("details").$type<Record<string, unknown>>().notNull().default({}),
    at: timestamp("at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [
    index("audit_log_workspace_at_idx").on(table.workspaceId, table.at),
    index("audit_log_object_idx").on(table.objectType, table.objectId),
  ],
);

export type WorkspaceRow = typeof workspaces.$inferSelect;
export type MembershipRow = typeof memberships.$inferSelect;
export type InvitationRow = typeof invitations.$inferSelect;
export type ApiTokenRow = typeof apiTokens.$inferSelect;
export type AuditLogRow = typeof auditLog.$inferSelect;

// Scenarios: a planner's budget plan on one approved fit, saved as numbered, immutable versions.
// Money is integer cents in the workspace currency (exact; no floats). A trigger refuses UPDATE and
// DELETE of scenario_versions (db/migrations/*_scenario_versions_immutable.sql); a save is one
// INSERT of number = base + 1, so the primary key (scenario_id, number) makes concurrent saves on
// the same base collide (one wins, the other gets 409) and numbering gapless.
import { sql } from "drizzle-orm";
import { bigint, check, index, integer, jsonb, pgTable, primaryKey, text, timestamp, uuid } from "drizzle-orm/pg-core";
import { users } from "./auth";
import { fits } from "./fits";
import { workspaces } from "./workspaces";

export const scenarioModes = ["fixed", "growing"] as const;
export type ScenarioMode = (typeof scenarioModes)[number];

/** Channel name → integer cents for the whole horizon. */
export type CentsByChannel = Record<string, number>;

/** Per channel: held still (locked) and optional floor/ceiling, in cents for the horizon. */
export type ChannelSettings = Record<string, { locked?: boolean; floorCents?: number; ceilingCents?: number }>;

/** The plan a scenario starts from; the "difference from the starting plan" is measured against it. */
export type ScenarioBaseline = {
  allocationCents: CentsByChannel;
  controls: Record<string, number>;
  horizon: number;
  /** "history": spend of the most recent horizon in the fit's data; "version": another scenario's version. */
  source: "history" | "version" | "custom";
  /** Human description, e.g. "Spend of the last 13 weeks (2025-10-06 to 2025-12-29)". */
  description: string;
};

export const scenarios = pgTable(
  "scenarios",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    // No cascades: versions are immutable, so nothing may delete them implicitly.
    workspaceId: uuid("workspace_id")
      .notNull()
      .references(() => workspaces.id),
    fitId: uuid("fit_id")
      .notNull()
      .references(() => fits.id),
    name: text("name").notNull(),
    ownerId: text("owner_id").references(() => users.id),
    /** Default horizon (periods) for new versions. */
    horizonPeriods: integer("horizon_periods").notNull(),
    baseline: jsonb("baseline").$type<ScenarioBaseline>().notNull(),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [
    index("scenarios_workspace_fit_idx").on(table.workspaceId, table.fitId, table.createdAt),
    check("scenarios_horizon_check", sql`${table.horizonPeriods} between 1 and 520`),
    check("scenarios_name_check", sql`length(trim(${table.name})) between 1 and 200`),
  ],
);

export const scenarioVersions = pgTable(
  "scenario_versions",
  {
    scenarioId: uuid("scenario_id")
      .notNull()
      .references(() => scenarios.id),
    /** 1, 2, 3 … without gaps. */
    number: integer("number").notNull(),
    /** Channel → cents for the whole horizon. */
    allocation: jsonb("allocation").$type<CentsByChannel>().notNull(),
    settings: jsonb("settings").$type<ChannelSettings>().notNull().default({}),
    mode: text("mode").$type<ScenarioMode>().notNull(),
    totalCents: bigint("total_cents", { mode: "number" }).notNull(),
    /** Growing mode: the ceiling the total may rise to. Null in fixed mode. */
    ceilingCents: bigint("ceiling_cents", { mode: "number" }),
    horizonPeriods: integer("horizon_periods").notNull(),
    controls: jsonb("controls").$type<Record<string, number>>().notNull(),
    /** The server's prediction when the version was saved (never the client's numbers). */
    prediction: jsonb("prediction").$type<Record<string, unknown>>().notNull(),
    /** Extrapolation warnings at save time (kept so sharing can ask for an acknowledgement). */
    warnings: jsonb("warnings").$type<Record<string, unknown>[]>().notNull().default([]),
    /** Checksum of the fit record the prediction came from. */
    fitChecksum: text("fit_checksum").notNull(),
    note: text("note").notNull().default(""),
    authorId: text("author_id").references(() => users.id),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    /** The version the author started from (null for version 1). */
    basedOn: integer("based_on"),
    /** Set when this version restores an older one. */
    restoredFrom: integer("restored_from"),
  },
  (table) => [
    primaryKey({ name: "scenario_versions_pkey", columns: [table.scenarioId, table.number] }),
    check("scenario_versions_number_check", sql`${table.number} >= 1`),
    check("scenario_versions_based_on_check", sql`${table.basedOn} is null or (${table.basedOn} >= 1 and ${table.basedOn} < ${table.number})`),
    check("scenario_versions_restored_from_check", sql`${table.restoredFrom} is null or (${table.restoredFrom} >= 1 and ${table.restoredFrom} < ${table.number})`),
    check("scenario_versions_mode_check", sql`${table.mode} in ('fixed', 'growing')`),
    check("scenario_versions_total_check", sql`${table.totalCents} >= 0`),
    check(
      "scenario_versions_ceiling_check",
      sql`(${table.mode} = 'fixed' and ${table.ceilingCents} is null) or (${table.mode} = 'growing' and ${table.ceilingCents} >= ${table.totalCents})`,
    ),
    check("scenario_versions_horizon_check", sql`${table.horizonPeriods} between 1 and 520`),
  ],
);

export type ScenarioRow = typeof scenarios.$inferSelect;
export type ScenarioVersionRow = typeof scenarioVersions.$inferSelect;

import "server-only";
import { and, eq, inArray, sql } from "drizzle-orm";
import { db } from "@/db/client";
import { datasetColumns, datasetRows } from "@/db/schema/datasets";
import type { PlanShape } from "@/server/predict/plan-shape";

/** The most recent H periods of a fit's spend history, summed per channel. */
export interface RecentHistory {
  /** Channel → spend over the periods, currency units (sum of the per-period values). */
  spend: Record<string, number>;
  /** Count controls: periods on; level controls: their average per period. */
  controls: Record<string, number>;
  /** Periods actually found (fewer than asked when the history is shorter). */
  periods: number;
  firstPeriod: string | null;
  lastPeriod: string | null;
}

function isoDay(dayNumber: number | null | undefined): string | null {
  return typeof dayNumber === "number" && Number.isFinite(dayNumber) ? new Date(dayNumber * 86_400_000).toISOString().slice(0, 10) : null;
}

/**
 * Sums the last `horizon` complete rows of the fit's dataset (latest by the period column, else by
 * row order): the default starting allocation "what we spent in the most recent quarter".
 * Rows with a missing value in a column the plan needs are skipped (fits leave them out too).
 */
export async function readRecentHistory(datasetId: string, shape: PlanShape, horizon: number): Promise<RecentHistory | null> {
  const names = [...shape.channels.map((channel) => channel.name), ...shape.controls.map((control) => control.name)];
  const columns = await db
    .select({ name: datasetColumns.name, position: datasetColumns.position, role: datasetColumns.role })
    .from(datasetColumns)
    .where(and(eq(datasetColumns.datasetId, datasetId), inArray(datasetColumns.name, names)));
  const [period] = await db
    .select({ position: datasetColumns.position })
    .from(datasetColumns)
    .where(and(eq(datasetColumns.datasetId, datasetId), eq(datasetColumns.role, "period")))
    .limit(1);
  const positionOf = new Map(columns.map((column) => [column.name, column.position]));
  if (names.some((name) => !positionOf.has(name))) return null;

  const order = period
    ? sql`${datasetRows.numbers}[${period.position}] desc nulls last, ${datasetRows.rowNumber} desc`
    : sql`${datasetRows.rowNumber} desc`;
  // A few spare rows in case some are incomplete.
  const rows = await db
    .select({ numbers: datasetRows.numbers })
    .from(datasetRows)
    .where(eq(datasetRows.datasetId, datasetId))
    .orderBy(order)
    .limit(horizon * 2 + 10);
  const complete = rows
    .map((row) => row.numbers)
    .filter((numbers) => names.every((name) => typeof numbers[(positionOf.get(name) as number) - 1] === "number"))
    .slice(0, horizon);
  if (complete.length === 0) return null;

  const value = (numbers: number[], name: string) => numbers[(positionOf.get(name) as number) - 1];
  const spend: Record<string, number> = {};
  for (const channel of shape.channels) spend[channel.name] = complete.reduce((sum, numbers) => sum + value(numbers, channel.name), 0);
  const controls: Record<string, number> = {};
  for (const control of shape.controls) {
    const total = complete.reduce((sum, numbers) => sum + value(numbers, control.name), 0);
    controls[control.name] = control.kind === "count" ? Math.round(total) : total / complete.length;
  }
  const periodValues = period ? complete.map((numbers) => numbers[period.position - 1]) : [];
  return {
    spend,
    controls,
    periods: complete.length,
    firstPeriod: periodValues.length ? isoDay(Math.min(...periodValues)) : null,
    lastPeriod: periodValues.length ? isoDay(Math.max(...periodValues)) : null,
  };
}

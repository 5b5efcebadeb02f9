import "server-only";
import { and, eq } from "drizzle-orm";
import { db } from "@/db/client";
import { datasetColumns, datasets } from "@/db/schema/datasets";
import { type FitStatus, fits } from "@/db/schema/fits";
import { type FitRecord, parseFitRecord } from "@/server/stats";
import { type PlanShape, describePlanShape } from "./plan-shape";

/**
 * In-memory cache of what prediction needs from a fit, so a warm predict request makes no database
 * round trip:
 * - the fit's head (workspace, status, record checksum) for HEAD_TTL_MS, then re-read with one
 *   small indexed query (a retired fit stops predicting within that time in every process, at once
 *   in the process that retired it if it calls `invalidateFitCache`);
 * - the parsed, checksum-verified record and the plan shape keyed by the record's checksum, kept
 *   until evicted (a record never changes under its checksum).
 * Concurrent misses share one query.
 */
export const HEAD_TTL_MS = 2_000;
const MAX_RECORDS = 200;
const MAX_HEADS = 5_000;

export interface FitHead {
  id: string;
  workspaceId: string;
  name: string;
  status: FitStatus;
  checksum: string;
  datasetId: string;
}

export interface CachedFit extends FitHead {
  record: FitRecord;
  shape: PlanShape;
}

type HeadEntry = { head: FitHead | null; expires: number };
type Caches = { heads: Map<string, HeadEntry>; records: Map<string, { record: FitRecord; shape: PlanShape }>; loading: Map<string, Promise<unknown>> };

// On globalThis: route bundles may hold separate module instances; one cache per process.
const caches: Caches = ((globalThis as { tributaryFitCache?: Caches }).tributaryFitCache ??= {
  heads: new Map(),
  records: new Map(),
  loading: new Map(),
});

function once<T>(key: string, load: () => Promise<T>): Promise<T> {
  const pending = caches.loading.get(key) as Promise<T> | undefined;
  if (pending) return pending;
  const promise = load().finally(() => caches.loading.delete(key));
  caches.loading.set(key, promise);
  return promise;
}

async function readHead(fitId: string): Promise<FitHead | null> {
  const [row] = await db
    .select({
      id: fits.id,
      workspaceId: fits.workspaceId,
      name: fits.name,
      status: fits.status,
      checksum: fits.recordChecksum,
      datasetId: fits.datasetId,
    })
    .from(fits)
    .where(eq(fits.id, fitId));
  return row ?? null;
}

/** "week" for weekly data, from the spacing of the dataset's period column; "period" when unknown. */
export function periodNounForSpacing(days: number | null): string {
  if (days === null || !Number.isFinite(days)) return "period";
  if (Math.abs(days - 1) < 0.2) return "day";
  if (Math.abs(days - 7) < 0.5) return "week";
  if (days >= 27 && days <= 32) return "month";
  if (days >= 88 && days <= 93) return "quarter";
  if (days >= 360 && days <= 370) return "year";
  return "period";
}

async function readPeriodSpacing(datasetId: string): Promise<number | null> {
  const [row] = await db
    .select({ first: datasetColumns.firstPeriod, last: datasetColumns.lastPeriod, rows: datasets.rowCount })
    .from(datasetColumns)
    .innerJoin(datasets, eq(datasets.id, datasetColumns.datasetId))
    .where(and(eq(datasetColumns.datasetId, datasetId), eq(datasetColumns.role, "period")))
    .limit(1);
  if (!row?.first || !row.last || row.rows < 2) return null;
  const days = (Date.parse(row.last) - Date.parse(row.first)) / 86_400_000;
  return days / (row.rows - 1);
}

async function readColumnUnit(datasetId: string, column: string): Promise<string | null> {
  const [row] = await db
    .select({ unit: datasetColumns.unit })
    .from(datasetColumns)
    .where(and(eq(datasetColumns.datasetId, datasetId), eq(datasetColumns.name, column)))
    .limit(1);
  return row?.unit ?? null;
}

async function readRecord(head: FitHead): Promise<{ record: FitRecord; shape: PlanShape }> {
  const [row] = await db.select({ record: fits.record }).from(fits).where(eq(fits.id, head.id));
  if (!row) throw new Error(`fit ${head.id} disappeared while loading`);
  const record = parseFitRecord(row.record);
  const [spacing, outcomeUnit] = await Promise.all([
    readPeriodSpacing(head.datasetId),
    readColumnUnit(head.datasetId, record.specification.outcome),
  ]);
  return { record, shape: describePlanShape(record, { periodNoun: periodNounForSpacing(spacing), outcomeUnit }) };
}

/**
 * The fit with its record and plan shape, or null when there is no such fit. Status and workspace
 * are at most HEAD_TTL_MS old unless `fresh` (saves re-read them).
 *
 * @throws if the stored record fails its checksum (a damaged row; logged as a 500)
 */
export async function getCachedFit(fitId: string, options: { fresh?: boolean } = {}): Promise<CachedFit | null> {
  const now = Date.now();
  let entry = caches.heads.get(fitId);
  if (!entry || entry.expires <= now || options.fresh) {
    const head = await once(`head:${fitId}`, () => readHead(fitId));
    if (caches.heads.size >= MAX_HEADS) caches.heads.clear();
    entry = { head, expires: Date.now() + HEAD_TTL_MS };
    caches.heads.set(fitId, entry);
  }
  const head = entry.head;
  if (!head) return null;
  let body = caches.records.get(head.checksum);
  if (!body) {
    body = await once(`record:${head.checksum}`, () => readRecord(head));
    if (caches.records.size >= MAX_RECORDS) caches.records.delete(caches.records.keys().next().value as string);
    caches.records.set(head.checksum, body);
  }
  return { ...head, ...body };
}

/** Forget a fit's head (call after changing its status) or, without an id, everything. */
export function invalidateFitCache(fitId?: string): void {
  if (fitId === undefined) {
    caches.heads.clear();
    caches.records.clear();
  } else {
    caches.heads.delete(fitId);
  }
}

import "server-only";
import { getDatabase } from "@/db/client";
import type { JobKind } from "./queue";

/**
 * A nudge from the process that queued a job to the workers (PostgreSQL LISTEN/NOTIFY), so a worker
 * takes it at once instead of at its next poll (pg-boss polls at most every half second). Only a
 * hint: a worker that misses it still finds the job by polling.
 */
const CHANNEL = "tributary_jobs";

/** Tells every listening worker that a job of this kind is waiting (best effort). */
export async function wakeWorkers(kind: JobKind): Promise<void> {
  const { sql } = getDatabase();
  await sql`select pg_notify(${CHANNEL}, ${kind})`.catch(() => {});
}

/** Calls `wake(kind)` for every nudge; resolves once listening. */
export async function listenForJobs(wake: (kind: string) => void): Promise<void> {
  const { sql } = getDatabase();
  await sql.listen(CHANNEL, (kind) => wake(kind));
}

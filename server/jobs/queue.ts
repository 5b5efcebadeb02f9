import "server-only";
import PgBoss from "pg-boss";

/**
 * The PostgreSQL-backed queue (pg-boss). Web servers only send; worker processes (server/jobs/worker.ts)
 * take work. Any number of workers on any number of machines share the queue through the database.
 */
const globalForQueue = globalThis as unknown as { tributaryBoss?: Promise<PgBoss> };

export const jobKinds = ["dataset.ingest", "fit.run"] as const;
export type JobKind = (typeof jobKinds)[number];

async function startBoss(options: { worker: boolean }): Promise<PgBoss> {
  const connectionString = process.env.DATABASE_URL;
  if (!connectionString) throw new Error("DATABASE_URL is not set (see .env.example)");
  const boss = new PgBoss({
    connectionString,
    max: options.worker ? 4 : 2,
    // Maintenance and cron run in workers; a web process only publishes.
    supervise: options.worker,
    schedule: false,
  });
  boss.on("error", (error) => console.error(`[queue] ${error.message}`));
  await boss.start();
  for (const kind of jobKinds) {
    if (!(await boss.getQueue(kind))) await boss.createQueue(kind, { name: kind, retryLimit: 0, expireInSeconds: 60 * 30 });
  }
  return boss;
}

/** The queue handle of this process, started once. */
export function getQueue(options: { worker: boolean } = { worker: false }): Promise<PgBoss> {
  if (!globalForQueue.tributaryBoss) {
    globalForQueue.tributaryBoss = startBoss(options).catch((error) => {
      globalForQueue.tributaryBoss = undefined;
      throw error;
    });
  }
  return globalForQueue.tributaryBoss;
}

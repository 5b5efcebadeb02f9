import "server-only";
import { jobHandlers, type JobContext } from "./handlers";
import { getQueue, jobKinds } from "./queue";
import { listenForJobs } from "./wake";
import { completeJobRun, failJobRun, loadJobRunForWorker, markJobRunning, reportJobProgress } from "./runs";

/**
 * The worker process: takes jobs from the PostgreSQL queue and runs them, one at a time per kind.
 * Start more of these (on any machine that reaches the database) to scale out; pg-boss hands each job
 * to exactly one of them.
 */
async function main() {
  const queue = await getQueue({ worker: true });
  const workerIds = new Map<string, string>();
  for (const kind of jobKinds) {
    const loadHandler = jobHandlers[kind];
    if (!loadHandler) continue;
    const workerId = await queue.work<{ runId: string }>(kind, { batchSize: 1, pollingIntervalSeconds: 0.5 }, async ([job]) => {
      const run = await loadJobRunForWorker(job.data.runId);
      if (!run) return;
      await markJobRunning(run.id);
      let lastReport = 0;
      let lastPhase: string | null = null;
      const context: JobContext = {
        run,
        progress: async (phase, done, total, message) => {
          // at most five writes a second within a stage; a new stage and the last step always count
          const now = Date.now();
          if (now - lastReport < 200 && total !== done && phase === lastPhase) return;
          lastReport = now;
          lastPhase = phase;
          await reportJobProgress(run.id, { phase, done, total, message });
        },
      };
      try {
        const handler = await loadHandler();
        await completeJobRun(run.id, await handler(context));
      } catch (error) {
        const message = error instanceof Error ? error.message : String(error);
        const details = (error as { details?: unknown[] }).details;
        await failJobRun(run.id, { message, details });
        console.error(`[worker] ${kind} ${run.id} failed: ${message}`);
      }
    });
    workerIds.set(kind, workerId);
  }
  // a web server that queues a job nudges us: take it now rather than at the next poll
  await listenForJobs((kind) => {
    const workerId = workerIds.get(kind);
    if (workerId) queue.notifyWorker(workerId);
  }).catch((error: unknown) => console.error(`[worker] not listening for new jobs (polling only): ${error instanceof Error ? error.message : String(error)}`));
  console.log(`[worker] taking ${jobKinds.join(", ")}`);
  const stop = async () => {
    await queue.stop({ graceful: true, timeout: 10_000 });
    process.exit(0);
  };
  process.once("SIGINT", stop);
  process.once("SIGTERM", stop);
}

main().catch((error) => {
  console.error(error);
  process.exit(1);
});

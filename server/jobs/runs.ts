import "server-only";
import { and, eq } from "drizzle-orm";
import { db } from "@/db/client";
import { jobRuns, type JobProgress, type JobRun } from "@/db/schema/jobs";
import { getQueue, type JobKind } from "./queue";
import { wakeWorkers } from "./wake";

export type JobRunDto = Pick<
  JobRun,
  "id" | "kind" | "status" | "progress" | "result" | "error" | "createdAt" | "startedAt" | "finishedAt"
>;

function toDto(run: JobRun): JobRunDto {
  const { id, kind, status, progress, result, error, createdAt, startedAt, finishedAt } = run;
  return { id, kind, status, progress, result, error, createdAt, startedAt, finishedAt };
}

/** Records a job run and puts it on the queue; returns at once with the run the browser will poll. */
export async function enqueueJob(params: {
  workspaceId: string;
  userId: string;
  kind: JobKind;
  input: Record<string, unknown>;
}): Promise<JobRunDto> {
  const [run] = await db
    .insert(jobRuns)
    .values({ workspaceId: params.workspaceId, createdBy: params.userId, kind: params.kind, input: params.input })
    .returning();
  const queue = await getQueue();
  await queue.send(params.kind, { runId: run.id });
  await wakeWorkers(params.kind);
  return toDto(run);
}

/** A run of the given workspace, or null (another workspace's run is "not found"). */
export async function getJobRunById(params: { workspaceId: string; runId: string }): Promise<JobRunDto | null> {
  const [run] = await db
    .select()
    .from(jobRuns)
    .where(and(eq(jobRuns.id, params.runId), eq(jobRuns.workspaceId, params.workspaceId)));
  return run ? toDto(run) : null;
}

export async function loadJobRunForWorker(runId: string): Promise<JobRun | null> {
  const [run] = await db.select().from(jobRuns).where(eq(jobRuns.id, runId));
  return run ?? null;
}

export async function markJobRunning(runId: string): Promise<void> {
  await db.update(jobRuns).set({ status: "running", startedAt: new Date() }).where(eq(jobRuns.id, runId));
}

export async function reportJobProgress(runId: string, progress: JobProgress): Promise<void> {
  await db.update(jobRuns).set({ progress }).where(eq(jobRuns.id, runId));
}

export async function completeJobRun(runId: string, result: Record<string, unknown>): Promise<void> {
  await db.update(jobRuns).set({ status: "succeeded", result, finishedAt: new Date() }).where(eq(jobRuns.id, runId));
}

export async function failJobRun(runId: string, error: { message: string; details?: unknown[] }): Promise<void> {
  await db.update(jobRuns).set({ status: "failed", error, finishedAt: new Date() }).where(eq(jobRuns.id, runId));
}

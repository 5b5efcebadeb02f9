import "server-only";
import type { JobRun } from "@/db/schema/jobs";
import type { JobKind } from "../queue";

export type JobContext = {
  run: JobRun;
  /** Progress report (the worker throttles repeats within one phase); the browser polls it. */
  progress: (phase: string, done: number, total: number | null, message?: string) => Promise<void>;
};

export type JobHandler = (context: JobContext) => Promise<Record<string, unknown>>;

/** Every kind of background work and the function that does it; add a kind here and in queue.ts. */
export const jobHandlers: Partial<Record<JobKind, () => Promise<JobHandler>>> = {
  "dataset.ingest": () => import("./dataset-ingest").then((module) => module.default),
  "fit.run": () => import("./fit-run").then((module) => module.default),
};

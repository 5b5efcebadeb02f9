import "server-only";
import type { JobRunDto } from "./runs";

export type JobLinks = {
  self: string;
  /** dataset.ingest that succeeded: the stored spend history. */
  dataset?: string;
  /** fit.run that succeeded: the stored fit. */
  fit?: string;
  /** The page the browser opens once the job succeeded (a history that still needs roles: its roles page). */
  page?: string;
};

const idIn = (result: Record<string, unknown> | null, key: string): string | null =>
  typeof result?.[key] === "string" ? (result[key] as string) : null;

/** Where a job's outcome lives: its API resource and its page, once the job has succeeded. */
export function jobLinks(job: Pick<JobRunDto, "id" | "kind" | "status" | "result">): JobLinks {
  const links: JobLinks = { self: `/api/jobs/${job.id}` };
  if (job.status !== "succeeded") return links;
  if (job.kind === "dataset.ingest") {
    const datasetId = idIn(job.result, "datasetId");
    if (datasetId) {
      links.dataset = `/api/datasets/${datasetId}`;
      links.page = job.result?.status === "needs-roles" ? `/datasets/${datasetId}/roles` : `/datasets/${datasetId}`;
    }
  } else if (job.kind === "fit.run") {
    const fitId = idIn(job.result, "fitId");
    if (fitId) {
      links.fit = `/api/fits/${fitId}`;
      links.page = `/fits/${fitId}`;
    }
  }
  return links;
}

/** A job of any kind as the API sends it (GET /api/jobs/{id}, and the 202 answers that queue one). */
export function jobResponse(job: JobRunDto) {
  return { ...job, links: jobLinks(job) };
}

// Fixtures for the spend-history API tests: a fresh workspace with people and API tokens per test,
// requests shaped as Next hands them to route handlers (with Content-Length, as a client sends it),
// and a snapshot of the tables an upload may touch, to prove that a failed upload stored nothing.
import { getDatabase } from "@/db/client";
import type { Role } from "@/db/schema";
import { createApiToken } from "@/server/data/api-tokens";
import { loadJobRunForWorker } from "@/server/jobs/runs";
import ingestDataset from "@/server/jobs/handlers/dataset-ingest";
import { apiRequest, makeWorkspace, routeContext } from "../auth/helpers";

export { apiRequest, routeContext };

export async function makeTeam<T extends Record<string, Role[]>>(people: T) {
  const { workspace, members } = await makeWorkspace(people);
  const tokens = {} as Record<keyof T, string>;
  for (const name of Object.keys(people) as (keyof T & string)[]) {
    tokens[name] = (await createApiToken({ workspaceId: workspace.id, userId: members[name].id, name: "datasets api", expiresAt: null })).token;
  }
  return { workspace, members: members as Record<keyof T & string, (typeof members)[string]>, tokens };
}

/** POST /api/datasets with a raw CSV body (Content-Type text/csv and a Content-Length). */
export function csvUpload(token: string, csv: string | Buffer, query = "filename=history.csv"): Request {
  const bytes = typeof csv === "string" ? Buffer.from(csv, "utf8") : csv;
  return apiRequest(`/api/datasets?${query}`, {
    method: "POST",
    token,
    body: new Uint8Array(bytes),
    headers: { "content-type": "text/csv", "content-length": String(bytes.length) },
  });
}

/** POST /api/datasets as multipart/form-data, serialized the way a client sends it. */
export async function multipartUpload(token: string, form: FormData, query = ""): Promise<Request> {
  const encoded = new Response(form);
  const body = Buffer.from(await encoded.arrayBuffer());
  return apiRequest(`/api/datasets${query ? `?${query}` : ""}`, {
    method: "POST",
    token,
    body: new Uint8Array(body),
    headers: { "content-type": encoded.headers.get("content-type")!, "content-length": String(body.length) },
  });
}

/** A body that yields `chunks` then, if `fail`, errors as a client that went away does. */
export function streamingRequest(token: string, chunks: AsyncIterable<Uint8Array> | Iterable<Uint8Array>, headers: Record<string, string>, query = "filename=history.csv&background=1"): Request {
  const iterator = (async function* () {
    yield* chunks;
  })();
  const body = new ReadableStream<Uint8Array>({
    async pull(controller) {
      try {
        const next = await iterator.next();
        if (next.done) controller.close();
        else controller.enqueue(next.value);
      } catch (error) {
        controller.error(error);
      }
    },
  });
  return new Request(`http://localhost:3100/api/datasets?${query}`, {
    method: "POST",
    headers: { authorization: `Bearer ${token}`, ...headers },
    body,
    duplex: "half",
  } as RequestInit);
}

/** Runs a dataset.ingest job's handler as the worker does, recording its progress reports. */
export async function runIngestJob(jobId: string) {
  const run = await loadJobRunForWorker(jobId);
  if (!run) throw new Error("job run missing");
  const progress: { phase: string; done: number; total: number | null; message?: string }[] = [];
  const { completeJobRun, failJobRun, markJobRunning, reportJobProgress } = await import("@/server/jobs/runs");
  await markJobRunning(run.id);
  try {
    const result = await ingestDataset({
      run,
      progress: async (phase, done, total, message) => {
        progress.push({ phase, done, total, message });
        await reportJobProgress(run.id, { phase, done, total, message });
      },
    });
    await completeJobRun(run.id, result);
    return { ok: true as const, result, progress };
  } catch (error) {
    const message = error instanceof Error ? error.message : String(error);
    const details = (error as { details?: unknown[] }).details;
    await failJobRun(run.id, { message, details });
    return { ok: false as const, message, details: (details ?? []) as Array<Record<string, unknown>>, progress };
  }
}

/** Row counts of everything an upload writes (datasets, their rows/files/columns, staging, audit) in one workspace. */
export async function uploadFootprint(workspaceId: string) {
  const { sql } = getDatabase();
  const [row] = await sql<{ datasets: number; rows: number; files: number; columns: number; uploads: number; chunks: number; audit: number }[]>`
    select
      (select count(*)::int from datasets where workspace_id = ${workspaceId}) as datasets,
      (select count(*)::int from dataset_rows r where r.dataset_id in (select id from datasets where workspace_id = ${workspaceId})
         or not exists (select 1 from datasets d where d.id = r.dataset_id)) as rows,
      (select count(*)::int from dataset_files f join datasets d on d.id = f.dataset_id where d.workspace_id = ${workspaceId}) as files,
      (select count(*)::int from dataset_columns c join datasets d on d.id = c.dataset_id where d.workspace_id = ${workspaceId}) as columns,
      (select count(*)::int from dataset_uploads where workspace_id = ${workspaceId}) as uploads,
      -- staged bytes no dataset adopted (anywhere: an upload's chunks are written before any dataset exists)
      (select count(*)::int from dataset_files f where not exists (select 1 from datasets d where d.id = f.dataset_id)) as chunks,
      (select count(*)::int from audit_log where workspace_id = ${workspaceId} and object_type = 'dataset') as audit`;
  return row;
}

export const csvOf = (rows: (string | number)[][]) => rows.map((r) => r.join(",")).join("\n") + "\n";

// Large uploads: POST /api/datasets streams the body into PostgreSQL staging and answers 202 with a
// dataset.ingest job; the job (run here as the worker runs it, at the same time as the upload arrives)
// parses, checks and stores the dataset, reporting progress. A bad file fails the job with row and
// column and stores nothing; an aborted or stalled upload stores nothing either; staging is emptied.
import { createHash } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as getJob } from "@/app/api/jobs/[id]/route";
import { GET as getDataset } from "@/app/api/datasets/[id]/route";
import { POST as upload } from "@/app/api/datasets/route";
import { getDatabase } from "@/db/client";
import { ingestStagedUpload } from "@/server/datasets/ingest";
import {
  beginStagedUpload,
  cleanupStaleUploads,
  deleteStagedUpload,
  FILE_CHUNK_BYTES,
  getStagedUpload,
  readStagedUpload,
  stageUploadBody,
  StagedUploadAborted,
} from "@/server/datasets/staging";
import { deleteDataset } from "@/server/datasets/store";
import type { RoleAssignment } from "@/server/datasets/roles";
import { getQueue } from "@/server/jobs/queue";
import { apiRequest, makeTeam, routeContext, runIngestJob, streamingRequest, uploadFootprint } from "./support";

let team: Awaited<ReturnType<typeof makeTeam<{ analyst: ["analyst"]; reviewer: ["reviewer"] }>>>;

beforeAll(async () => {
  team = await makeTeam({ analyst: ["analyst"], reviewer: ["reviewer"] });
});

afterAll(async () => {
  await (await getQueue()).stop({ graceful: false, wait: true }).catch(() => {});
});

const HEADER = "date,sales,tv,radio,search,social,display,video,print,ooh,price,temperature\n";

/** `rows` generated rows (about 95 bytes each); `edit` may replace a line (1-based data row). */
function bigCsv(rows: number, edit: (row: number, line: string) => string = (_r, line) => line): Buffer {
  const parts: string[] = [HEADER];
  const day0 = Date.UTC(1990, 0, 1);
  for (let i = 0; i < rows; i++) {
    const date = new Date(day0 + i * 86_400_000).toISOString().slice(0, 10);
    const spends = Array.from({ length: 8 }, (_, s) => ((i * (37 + s * 11)) % 9973) + s * 10 + 0.25);
    const sales = 5000 + spends.reduce((sum, x, s) => sum + x * (0.2 + s / 20), 0) + (i % 17);
    const line = `${date},${sales.toFixed(2)},${spends.map((x) => x.toFixed(2)).join(",")},${(8 + (i % 9) / 3).toFixed(3)},${(-10 + (i % 41)).toFixed(1)}\n`;
    parts.push(edit(i + 1, line));
  }
  return Buffer.from(parts.join(""));
}

const roles: RoleAssignment = {
  date: { role: "period" },
  sales: { role: "outcome", unit: "EUR" },
  ...Object.fromEntries(["tv", "radio", "search", "social", "display", "video", "print", "ooh"].map((c) => [c, { role: "spend", unit: "EUR" }])),
  price: { role: "control", unit: "EUR" },
  temperature: { role: "control", unit: "°C" },
};

/** Yields `bytes` in pieces of `size` with a pause every `every` pieces (a client on a real network). */
async function* slowly(bytes: Buffer, size = 64 * 1024, every = 8, pauseMs = 5, failAfter?: number): AsyncGenerator<Uint8Array> {
  for (let offset = 0, n = 0; offset < bytes.length; offset += size, n++) {
    if (failAfter !== undefined && offset >= failAfter) throw new Error("socket hang up");
    yield new Uint8Array(bytes.subarray(offset, offset + size));
    if (n % every === 0) await new Promise((resolve) => setTimeout(resolve, pauseMs));
  }
}

/** The ids of the workspace's dataset.ingest runs so far: the next upload's job is the one not among them. */
async function ingestJobsSoFar(workspaceId: string): Promise<Set<string>> {
  const rows = await getDatabase().sql<{ id: string }[]>`
    select id from job_runs where workspace_id = ${workspaceId} and kind = 'dataset.ingest'`;
  return new Set(rows.map((row) => row.id));
}

/** The dataset.ingest run the route queued, once it exists (not a run of an earlier test, however recent). */
async function waitForJob(workspaceId: string, earlier: Set<string>): Promise<string> {
  const { sql } = getDatabase();
  for (let i = 0; i < 400; i++) {
    const rows = await sql<{ id: string }[]>`
      select id from job_runs where workspace_id = ${workspaceId} and kind = 'dataset.ingest'`;
    const fresh = rows.filter((row) => !earlier.has(row.id));
    if (fresh.length > 1) throw new Error(`the route queued ${fresh.length} jobs for one upload`);
    if (fresh.length === 1) return fresh[0].id;
    await new Promise((resolve) => setTimeout(resolve, 25));
  }
  throw new Error("the route queued no job");
}

/** Uploads `file` through the route (roles given, sent slowly) and runs the job it queued, as the worker would. */
async function uploadThroughJob(file: Buffer, filename: string) {
  const earlier = await ingestJobsSoFar(team.workspace.id);
  const query = `filename=${filename}&options=${encodeURIComponent(JSON.stringify({ roles }))}`;
  const responding = upload(
    streamingRequest(team.tokens.analyst, slowly(file), { "content-type": "text/csv", "content-length": String(file.length) }, query),
    routeContext(),
  );
  const jobId = await waitForJob(team.workspace.id, earlier);
  const outcome = await runIngestJob(jobId);
  return { jobId, outcome, response: await responding };
}

/** Stages `sent` for an upload, then holds the body open until `release()` (a client or web server gone quiet). */
function stageThenHang(uploadId: string, sent: Buffer) {
  let release!: () => void;
  const hanging = new Promise<void>((resolve) => (release = resolve));
  const staging = stageUploadBody(
    uploadId,
    (async function* () {
      yield new Uint8Array(sent);
      await hanging;
    })(),
    { maxBytes: 100 * 1024 * 1024 },
  );
  staging.catch(() => {});
  return { staging, release };
}

async function stagedChunks(): Promise<number> {
  const [row] = await getDatabase().sql<{ n: number }[]>`select count(*)::int as n from dataset_files f where not exists (select 1 from datasets d where d.id = f.dataset_id)`;
  return row.n;
}

describe("a large upload through the route and the dataset.ingest job", () => {
  it("is staged while the job checks and stores it in parallel, with progress; 202 then the job's result", async () => {
    const file = bigCsv(70_000);
    expect(file.length).toBeGreaterThan(5 * 1024 * 1024); // over the inline limit
    const before = await uploadFootprint(team.workspace.id);
    const earlier = await ingestJobsSoFar(team.workspace.id);
    const query = `filename=big.csv&name=Big%20history&options=${encodeURIComponent(JSON.stringify({ roles }))}`;
    const responding = upload(
      streamingRequest(team.tokens.analyst, slowly(file), { "content-type": "text/csv", "content-length": String(file.length) }, query),
      routeContext(),
    );
    const jobId = await waitForJob(team.workspace.id, earlier);
    // the worker starts on it while the file is still arriving
    const ingesting = runIngestJob(jobId);
    const response = await responding;
    const body = await response.json();
    expect(response.status, JSON.stringify(body)).toBe(202);
    expect(body).toMatchObject({ job: { id: jobId, kind: "dataset.ingest", links: { self: `/api/jobs/${jobId}` } }, upload: { receivedBytes: file.length } });
    expect(response.headers.get("location")).toBe(`/api/jobs/${jobId}`);

    const outcome = await ingesting;
    expect(outcome.ok, JSON.stringify(outcome)).toBe(true);
    if (!outcome.ok) return;
    expect(outcome.result).toMatchObject({ rowCount: 70_000, columnCount: 12, status: "ready", name: "Big history" });
    // progress: "Checking rows" in bytes of the declared size, growing, then "Stored"
    const checking = outcome.progress.filter((p) => p.phase === "Checking rows" && p.done > 0);
    expect(checking.length).toBeGreaterThan(2);
    expect(checking.every((p) => p.total === file.length)).toBe(true);
    expect(checking.map((p) => p.done)).toEqual([...checking.map((p) => p.done)].sort((a, b) => a - b));
    expect(checking.at(-1)!.message).toMatch(/rows checked$/);
    expect(outcome.progress.at(-1)).toMatchObject({ phase: "Stored", done: file.length, total: file.length, message: "70,000 rows stored" });

    const job = await (await getJob(apiRequest(`/api/jobs/${jobId}`, { token: team.tokens.analyst }), routeContext({ id: jobId }))).json();
    expect(job).toMatchObject({ status: "succeeded", result: { datasetId: expect.any(String), rowCount: 70_000 } });
    const datasetId = job.result.datasetId as string;
    // where the outcome lives: the API resource and the page the browser opens (roles given: the history itself)
    expect(job.links).toEqual({ self: `/api/jobs/${jobId}`, dataset: `/api/datasets/${datasetId}`, page: `/datasets/${datasetId}` });
    const dataset = await (await getDataset(apiRequest(`/api/datasets/${datasetId}`, { token: team.tokens.reviewer }), routeContext({ id: datasetId }))).json();
    expect(dataset).toMatchObject({ rowCount: 70_000, byteSize: file.length, originalFilename: "big.csv", uploadedByName: "analyst" });
    expect(dataset.columns.find((c: { name: string }) => c.name === "temperature")).toMatchObject({ role: "control", unit: "°C", min: -10, max: 30 });

    const after = await uploadFootprint(team.workspace.id);
    expect(after).toMatchObject({ datasets: before.datasets + 1, rows: before.rows + 70_000, uploads: 0, chunks: 0, audit: before.audit + 1 });
    // the staged bytes became the original file as they were written: 1 MiB chunks in order, byte for byte
    const chunks = await getDatabase().sql<{ seq: number; bytes: Buffer }[]>`
      select seq, bytes from dataset_files where dataset_id = ${datasetId} order by seq`;
    expect(chunks.map((c) => c.seq)).toEqual(chunks.map((_, i) => i));
    expect(chunks.slice(0, -1).every((c) => c.bytes.length === FILE_CHUNK_BYTES)).toBe(true);
    expect(Buffer.concat(chunks.map((c) => c.bytes)).equals(file)).toBe(true);
    expect(dataset.sha256).toBe(createHash("sha256").update(file).digest("hex"));
    const [audit] = await getDatabase().sql<{ details: Record<string, unknown> }[]>`
      select details from audit_log where object_type = 'dataset' and object_id = ${datasetId}`;
    expect(audit.details).toMatchObject({ via: "background", rows: 70_000 });
  });

  it("fails the job with every problem's row and column when the file is bad, and stores nothing", async () => {
    const file = bigCsv(60_000, (row, line) => {
      if (row === 41_234) return line.replace(/^([^,]*,[^,]*,)[^,]*/, "$1lots"); // tv is not a number
      if (row === 55_000) return line.replace(/^([^,]*,[^,]*,[^,]*,)[^,]*/, "$1-120.5"); // negative radio spend
      return line;
    });
    const before = await uploadFootprint(team.workspace.id);
    const { jobId, outcome, response } = await uploadThroughJob(file, "bad.csv");
    expect(response.status).toBe(202);
    expect(outcome.ok).toBe(false);
    if (outcome.ok) return;
    expect(outcome.message).toBe("The file was not stored: 2 problems (non-numeric cell, negative spend).");
    expect(outcome.details).toEqual([
      expect.objectContaining({ kind: "non-numeric", row: 41_234, line: 41_235, column: "tv", columnNumber: 3, value: "lots" }),
      expect.objectContaining({ kind: "negative-spend", row: 55_000, line: 55_001, column: "radio", columnNumber: 4 }),
    ]);
    const job = await (await getJob(apiRequest(`/api/jobs/${jobId}`, { token: team.tokens.analyst }), routeContext({ id: jobId }))).json();
    expect(job).toMatchObject({ status: "failed", error: { message: outcome.message, details: outcome.details } });
    expect(job.links).toEqual({ self: `/api/jobs/${jobId}` }); // nothing stored, nothing to link to
    expect(await uploadFootprint(team.workspace.id)).toEqual(before);
  });

  it("stores nothing when only the role check finds a problem (after every row was read and the rows' COPY was ending)", async () => {
    const file = bigCsv(60_000, (row, line) => (row === 59_990 ? line.replace(/^([^,]*,[^,]*,[^,]*,)[^,]*/, "$1-7.5") : line));
    const before = await uploadFootprint(team.workspace.id);
    const { outcome, response } = await uploadThroughJob(file, "late.csv");
    expect(response.status).toBe(202);
    expect(outcome.ok).toBe(false);
    if (outcome.ok) return;
    expect(outcome.details).toEqual([expect.objectContaining({ kind: "negative-spend", row: 59_990, column: "radio" })]);
    expect(await uploadFootprint(team.workspace.id)).toEqual(before);
  });

  it("stores nothing when the client goes away mid-upload (the job fails, staging is emptied)", async () => {
    const file = bigCsv(70_000);
    const before = await uploadFootprint(team.workspace.id);
    const earlier = await ingestJobsSoFar(team.workspace.id);
    const responding = upload(
      streamingRequest(team.tokens.analyst, slowly(file, 64 * 1024, 8, 5, 3 * 1024 * 1024), { "content-type": "text/csv", "content-length": String(file.length) }),
      routeContext(),
    );
    const jobId = await waitForJob(team.workspace.id, earlier);
    const ingesting = runIngestJob(jobId);
    const response = await responding;
    expect(response.status).toBeGreaterThanOrEqual(400); // nobody is there to read it
    const outcome = await ingesting;
    expect(outcome).toMatchObject({ ok: false, message: "The upload was interrupted before the whole file arrived. Nothing was stored." });
    expect(await uploadFootprint(team.workspace.id)).toEqual(before);
    expect(await stagedChunks()).toBe(0);
  });

  it("lets the job stop early on a hopeless file while it still arrives; the route still answers 202", async () => {
    // an unclosed quote in row 1 makes the rest of the file one endless cell: reading stops at 4 MB
    const file = Buffer.concat([Buffer.from(HEADER + '1990-01-01,"5000,1,2,3,4,5,6,7,8,9,10\n'), bigCsv(150_000).subarray(HEADER.length)]);
    const before = await uploadFootprint(team.workspace.id);
    const earlier = await ingestJobsSoFar(team.workspace.id);
    // the client sends 9 MB (two staged chunks of 4 MB and a part), then holds the rest back until the job has
    // given up: a slow uplink, made certain
    let jobDone!: () => void;
    const jobGaveUp = new Promise<void>((resolve) => (jobDone = resolve));
    async function* heldBack(): AsyncGenerator<Uint8Array> {
      const head = 9 * 1024 * 1024;
      yield* slowly(file.subarray(0, head), 64 * 1024, 4, 10);
      await jobGaveUp;
      yield* slowly(file.subarray(head), 64 * 1024, 4, 10);
    }
    const responding = upload(
      streamingRequest(team.tokens.analyst, heldBack(), { "content-type": "text/csv", "content-length": String(file.length) }, "filename=quote.csv"),
      routeContext(),
    );
    const jobId = await waitForJob(team.workspace.id, earlier);
    const outcome = await runIngestJob(jobId);
    jobDone();
    expect(outcome.ok).toBe(false);
    if (outcome.ok) return;
    expect(outcome.details[0]).toMatchObject({ kind: "row-too-long", line: 2 });
    const response = await responding;
    expect(response.status).toBe(202);
    expect((await response.json()).upload.receivedBytes).toBeLessThan(file.length);
    expect(await uploadFootprint(team.workspace.id)).toEqual(before);
    expect(await stagedChunks()).toBe(0);
  });
});

describe("staging", () => {
  it("gives up on an upload whose web server stopped sending (stall), storing nothing", async () => {
    const before = await uploadFootprint(team.workspace.id);
    const staged = await beginStagedUpload({ workspaceId: team.workspace.id, userId: team.members.analyst.id, originalFilename: "stalled.csv", options: { roles } });
    // a web server that wrote two chunks and died: the body never ends
    const { staging, release } = stageThenHang(staged.id, bigCsv(30_000).subarray(0, 2_200_000));
    await expect(ingestStagedUpload(staged.id, { stallMs: 300, pollMs: 20 })).rejects.toBeInstanceOf(StagedUploadAborted);
    release();
    await expect(staging).rejects.toBeInstanceOf(StagedUploadAborted);
    expect(await getStagedUpload(staged.id)).toBeNull();
    expect(await uploadFootprint(team.workspace.id)).toEqual(before);
  });

  it("refuses a body past the limit and aborts the staged upload", async () => {
    const staged = await beginStagedUpload({ workspaceId: team.workspace.id, userId: null, originalFilename: "big.csv" });
    await expect(stageUploadBody(staged.id, slowly(bigCsv(30_000)), { maxBytes: 1_000_000 })).rejects.toThrow("larger than the limit");
    expect(await getStagedUpload(staged.id)).toMatchObject({ state: "aborted", chunkCount: expect.any(Number) });
    await expect(async () => {
      for await (const _ of readStagedUpload(staged.id)) void _;
    }).rejects.toThrow("larger than the limit");
    expect(await stagedChunks()).toBe(0);
    await deleteStagedUpload(staged.id); // what its job would have done
  });

  it("a reader waiting for chunks goes on when they are committed (a nudge), not at its next poll", async () => {
    const staged = await beginStagedUpload({ workspaceId: team.workspace.id, userId: null, originalFilename: "nudged.csv" });
    const file = bigCsv(30_000);
    let read = 0;
    // polls 30 s apart: only the web server's nudges can move this reader along in time
    const reading = (async () => {
      for await (const piece of readStagedUpload(staged.id, { pollMs: 30_000, stallMs: 120_000 })) read += piece.length;
    })();
    await new Promise((resolve) => setTimeout(resolve, 200)); // the reader is waiting for the first chunk
    const started = Date.now();
    await stageUploadBody(staged.id, slowly(file), { maxBytes: 100 * 1024 * 1024 });
    await Promise.race([reading, new Promise((_, reject) => setTimeout(() => reject(new Error("the reader waited for its poll")), 15_000))]);
    expect(read).toBe(file.length);
    expect(Date.now() - started).toBeLessThan(30_000);
    await deleteStagedUpload(staged.id);
  });

  it("sweeps chunks nobody owns (a database crash empties the unlogged uploads), never a dataset's file or an upload in progress", async () => {
    const { sql } = getDatabase();
    // an upload in progress: its row and its first chunks
    const live = await beginStagedUpload({ workspaceId: team.workspace.id, userId: null, originalFilename: "live.csv" });
    const { staging, release } = stageThenHang(live.id, bigCsv(50_000).subarray(0, 4_500_000));
    await expect.poll(async () => (await getStagedUpload(live.id))?.chunkCount, { timeout: 10_000 }).toBe(4);
    // chunks whose upload row is gone (what a crash leaves)
    const orphan = crypto.randomUUID();
    await sql`insert into dataset_files (dataset_id, seq, bytes) values (${orphan}, 0, ${Buffer.from("date,sales\n")}), (${orphan}, 1, ${Buffer.from("x")})`;
    // a stored dataset's file
    const [stored] = await sql<{ id: string; n: number }[]>`
      select d.id, count(f.seq)::int as n from datasets d join dataset_files f on f.dataset_id = d.id
      where d.workspace_id = ${team.workspace.id} group by d.id limit 1`;
    expect(stored.n).toBeGreaterThan(0);

    expect(await cleanupStaleUploads()).toBe(0); // no upload is stale
    const count = async (id: string) => (await sql<{ n: number }[]>`select count(*)::int as n from dataset_files where dataset_id = ${id}`)[0].n;
    expect(await count(orphan)).toBe(0);
    expect(await count(live.id)).toBe(4);
    expect(await count(stored.id)).toBe(stored.n);

    release();
    await staging; // ends normally: the upload is "received"; nobody ingests it here
    await deleteStagedUpload(live.id);
    expect(await count(live.id)).toBe(0);
    expect(await stagedChunks()).toBe(0);
  });

  it("deletes a dataset's original file with the dataset (no foreign key does it)", async () => {
    const { sql } = getDatabase();
    const staged = await beginStagedUpload({ workspaceId: team.workspace.id, userId: team.members.analyst.id, originalFilename: "short-lived.csv", options: { roles } });
    await stageUploadBody(staged.id, slowly(bigCsv(20_000)), { maxBytes: 100 * 1024 * 1024 });
    const stored = await ingestStagedUpload(staged.id);
    expect(stored.ok).toBe(true);
    if (!stored.ok) return;
    const files = async () => (await sql<{ n: number }[]>`select count(*)::int as n from dataset_files where dataset_id = ${stored.dataset.id}`)[0].n;
    expect(await files()).toBe(2);
    expect(await deleteDataset({ workspaceId: team.workspace.id, datasetId: stored.dataset.id })).toBe(true);
    expect(await files()).toBe(0);
  });
});

// A client that goes away in the middle of an upload (the TCP connection closed after part of the body)
// leaves nothing behind: no dataset, no rows, no stored file, no audit entry, no staged chunks. Both paths
// of POST /api/datasets: inline (declared ≤ 5 MB: parsed and stored in the request's transaction) and
// staged (declared larger: chunks in PostgreSQL, ingested by the worker's job while they arrive). The bytes
// sent before the abort are complete, valid CSV lines, so a server that took the early end for the end of
// the file would store a truncated history: that is what this catches.
import { randomBytes } from "node:crypto";
import { request as httpRequest } from "node:http";
import type postgres from "postgres";
import { afterAll, beforeAll, expect, test } from "vitest";
import { e2e } from "./support/env";
import { createTokenFor, testDatabase } from "./support/sign-in";

let sql: postgres.Sql;
let token: string;

beforeAll(async () => {
  sql = testDatabase();
  token = (await createTokenFor(sql, "analyst@larkspur.example", "larkspur", "faults upload abort")).token;
});

afterAll(async () => {
  await sql`delete from api_tokens where name = 'faults upload abort'`;
  await sql.end();
});

/** Weekly rows of a small spend history, as CSV lines (each complete). */
function csvLines(count: number): string {
  let text = "week,sales,search,social,video\n";
  const start = Date.UTC(1900, 0, 1);
  for (let i = 0; i < count; i++) {
    const date = new Date(start + i * 7 * 86_400_000).toISOString().slice(0, 10);
    text += `${date},${(50_000 + (i % 97) * 13.5).toFixed(2)},${(1000 + (i % 31) * 7).toFixed(2)},${(800 + (i % 17) * 5).toFixed(2)},${(600 + (i % 13) * 3).toFixed(2)}\n`;
  }
  return text;
}

/** Declares `declaredBytes`, sends `sent` (valid lines), waits, then destroys the connection. */
function abortedUpload(filename: string, declaredBytes: number, sent: string): Promise<void> {
  const url = new URL(`/api/datasets?filename=${encodeURIComponent(filename)}`, e2e.baseUrl);
  return new Promise((resolve) => {
    const request = httpRequest(url, {
      method: "POST",
      headers: { authorization: `Bearer ${token}`, "content-type": "text/csv", "content-length": String(declaredBytes) },
    });
    request.on("error", () => resolve()); // the socket we destroyed
    request.on("response", (response) => {
      // The server must not answer before the body is complete; if it did, that is a finding.
      response.resume();
      resolve();
    });
    request.write(sent, () => {
      setTimeout(() => {
        request.destroy();
        resolve();
      }, 1500);
    });
  });
}

async function storedFor(filename: string) {
  const [row] = await sql<{ datasets: number; rows: number; files: number; audits: number; uploads: number; liveUploads: number; chunks: number }[]>`
    select
      (select count(*)::int from datasets where original_filename = ${filename}) as datasets,
      (select count(*)::int from dataset_rows r join datasets d on d.id = r.dataset_id where d.original_filename = ${filename}) as rows,
      (select count(*)::int from dataset_files f join datasets d on d.id = f.dataset_id where d.original_filename = ${filename}) as files,
      (select count(*)::int from audit_log where action like 'dataset.%' and details::text like ${`%${filename}%`}) as audits,
      (select count(*)::int from dataset_uploads where original_filename = ${filename}) as uploads,
      (select count(*)::int from dataset_uploads where original_filename = ${filename} and state <> 'aborted') as "liveUploads",
      (select count(*)::int from dataset_files f join dataset_uploads u on u.id = f.dataset_id where u.original_filename = ${filename}
         and not exists (select 1 from datasets d where d.id = f.dataset_id)) as chunks`;
  return row;
}

async function eventually<T>(read: () => Promise<T>, done: (value: T) => boolean, timeoutMs = 90_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  let value = await read();
  while (!done(value) && Date.now() < deadline) {
    await new Promise((resolve) => setTimeout(resolve, 500));
    value = await read();
  }
  return value;
}

test("inline upload (declared 2 MB) aborted after 1 MB of valid lines: nothing stored", async () => {
  const filename = `abort-inline-${randomBytes(4).toString("hex")}.csv`;
  const rowsBefore = (await sql<{ n: number }[]>`select count(*)::int as n from dataset_rows`)[0].n;
  const body = csvLines(30_000);
  expect(body.length).toBeGreaterThan(1_000_000);
  await abortedUpload(filename, 2_000_000, body.slice(0, body.lastIndexOf("\n", 1_000_000) + 1));
  // Give the server time to notice and roll back; then nothing may exist.
  await new Promise((resolve) => setTimeout(resolve, 3000));
  expect(await storedFor(filename)).toEqual({ datasets: 0, rows: 0, files: 0, audits: 0, uploads: 0, liveUploads: 0, chunks: 0 });
  expect((await sql<{ n: number }[]>`select count(*)::int as n from dataset_rows`)[0].n).toBe(rowsBefore);
});

test("staged upload (declared 12 MB) aborted after 3 MB of valid lines: the staging is marked aborted, its chunks freed, no dataset", async () => {
  const filename = `abort-staged-${randomBytes(4).toString("hex")}.csv`;
  const body = csvLines(90_000);
  expect(body.length).toBeGreaterThan(3_000_000);
  await abortedUpload(filename, 12_000_000, body.slice(0, body.lastIndexOf("\n", 3_000_000) + 1));
  // The web server marks the upload aborted when its request body fails; the ingest job gives up.
  const after = await eventually(
    () => storedFor(filename),
    (state) => state.liveUploads === 0 && state.chunks === 0,
  );
  expect(after).toMatchObject({ datasets: 0, rows: 0, files: 0, audits: 0, liveUploads: 0, chunks: 0 });
  expect(after.uploads).toBeLessThanOrEqual(1); // the aborted record (or none once cleaned up)
  const jobs = await sql<{ status: string }[]>`
    select status from job_runs where kind = 'dataset.ingest' and input->>'filename' = ${filename}`;
  const settled = await eventually(
    () => sql<{ status: string }[]>`select status from job_runs where kind = 'dataset.ingest' and input->>'filename' = ${filename}`,
    (rows) => rows.every((row) => !["queued", "running"].includes(row.status)),
  );
  expect(settled.length).toBe(jobs.length);
  expect(settled.every((row) => row.status !== "succeeded")).toBe(true);
  expect((await storedFor(filename)).datasets).toBe(0);
});

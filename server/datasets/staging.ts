import "server-only";
import type { Readable } from "node:stream";
import type postgres from "postgres";
import { getDatabase } from "@/db/client";
import { copyFrom, endCopy } from "./pg-copy";
import { ChunkCopyParser } from "./chunk-copy";
import { CopyBuffer, uuidBytes } from "./copy-binary";
import type { DatasetUploadState } from "@/db/schema/dataset-uploads";
import type { DatasetOptionsInput } from "./roles";

/**
 * Staging of large uploads in PostgreSQL (tables dataset_uploads and dataset_upload_chunks), so any
 * worker on any machine can ingest what any web server received:
 *
 *   web server                                   worker (dataset.ingest job)
 *   beginStagedUpload → enqueue the job  ──────▶ readStagedUpload follows the chunks as they arrive,
 *   stageUploadBody: 1 MiB chunks, each           parses, checks and COPYs (createDataset), then
 *     committed at once, then "received"          deleteStagedUpload whatever the outcome
 *   (or abortStagedUpload: the reader fails)
 *
 * The worker starts while the file is still arriving, so receiving and checking overlap. Staged bytes
 * are never a dataset: only the ingest's own transaction creates one.
 */

export const STAGING_CHUNK_BYTES = 4 * 1024 * 1024;
/** A "receiving" upload with no new chunk for this long belongs to a web server that went away. */
export const STAGING_STALL_MS = 60_000;
/** Staged uploads older than this are removed by cleanupStaleUploads (the ingest runs it). */
export const STAGING_MAX_AGE_MS = 6 * 60 * 60 * 1000;

export type StagedUpload = {
  id: string;
  workspaceId: string;
  createdBy: string | null;
  originalFilename: string;
  name: string | null;
  options: DatasetOptionsInput;
  declaredBytes: number | null;
  receivedBytes: number;
  chunkCount: number;
  state: DatasetUploadState;
  abortReason: string | null;
};

/** Thrown by the reader when the upload was aborted or its web server stopped sending. */
export class StagedUploadAborted extends Error {
  constructor(readonly reason: string) {
    super(reason);
    this.name = "StagedUploadAborted";
  }
}

/** Thrown by stageUploadBody past the size limit (the route answers 413). */
export class StagedUploadTooLarge extends Error {
  constructor(readonly limit: number) {
    super(`The file is larger than the limit of ${formatMiB(limit)}.`);
    this.name = "StagedUploadTooLarge";
  }
}

/** The reason when the upload row was aborted or removed while the body was still arriving. */
export const STOPPED = "The upload was stopped while it was being received.";

const formatMiB = (bytes: number) => `${(bytes / (1024 * 1024)).toLocaleString("en", { maximumFractionDigits: 0 })} MB`;

type UploadRow = {
  id: string;
  workspace_id: string;
  created_by: string | null;
  original_filename: string;
  name: string | null;
  options: DatasetOptionsInput;
  declared_bytes: string | number | null;
  received_bytes: string | number;
  chunk_count: number;
  state: DatasetUploadState;
  abort_reason: string | null;
};

const toUpload = (r: UploadRow): StagedUpload => ({
  id: r.id,
  workspaceId: r.workspace_id,
  createdBy: r.created_by,
  originalFilename: r.original_filename,
  name: r.name,
  options: r.options ?? {},
  declaredBytes: r.declared_bytes === null ? null : Number(r.declared_bytes),
  receivedBytes: Number(r.received_bytes),
  chunkCount: r.chunk_count,
  state: r.state,
  abortReason: r.abort_reason,
});

export async function beginStagedUpload(input: {
  workspaceId: string;
  userId: string | null;
  originalFilename: string;
  name?: string | null;
  options?: DatasetOptionsInput;
  declaredBytes?: number | null;
}): Promise<StagedUpload> {
  const { sql } = getDatabase();
  const [row] = await sql<UploadRow[]>`
    insert into dataset_uploads (workspace_id, created_by, original_filename, name, options, declared_bytes)
    values (${input.workspaceId}, ${input.userId}, ${input.originalFilename.slice(0, 500)}, ${input.name ?? null},
            ${JSON.stringify(input.options ?? {})}::jsonb, ${input.declaredBytes ?? null})
    returning *`;
  return toUpload(row);
}

export async function getStagedUpload(uploadId: string): Promise<StagedUpload | null> {
  const { sql } = getDatabase();
  const [row] = await sql<UploadRow[]>`select * from dataset_uploads where id = ${uploadId}`;
  return row ? toUpload(row) : null;
}

/**
 * Streams `source` into the upload's chunks, each committed as it is written (so the worker can read
 * along), and marks the upload "received". Past `maxBytes`, or when the source fails (the client went
 * away), the upload is marked aborted, its chunks are deleted and the error is rethrown.
 */
export async function stageUploadBody(
  uploadId: string,
  source: AsyncIterable<Uint8Array>,
  options: { maxBytes: number; onProgress?: (receivedBytes: number) => void; beforeReceived?: () => Promise<void> },
): Promise<{ receivedBytes: number; chunkCount: number }> {
  const { sql } = getDatabase();
  let pieces: Buffer[] = [];
  let pieceBytes = 0;
  let received = 0;
  let seq = 0;
  let writing: Promise<void> = Promise.resolve();

  // Each chunk in its own short transaction: the upload row first (locked; once it is aborted or
  // deleted, e.g. the ingest gave up on a bad file, nothing more is written and the caller learns it),
  // then the bytes by binary COPY (no hex text either way), committed at once for the reader.
  const idBytes = uuidBytes(uploadId);
  const write = (bytes: Buffer[], length: number, n: number, total: number) =>
    sql.begin(async (tx) => {
      await tx`set local synchronous_commit = off`; // staged bytes are disposable (unlogged tables)
      const rows = await tx`
        update dataset_uploads set chunk_count = ${n + 1}, received_bytes = ${total}, updated_at = now()
        where id = ${uploadId} and state = 'receiving' returning id`;
      if (rows.length === 0) throw new StagedUploadAborted(STOPPED);
      const copy = await copyFrom(tx, "copy dataset_upload_chunks (upload_id, seq, bytes) from stdin (format binary)");
      await endCopy(tx, copy, [...chunkTuple(idBytes, n, bytes, length)]);
    }) as Promise<void>;

  const flush = async () => {
    if (pieceBytes === 0) return;
    // the pieces as they came (no copy into one buffer): COPY sends them one after the other
    const bytes = pieces;
    const length = pieceBytes;
    pieces = [];
    pieceBytes = 0;
    // one write in flight while the next chunk arrives
    await writing;
    writing = write(bytes, length, seq++, received);
    writing.catch(() => {});
  };

  try {
    for await (const value of source) {
      const chunk = Buffer.from(value.buffer, value.byteOffset, value.byteLength);
      received += chunk.length;
      if (received > options.maxBytes) throw new StagedUploadTooLarge(options.maxBytes);
      pieces.push(chunk);
      pieceBytes += chunk.length;
      if (pieceBytes >= STAGING_CHUNK_BYTES) {
        await flush();
        options.onProgress?.(received);
      }
    }
    await flush();
    await writing;
    await options.beforeReceived?.();
    const rows = await sql`
      update dataset_uploads set state = 'received', chunk_count = ${seq}, received_bytes = ${received}, updated_at = now()
      where id = ${uploadId} and state = 'receiving' returning id`;
    if (rows.length === 0) throw new StagedUploadAborted(STOPPED);
    return { receivedBytes: received, chunkCount: seq };
  } catch (error) {
    await writing.catch(() => {});
    const reason =
      error instanceof StagedUploadTooLarge
        ? error.message
        : error instanceof StagedUploadAborted
          ? error.reason
          : "The upload was interrupted before the whole file arrived.";
    await abortStagedUpload(uploadId, reason).catch(() => {});
    throw error;
  }
}

/**
 * The staged bytes as the dataset's original file (dataset_files, 1 MiB pieces in order), copied inside
 * PostgreSQL in the ingest's transaction: the bytes do not travel to the worker and back. The bytes are
 * the ones the ingest read (it reads only this upload's chunks, all of them, before it stores).
 */
export async function copyStagedFile(tx: postgres.TransactionSql, uploadId: string, datasetId: string): Promise<void> {
  await tx`
    insert into dataset_files (dataset_id, seq, bytes)
    select ${datasetId}, (row_number() over (order by c.seq, piece) - 1)::int,
           substring(c.bytes from piece * ${FILE_PIECE_BYTES} + 1 for ${FILE_PIECE_BYTES})
    from dataset_upload_chunks c, generate_series(0, (length(c.bytes) - 1) / ${FILE_PIECE_BYTES}) as piece
    where c.upload_id = ${uploadId}
    order by c.seq, piece`;
}

const FILE_PIECE_BYTES = 1024 * 1024;

/** Marks an upload aborted (a reader following it fails) and frees its chunks at once. */
export async function abortStagedUpload(uploadId: string, reason: string): Promise<void> {
  const { sql } = getDatabase();
  await sql.begin(async (tx) => {
    await tx`update dataset_uploads set state = 'aborted', abort_reason = ${reason.slice(0, 500)}, updated_at = now()
             where id = ${uploadId} and state <> 'aborted'`;
    await tx`delete from dataset_upload_chunks where upload_id = ${uploadId}`;
  });
}

/** Removes an upload and its chunks (after the ingest, whatever its outcome). */
export async function deleteStagedUpload(uploadId: string): Promise<void> {
  const { sql } = getDatabase();
  await sql`delete from dataset_uploads where id = ${uploadId}`;
}

/** Removes staged uploads nobody will ingest any more (web server or worker died); returns how many. */
export async function cleanupStaleUploads(maxAgeMs = STAGING_MAX_AGE_MS): Promise<number> {
  const { sql } = getDatabase();
  const rows = await sql`
    delete from dataset_uploads where updated_at < now() - make_interval(secs => ${maxAgeMs / 1000}) returning id`;
  return rows.length;
}

/** One binary-COPY tuple (upload_id, seq, bytes) with the format's header and trailer around it; `bytes` in pieces. */
function* chunkTuple(uploadId: Buffer, seq: number, bytes: Buffer[], length: number): Generator<Buffer> {
  const out = new CopyBuffer(64);
  out.header();
  out.ensure(2 + 20 + 8 + 4);
  out.int16(3);
  out.int32(16);
  out.bytes(uploadId);
  out.int32(4);
  out.int32(seq);
  out.int32(length);
  yield* out.take(true);
  yield* bytes;
  out.trailer();
  yield* out.take(true);
}

async function readChunks(uploadId: string, from: number, limit: number): Promise<{ seq: number; bytes: Buffer }[]> {
  const { sql } = getDatabase();
  // binary COPY: the bytes arrive as they are stored (a plain select would send them as hex text)
  const stream = (await sql
    .unsafe(
      `copy (select seq, bytes from dataset_upload_chunks where upload_id = '${uploadId}' and seq >= ${from} order by seq limit ${limit}) to stdout (format binary)`,
    )
    .readable()) as Readable;
  // flowing mode: postgres.js 3.4.9's COPY TO readable stalls when read with for-await past ~1 MB
  const parser = new ChunkCopyParser();
  await new Promise<void>((resolve, reject) => {
    stream.on("data", (part: Buffer) => {
      try {
        parser.push(part);
      } catch (error) {
        stream.destroy(error as Error);
      }
    });
    stream.once("end", resolve);
    stream.once("error", reject);
  });
  return parser.finish();
}

const isUuid = (s: string) => /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(s);

const READ_PIECE_BYTES = 64 * 1024;

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/**
 * The staged bytes in order, following an upload that is still arriving: waits for more chunks while
 * it is "receiving", ends after the last chunk once it is "received", and throws StagedUploadAborted
 * when it was aborted or no chunk came for `stallMs` (then it marks it aborted itself).
 */
export async function* readStagedUpload(
  uploadId: string,
  options: { pollMs?: number; stallMs?: number; batch?: number } = {},
): AsyncGenerator<Buffer> {
  if (!isUuid(uploadId)) throw new StagedUploadAborted("The upload is no longer there.");
  const { sql } = getDatabase();
  const pollMs = options.pollMs ?? 50;
  const stallMs = options.stallMs ?? STAGING_STALL_MS;
  const batch = options.batch ?? 2;
  let next = 0;
  let waitingSince: number | null = null;
  let recheck = false;
  let prefetched: Promise<{ seq: number; bytes: Buffer }[]> | null = null;
  for (;;) {
    const rows = await (prefetched ?? readChunks(uploadId, next, batch));
    prefetched = null;
    const ready: Buffer[] = [];
    for (const row of rows) {
      if (row.seq !== next + ready.length) break; // a gap: the chunk before it is not committed yet
      ready.push(row.bytes);
    }
    if (ready.length > 0) {
      next += ready.length;
      // the next batch is fetched while this one is parsed
      prefetched = readChunks(uploadId, next, batch);
      prefetched.catch(() => {});
      // in pieces the size of a network read: the CSV reader parses in steps of what it is given
      for (const bytes of ready) for (let at = 0; at < bytes.length; at += READ_PIECE_BYTES) yield bytes.subarray(at, at + READ_PIECE_BYTES);
      waitingSince = null;
      recheck = false;
      continue;
    }
    const [upload] = await sql<{ state: DatasetUploadState; chunk_count: number; abort_reason: string | null; idle_ms: number }[]>`
      select state, chunk_count, abort_reason, (extract(epoch from now() - updated_at) * 1000)::float8 as idle_ms
      from dataset_uploads where id = ${uploadId}`;
    if (!upload) throw new StagedUploadAborted("The upload is no longer there.");
    if (upload.state === "aborted") throw new StagedUploadAborted(upload.abort_reason ?? "The upload was interrupted.");
    if (upload.state === "received") {
      if (next >= upload.chunk_count) return;
      // the last chunks may have committed between the two queries: look once more before giving up
      if (recheck) throw new Error(`staged upload ${uploadId}: chunk ${next} of ${upload.chunk_count} is missing`);
      recheck = true;
      continue;
    }
    if (upload.state === "receiving") {
      if (upload.idle_ms > stallMs) {
        const reason = "The upload stopped arriving before the whole file was received.";
        await abortStagedUpload(uploadId, reason);
        throw new StagedUploadAborted(reason);
      }
      waitingSince ??= Date.now();
      // poll fast at first, then back off to a quarter of a second
      await sleep(Date.now() - waitingSince < 2000 ? pollMs : Math.max(pollMs, 250));
    }
  }
}

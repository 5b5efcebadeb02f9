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
 * Staging of large uploads in PostgreSQL (dataset_uploads, and the bytes as 1 MiB chunks in
 * dataset_files under the upload's id), so any worker on any machine can ingest what any web server
 * received:
 *
 *   web server                                   worker (dataset.ingest job)
 *   beginStagedUpload → enqueue the job  ──────▶ readStagedUpload follows the chunks as they arrive,
 *   stageUploadBody: 4 chunks of 1 MiB per        parses, checks and COPYs (createDataset: the dataset
 *     transaction, committed at once, then        takes the upload's id, so the chunks become its
 *     "received"                                  original file as they are), then deleteStagedUpload
 *   (or abortStagedUpload: the reader fails)      whatever the outcome
 *
 * The worker starts while the file is still arriving, so receiving and checking overlap. The bytes are
 * written once: a dataset adopts them instead of copying them. Chunks without a dataset are not a
 * dataset's file (every read of a file starts from its dataset) and are deleted with their upload.
 */

/** Size of the chunks in dataset_files (every one but the last of a file has exactly this size). */
export const FILE_CHUNK_BYTES = 1024 * 1024;
/** How much the web server collects before it writes (whole chunks; the rest waits for more bytes). */
export const STAGING_WRITE_BYTES = 4 * FILE_CHUNK_BYTES;
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
  const pending = new PendingBytes();
  let received = 0;
  let seq = 0;
  let writing: Promise<void> = Promise.resolve();

  // A few chunks per short transaction: the upload row first (locked; once it is aborted or deleted,
  // e.g. the ingest gave up on a bad file, nothing more is written and the caller learns it), then the
  // bytes by binary COPY (no hex text either way), committed at once for the reader. Asynchronous
  // commit: an upload in flight is lost in a crash anyway, and the ingest's own (synchronous) commit
  // comes later in the log, so a stored dataset never misses a chunk.
  const idBytes = uuidBytes(uploadId);
  const write = (chunks: Buffer[][], firstSeq: number, total: number) =>
    sql.begin(async (tx) => {
      await tx`set local synchronous_commit = off`;
      const rows = await tx`
        update dataset_uploads set chunk_count = ${firstSeq + chunks.length}, received_bytes = ${total}, updated_at = now()
        where id = ${uploadId} and state = 'receiving' returning id`;
      if (rows.length === 0) throw new StagedUploadAborted(STOPPED);
      const copy = await copyFrom(tx, "copy dataset_files (dataset_id, seq, bytes) from stdin (format binary)");
      await endCopy(tx, copy, [...chunkTuples(idBytes, firstSeq, chunks)]);
      await tx`select pg_notify(${UPLOAD_CHANNEL}, ${uploadId})`; // delivered on commit
    }) as Promise<void>;

  const flush = async (last: boolean) => {
    // whole chunks only, but for the file's end; the pieces as they came (no copy into one buffer)
    const chunks = pending.take(FILE_CHUNK_BYTES, last);
    if (chunks.length === 0) return;
    // one write in flight while the next bytes arrive
    await writing;
    writing = write(chunks, seq, received - pending.size);
    seq += chunks.length;
    writing.catch(() => {});
  };

  try {
    for await (const value of source) {
      const chunk = Buffer.from(value.buffer, value.byteOffset, value.byteLength);
      received += chunk.length;
      if (received > options.maxBytes) throw new StagedUploadTooLarge(options.maxBytes);
      pending.push(chunk);
      // the first chunk goes alone, so the worker starts parsing sooner
      if (pending.size >= (seq === 0 ? FILE_CHUNK_BYTES : STAGING_WRITE_BYTES)) {
        await flush(false);
        options.onProgress?.(received);
      }
    }
    await flush(true);
    await writing;
    await options.beforeReceived?.();
    const rows = await sql`
      update dataset_uploads set state = 'received', chunk_count = ${seq}, received_bytes = ${received}, updated_at = now()
      where id = ${uploadId} and state = 'receiving' returning id`;
    if (rows.length === 0) throw new StagedUploadAborted(STOPPED);
    await sql`select pg_notify(${UPLOAD_CHANNEL}, ${uploadId})`.catch(() => {});
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

// The chunks of an upload no dataset adopted: deleting them never touches a dataset's file.
const unadoptedChunks = (tx: postgres.Sql | postgres.TransactionSql, uploadId: string) => tx`
  delete from dataset_files f where f.dataset_id = ${uploadId}
  and not exists (select 1 from datasets d where d.id = ${uploadId})`;

/** Marks an upload aborted (a reader following it fails) and frees its chunks at once. */
export async function abortStagedUpload(uploadId: string, reason: string): Promise<void> {
  const { sql } = getDatabase();
  await sql.begin(async (tx) => {
    await tx`update dataset_uploads set state = 'aborted', abort_reason = ${reason.slice(0, 500)}, updated_at = now()
             where id = ${uploadId} and state <> 'aborted'`;
    await unadoptedChunks(tx, uploadId);
    await tx`select pg_notify(${UPLOAD_CHANNEL}, ${uploadId})`;
  });
}

/** Removes an upload (after the ingest, whatever its outcome) and its chunks unless its dataset adopted them. */
export async function deleteStagedUpload(uploadId: string): Promise<void> {
  const { sql } = getDatabase();
  await sql.begin(async (tx) => {
    await tx`delete from dataset_uploads where id = ${uploadId}`;
    await unadoptedChunks(tx, uploadId);
  });
}

/**
 * Removes staged uploads nobody will ingest any more (web server or worker died) and chunks that
 * belong to neither an upload nor a dataset (dataset_uploads is unlogged: a database crash empties it
 * and leaves its chunks behind); returns how many uploads went. Safe beside uploads in progress: an
 * upload's row is committed before its first chunk, and stays until its dataset has adopted them.
 */
export async function cleanupStaleUploads(maxAgeMs = STAGING_MAX_AGE_MS): Promise<number> {
  const { sql } = getDatabase();
  return sql.begin(async (tx) => {
    const rows = await tx`
      delete from dataset_uploads where updated_at < now() - make_interval(secs => ${maxAgeMs / 1000}) returning id`;
    await tx`
      delete from dataset_files f
      where not exists (select 1 from datasets d where d.id = f.dataset_id)
        and not exists (select 1 from dataset_uploads u where u.id = f.dataset_id)`;
    return rows.length;
  });
}

/** Binary-COPY tuples (dataset_id, seq, bytes), seq counting from `firstSeq`, with the format's header and trailer; each chunk in pieces. */
function* chunkTuples(uploadId: Buffer, firstSeq: number, chunks: Buffer[][]): Generator<Buffer> {
  const out = new CopyBuffer(64);
  out.header();
  for (const [index, pieces] of chunks.entries()) {
    out.ensure(2 + 20 + 8 + 4);
    out.int16(3);
    out.int32(16);
    out.bytes(uploadId);
    out.int32(4);
    out.int32(firstSeq + index);
    out.int32(pieces.reduce((sum, piece) => sum + piece.length, 0));
    yield* out.take(true);
    yield* pieces;
  }
  out.trailer();
  yield* out.take(true);
}

/** Bytes received and not yet written, cut into chunks of a fixed size without copying them. */
export class PendingBytes {
  private pieces: Buffer[] = [];
  size = 0;

  push(piece: Buffer): void {
    if (piece.length === 0) return;
    this.pieces.push(piece);
    this.size += piece.length;
  }

  /** As many whole chunks of `chunkBytes` as there are; with `all`, the remainder too, as a last shorter chunk. */
  take(chunkBytes: number, all: boolean): Buffer[][] {
    const chunks: Buffer[][] = [];
    while (this.size >= chunkBytes || (all && this.size > 0)) {
      const want = Math.min(chunkBytes, this.size);
      const chunk: Buffer[] = [];
      let got = 0;
      while (got < want) {
        const piece = this.pieces[0];
        const need = want - got;
        if (piece.length <= need) {
          chunk.push(piece);
          this.pieces.shift();
          got += piece.length;
        } else {
          chunk.push(piece.subarray(0, need));
          this.pieces[0] = piece.subarray(need);
          got += need;
        }
      }
      this.size -= want;
      chunks.push(chunk);
    }
    return chunks;
  }
}

async function readChunks(uploadId: string, from: number, limit: number): Promise<{ seq: number; bytes: Buffer }[]> {
  const { sql } = getDatabase();
  // binary COPY: the bytes arrive as they are stored (a plain select would send them as hex text)
  const stream = (await sql
    .unsafe(
      `copy (select seq, bytes from dataset_files where dataset_id = '${uploadId}' and seq >= ${from} order by seq limit ${limit}) to stdout (format binary)`,
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

/**
 * A nudge from the web server to the worker reading an upload (PostgreSQL LISTEN/NOTIFY, payload the
 * upload's id) whenever chunks are committed or the upload's state changes, so the reader goes on at
 * once instead of at its next poll. Only a hint: a reader that misses one finds the chunks by polling.
 */
const UPLOAD_CHANNEL = "tributary_uploads";

type Nudges = { count: number; wake: (() => void) | null };
/** Per process: the uploads being read here and how many nudges each has had. */
const followed = new Map<string, Nudges>();
let listening: Promise<unknown> | null = null;

async function followNudges(uploadId: string): Promise<Nudges> {
  const nudges: Nudges = { count: 0, wake: null };
  followed.set(uploadId, nudges);
  listening ??= getDatabase()
    .sql.listen(UPLOAD_CHANNEL, (id) => {
      const entry = followed.get(id);
      if (!entry) return;
      entry.count++;
      entry.wake?.();
    })
    .catch(() => {
      listening = null; // polling still works; the next reader tries again
    });
  await listening;
  return nudges;
}

/** Waits `ms`, or less when a nudge comes. */
function nap(ms: number, nudges: Nudges): Promise<void> {
  return new Promise((resolve) => {
    const done = () => {
      clearTimeout(timer);
      nudges.wake = null;
      resolve();
    };
    const timer = setTimeout(done, ms);
    nudges.wake = done;
  });
}

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
  const batch = options.batch ?? 8;
  let next = 0;
  let waitingSince: number | null = null;
  let recheck = false;
  let prefetched: Promise<{ seq: number; bytes: Buffer }[]> | null = null;
  const nudges = await followNudges(uploadId);
  // nudges seen when the last read was sent: one after it means there may be more to read already
  let nudgesAtRead = 0;
  try {
    for (;;) {
      if (!prefetched) nudgesAtRead = nudges.count;
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
        nudgesAtRead = nudges.count;
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
        // until a nudge says chunks came (or one came since the read went out: read again at once); as a
        // fallback poll fast at first, then back off to a quarter of a second
        if (nudges.count === nudgesAtRead) await nap(Date.now() - waitingSince < 2000 ? pollMs : Math.max(pollMs, 250), nudges);
      }
    }
  } finally {
    followed.delete(uploadId);
  }
}

import "server-only";
import { z } from "zod";
import type { Actor } from "@/server/authz";
import { AppError } from "@/server/errors";
import { zodDetails } from "@/server/http/route";
import { enqueueJob, type JobRunDto } from "@/server/jobs/runs";
import { defaultReadLimits } from "./csv-reader";
import { MultipartError, multipartBoundary, readMultipart } from "./multipart";
import type { ProblemReport } from "./problems";
import { statusForReport } from "./problems";
import { missingPolicies, roleAssignmentSchema } from "./roles";
import { abortStagedUpload, beginStagedUpload, stageUploadBody, StagedUploadAborted, StagedUploadTooLarge, STOPPED } from "./staging";
import { createDataset, type DatasetDto } from "./store";
import { recordDatasetUploaded } from "./upload-audit";

/**
 * POST /api/datasets, the part that is not HTTP plumbing: read the file from the request (a raw CSV
 * body or multipart/form-data, both streamed, never buffered whole), then either
 * - inline, for files up to inlineMaxBytes() (5 MB): parse, check and store in this request (201 or 422/413);
 * - in the background, for larger files (or `?background=1`, or no Content-Length): stream the bytes
 *   into PostgreSQL staging while a dataset.ingest job in the worker parses, checks and stores them
 *   (202 with the job to poll). The web server never parses a large file.
 */

/** Upload options an API client may send (the `options` form field or query parameter, JSON). */
export const uploadOptionsSchema = z
  .object({
    roles: roleAssignmentSchema.optional(),
    missingPolicy: z.enum(missingPolicies).optional(),
    minRows: z.number().int().min(1).max(100_000_000).optional(),
    dateOrder: z.enum(["YMD", "DMY", "MDY"]).optional(),
  })
  .strict();
export type UploadOptions = z.infer<typeof uploadOptionsSchema>;

/** Files up to this size (default 5 MB; env DATASET_INLINE_MAX_BYTES) are checked and stored in the request itself. */
export const inlineMaxBytes = () => Number(process.env.DATASET_INLINE_MAX_BYTES ?? 5 * 1024 * 1024);
/** The size limit of an upload (default the CSV reader's 200 MB; env DATASET_MAX_BYTES). */
export const uploadMaxBytes = () => Number(process.env.DATASET_MAX_BYTES ?? defaultReadLimits.maxBytes);
/** Room for the multipart framing and small fields around the file. */
const MULTIPART_SLACK = 256 * 1024;

export type UploadOutcome =
  | { kind: "created"; dataset: DatasetDto; report: ProblemReport }
  | { kind: "rejected"; status: 413 | 422; report: ProblemReport }
  | { kind: "queued"; job: JobRunDto; uploadId: string; receivedBytes: number };

const csvTypes = /^(text\/csv|text\/plain|text\/tab-separated-values|application\/csv|application\/vnd\.ms-excel|application\/octet-stream)\b/i;

type FileSource = {
  filename: string;
  name: string | null;
  options: UploadOptions;
  /** The file's bytes; for multipart, the file part's body. */
  body: AsyncIterable<Uint8Array>;
  /** Bytes of the file when known exactly (raw bodies), else the request's Content-Length or null. */
  sizeHint: number | null;
  /** Reads what is left of the request after the file (multipart epilogue, fields after the file). */
  rest(): Promise<void>;
};

const tooLarge = (limit: number) =>
  new AppError("too_large", `The file is larger than the limit of ${Math.round(limit / (1024 * 1024))} MB; split it or aggregate the rows (e.g. weekly instead of daily).`, {
    details: [{ path: "file", kind: "file-too-large", message: `At most ${limit.toLocaleString("en")} bytes.` }],
  });

function parseOptions(raw: string | null, path: string): UploadOptions {
  if (raw === null || raw.trim() === "") return {};
  let value: unknown;
  try {
    value = JSON.parse(raw);
  } catch {
    throw new AppError("invalid:options", "The upload options are not valid JSON.", { details: [{ path, message: "Send a JSON object, e.g. {\"missingPolicy\":\"reject\"}." }] });
  }
  const parsed = uploadOptionsSchema.safeParse(value);
  if (!parsed.success) throw new AppError("invalid:options", "The upload options are not valid.", { details: zodDetails(parsed.error, path) });
  return parsed.data;
}

const cleanFilename = (raw: string | null | undefined) => {
  const base = (raw ?? "").replace(/^.*[\\/]/, "").replace(/[\u0000-\u001f\u007f]/g, "").trim().slice(0, 255);
  return base || "upload.csv";
};

const cleanName = (raw: string | null | undefined) => {
  const name = (raw ?? "").replace(/[\u0000-\u001f\u007f]/g, " ").trim().slice(0, 200);
  return name || null;
};

/** The connection ended before the declared Content-Length arrived: the client went away. */
export class UploadCutShort extends Error {
  constructor(received: number, declared: number) {
    super(`The upload ended after ${received} of ${declared} bytes; nothing was stored.`);
    this.name = "UploadCutShort";
  }
}

/**
 * The request body as one shared reader: loops that stop early leave the rest unread (no cancel), so
 * `drain()` can still read it to the end and the client gets our answer rather than a reset.
 */
class RequestBody implements AsyncIterable<Uint8Array> {
  private readonly reader: ReadableStreamDefaultReader<Uint8Array> | null;
  private received = 0;

  /** `declared`: the Content-Length; a body that ends short of it was cut off (never a shorter file). */
  constructor(
    body: ReadableStream<Uint8Array> | null,
    private readonly declared: number | null,
  ) {
    this.reader = body ? body.getReader() : null;
  }

  [Symbol.asyncIterator](): AsyncIterator<Uint8Array> {
    return {
      next: async () => {
        if (!this.reader) return { done: true, value: undefined };
        const { done, value } = await this.reader.read();
        if (done) {
          if (this.declared !== null && this.received < this.declared) throw new UploadCutShort(this.received, this.declared);
          return { done: true, value: undefined };
        }
        this.received += value.byteLength;
        return { done: false, value };
      },
      return: async () => ({ done: true, value: undefined }),
    };
  }

  /** Reads and drops what is left (a small remainder, or what arrives after the ingest gave up early). */
  async drain(): Promise<void> {
    if (!this.reader) return;
    try {
      for (;;) if ((await this.reader.read()).done) return;
    } catch {
      /* the client went away: nothing to answer */
    }
  }
}

/** Finds the file in the request: a raw body, or the `file` part of multipart/form-data. */
async function openFile(request: Request, url: URL, raw: RequestBody): Promise<{ source: FileSource; multipart: boolean }> {
  const contentType = request.headers.get("content-type");
  const declared = Number(request.headers.get("content-length") ?? NaN);
  const contentLength = Number.isFinite(declared) && declared >= 0 ? declared : null;
  const boundary = multipartBoundary(contentType);

  if (boundary) {
    if (contentLength !== null && contentLength > uploadMaxBytes() + MULTIPART_SLACK) throw tooLarge(uploadMaxBytes());
    let name: string | null = cleanName(url.searchParams.get("name"));
    let options = parseOptions(url.searchParams.get("options"), "query.options");
    const parts = readMultipart(raw, boundary);
    for (;;) {
      const next = await parts.next();
      if (next.done) {
        throw new AppError("invalid:file", "The form has no file: send the CSV as the form field “file”.", { details: [{ path: "file", message: "Missing." }] });
      }
      const part = next.value;
      if (part.name === "file") {
        if (part.filename === null) {
          throw new AppError("invalid:file", "The form field “file” must be a file (with a file name).", { details: [{ path: "file", message: "Not a file." }] });
        }
        const source: FileSource = {
          filename: cleanFilename(part.filename),
          name,
          options,
          body: part.body,
          sizeHint: contentLength,
          rest: async () => {
            // fields after the file come too late to apply: refuse them rather than ignore them silently
            for (;;) {
              const after = await parts.next();
              if (after.done) return;
              if (after.value.name === "name" || after.value.name === "options") {
                throw new AppError("invalid:form", `Send the form field “${after.value.name}” before the file.`, {
                  details: [{ path: after.value.name, message: "Fields after the file are not read." }],
                });
              }
            }
          },
        };
        return { source, multipart: true };
      }
      if (part.name === "name") name = cleanName(await part.text(10_000));
      else if (part.name === "options") options = parseOptions(await part.text(1_000_000), "options");
      // other fields are skipped
    }
  }

  if (contentType && !csvTypes.test(contentType)) {
    throw new AppError("invalid:content_type", "Send the file as multipart/form-data (field “file”) or as the raw body with Content-Type: text/csv.", {
      details: [{ path: "content-type", message: `Content-Type ${contentType.slice(0, 100)} is not accepted.` }],
    });
  }
  if (contentLength !== null && contentLength > uploadMaxBytes()) throw tooLarge(uploadMaxBytes());
  const headerName = request.headers.get("x-filename");
  let filename = url.searchParams.get("filename");
  if (!filename && headerName) {
    try {
      filename = decodeURIComponent(headerName);
    } catch {
      filename = headerName;
    }
  }
  return {
    source: {
      filename: cleanFilename(filename),
      name: cleanName(url.searchParams.get("name")),
      options: parseOptions(url.searchParams.get("options"), "query.options"),
      body: raw,
      sizeHint: contentLength,
      rest: async () => {},
    },
    multipart: false,
  };
}

export async function receiveDatasetUpload(actor: Actor, request: Request): Promise<UploadOutcome> {
  const url = new URL(request.url);
  const background = ["1", "true", "yes"].includes((url.searchParams.get("background") ?? "").toLowerCase());
  const declared = Number(request.headers.get("content-length") ?? NaN);
  const raw = new RequestBody(request.body as ReadableStream<Uint8Array> | null, Number.isFinite(declared) && declared >= 0 ? declared : null);
  let opened: Awaited<ReturnType<typeof openFile>>;
  try {
    opened = await openFile(request, url, raw);
  } catch (error) {
    if (error instanceof MultipartError) throw new AppError("invalid:multipart", error.message, { details: [{ path: "body", message: error.message }] });
    throw error;
  }
  const { source } = opened;
  const options = source.options;

  try {
    if (!background && source.sizeHint !== null && source.sizeHint <= inlineMaxBytes()) {
      const result = await createDataset({
        workspaceId: actor.workspaceId,
        userId: actor.userId,
        name: source.name ?? undefined,
        originalFilename: source.filename,
        stream: source.body,
        options: { ...options, maxBytes: uploadMaxBytes() },
        totalBytes: source.sizeHint,
        beforeCommit: async (tx, datasetId) => {
          await source.rest(); // a refused trailing form field rolls the upload back
          await recordDatasetUploaded(tx, { datasetId, actorUserId: actor.userId, via: "inline" });
        },
      });
      if (!result.ok) {
        // the reader stops early only past the size limit: then the rest is not worth reading
        if (!result.report.countsByKind["file-too-large"]) await raw.drain();
        return { kind: "rejected", status: statusForReport(result.report), report: result.report };
      }
      return { kind: "created", dataset: result.dataset, report: result.report };
    }

    const upload = await beginStagedUpload({
      workspaceId: actor.workspaceId,
      userId: actor.userId,
      originalFilename: source.filename,
      name: source.name,
      options: { ...options, maxBytes: uploadMaxBytes() },
      declaredBytes: opened.multipart ? null : source.sizeHint,
    });
    let job: JobRunDto;
    try {
      job = await enqueueJob({
        workspaceId: actor.workspaceId,
        userId: actor.userId,
        kind: "dataset.ingest",
        input: { uploadId: upload.id, filename: source.filename },
      });
    } catch (error) {
      await abortStagedUpload(upload.id, "The upload could not be queued.").catch(() => {});
      throw error;
    }
    let receivedBytes = 0;
    try {
      // trailing form fields are checked before the upload counts as received (the ingest waits for that)
      receivedBytes = (await stageUploadBody(upload.id, source.body, { maxBytes: uploadMaxBytes(), beforeReceived: source.rest })).receivedBytes;
    } catch (error) {
      if (error instanceof StagedUploadTooLarge) throw tooLarge(error.limit);
      // the ingest already stopped (a bad file found early): its job holds the report
      if (error instanceof StagedUploadAborted && error.reason === STOPPED) await raw.drain();
      else throw error;
    }
    return { kind: "queued", job, uploadId: upload.id, receivedBytes };
  } catch (error) {
    if (error instanceof MultipartError) throw new AppError("invalid:multipart", error.message, { details: [{ path: "body", message: error.message }] });
    if (error instanceof UploadCutShort) throw new AppError("invalid:incomplete", error.message, { details: [{ path: "body", message: error.message }] });
    throw error;
  }
}

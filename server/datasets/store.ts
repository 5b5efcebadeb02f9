import "server-only";
import { randomUUID } from "node:crypto";
import type { Writable } from "node:stream";
import type postgres from "postgres";
import { getDatabase } from "@/db/client";
import { isoDate, readPeriod, type DateOrder } from "./cells";
import { CopyBuffer, encodeFileChunks, encodeRows, uuidBytes } from "./copy-binary";
import { copyFrom, endCopy, openTransaction, writeCopy, type OpenTransaction } from "./pg-copy";
import type { ByteSource, Delimiter, LineEnding, ReadSummary } from "./csv-reader";
import type { ColumnKind, ColumnProfile, ColumnStore } from "./inspect";
import { runPipeline, type PipelineHooks, type UploadProgress } from "./pipeline";
import { ProblemList, type ProblemReport } from "./problems";
import {
  assignRolesSchema,
  checkRoles,
  datasetOptionsSchema,
  type AssignRolesOptions,
  type ColumnRole,
  type DatasetOptionsInput,
  type MissingPolicy,
  type RoleCheck,
} from "./roles";

/**
 * Datasets in PostgreSQL. Every function returns DTOs (plain, JSON-safe objects), never raw rows.
 * Reads take the workspace id and treat a dataset of another workspace as missing (null).
 */

// ---------------------------------------------------------------------------------------------------
// DTOs

export type DatasetStatus = "needs-roles" | "ready";

export type DatasetColumnDto = {
  position: number;
  name: string;
  kind: ColumnKind;
  role: ColumnRole | null;
  unit: string | null;
  numericCount: number;
  textCount: number;
  missingCount: number;
  min: number | null;
  max: number | null;
  mean: number | null;
  std: number | null;
  firstPeriod: string | null;
  lastPeriod: string | null;
  sample: string[];
};

export type DatasetSummaryDto = {
  id: string;
  workspaceId: string;
  name: string;
  originalFilename: string;
  byteSize: number;
  sha256: string;
  rowCount: number;
  columnCount: number;
  delimiter: Delimiter;
  hasBom: boolean;
  lineEnding: LineEnding;
  status: DatasetStatus;
  missingPolicy: MissingPolicy;
  droppedRowCount: number;
  minRows: number | null;
  dateOrder: DateOrder;
  uploadedBy: string | null;
  uploadedAt: string;
  rolesAssignedBy: string | null;
  rolesAssignedAt: string | null;
};

export type DatasetDto = DatasetSummaryDto & { columns: DatasetColumnDto[] };

export type DatasetRowsPageDto = {
  datasetId: string;
  total: number;
  offset: number;
  limit: number;
  columns: Array<Pick<DatasetColumnDto, "position" | "name" | "kind" | "role">>;
  rows: Array<{ rowNumber: number; line: number; cells: Array<number | string | null> }>;
};

export type CorrelationMatrixDto = {
  datasetId: string;
  /** Rows used (complete in every column of the matrix and kept by the missing-value policy). */
  n: number;
  columns: Array<{ position: number; name: string; role: ColumnRole | null }>;
  /** Pearson correlations; null where a column does not vary. */
  matrix: Array<Array<number | null>>;
};

// ---------------------------------------------------------------------------------------------------
// Rows from the database

type DatasetDbRow = {
  id: string;
  workspace_id: string;
  name: string;
  original_filename: string;
  byte_size: string | number;
  sha256: string;
  row_count: number;
  column_count: number;
  delimiter: Delimiter;
  has_bom: boolean;
  line_ending: LineEnding;
  status: DatasetStatus;
  missing_policy: MissingPolicy;
  dropped_row_count: number;
  min_rows: number | null;
  date_order: DateOrder;
  uploaded_by: string | null;
  uploaded_at: Date;
  roles_assigned_by: string | null;
  roles_assigned_at: Date | null;
};

type ColumnDbRow = {
  position: number;
  name: string;
  kind: ColumnKind;
  role: ColumnRole | null;
  unit: string | null;
  numeric_count: number;
  text_count: number;
  missing_count: number;
  min: number | null;
  max: number | null;
  mean: number | null;
  std: number | null;
  first_period: string | null;
  last_period: string | null;
  sample: string[];
};

const toSummary = (r: DatasetDbRow): DatasetSummaryDto => ({
  id: r.id,
  workspaceId: r.workspace_id,
  name: r.name,
  originalFilename: r.original_filename,
  byteSize: Number(r.byte_size),
  sha256: r.sha256,
  rowCount: r.row_count,
  columnCount: r.column_count,
  delimiter: r.delimiter,
  hasBom: r.has_bom,
  lineEnding: r.line_ending,
  status: r.status,
  missingPolicy: r.missing_policy,
  droppedRowCount: r.dropped_row_count,
  minRows: r.min_rows,
  dateOrder: r.date_order,
  uploadedBy: r.uploaded_by,
  uploadedAt: new Date(r.uploaded_at).toISOString(),
  rolesAssignedBy: r.roles_assigned_by,
  rolesAssignedAt: r.roles_assigned_at ? new Date(r.roles_assigned_at).toISOString() : null,
});

const toColumn = (c: ColumnDbRow): DatasetColumnDto => ({
  position: c.position,
  name: c.name,
  kind: c.kind,
  role: c.role,
  unit: c.unit,
  numericCount: c.numeric_count,
  textCount: c.text_count,
  missingCount: c.missing_count,
  min: c.min,
  max: c.max,
  mean: c.mean,
  std: c.std,
  firstPeriod: c.first_period,
  lastPeriod: c.last_period,
  sample: c.sample ?? [],
});

type Sql = postgres.Sql | postgres.TransactionSql;

const DATASET_FIELDS = [
  "id",
  "workspace_id",
  "name",
  "original_filename",
  "byte_size",
  "sha256",
  "row_count",
  "column_count",
  "delimiter",
  "has_bom",
  "line_ending",
  "status",
  "missing_policy",
  "dropped_row_count",
  "min_rows",
  "date_order",
  "uploaded_by",
  "uploaded_at",
  "roles_assigned_by",
  "roles_assigned_at",
];

async function selectDataset(sql: Sql, workspaceId: string | null, datasetId: string, forUpdate = false): Promise<DatasetDbRow | null> {
  if (!isUuid(datasetId) || (workspaceId !== null && !isUuid(workspaceId))) return null;
  const rows = await sql<DatasetDbRow[]>`
    select ${sql(DATASET_FIELDS)} from datasets
    where id = ${datasetId} ${workspaceId !== null ? sql`and workspace_id = ${workspaceId}` : sql``}
    ${forUpdate ? sql`for update` : sql``}`;
  return rows[0] ?? null;
}

async function selectColumns(sql: Sql, datasetId: string): Promise<DatasetColumnDto[]> {
  const rows = await sql<ColumnDbRow[]>`
    select position, name, kind, role, unit, numeric_count, text_count, missing_count, min, max, mean, std,
           first_period, last_period, sample
    from dataset_columns where dataset_id = ${datasetId} order by position`;
  return rows.map(toColumn);
}

const isUuid = (s: string) => /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(s);

// ---------------------------------------------------------------------------------------------------
// Upload

export type CreateDatasetInput = {
  workspaceId: string;
  /** The user uploading (users.id); null for system uploads such as the seed. */
  userId: string | null;
  /** Display name; defaults to the file name without extension. */
  name?: string;
  originalFilename: string;
  /** The file's bytes: a Node Readable (e.g. `Readable.fromWeb(request.body)`), a web stream or any async iterable. */
  stream: ByteSource;
  /** Validated with datasetOptionsSchema (throws a ZodError when malformed). */
  options?: DatasetOptionsInput;
  /** The file size when known (Content-Length of the file part), for progress. */
  totalBytes?: number | null;
  onProgress?: (progress: UploadProgress) => void;
  /**
   * The original file is in dataset_files already, under this id (a staged upload, written while it
   * arrived): the dataset takes the id and adopts those chunks; the bytes read are not kept. The
   * chunks' total size must equal the bytes read, or nothing is stored.
   */
  adoptFileOf?: string;
  /** Runs in the upload's transaction right before COMMIT (e.g. the audit entry); throwing rolls it all back. */
  beforeCommit?: (tx: postgres.TransactionSql, datasetId: string) => Promise<void>;
  /** Runs right after COMMIT, while the stored dataset is read back (e.g. starts removing staged bytes). */
  afterCommit?: () => void;
};

export type CreateDatasetResult =
  | { ok: true; dataset: DatasetDto; report: ProblemReport }
  | { ok: false; report: ProblemReport };

const profileRow = (datasetId: string, c: ColumnProfile, role: ColumnRole | null, unit: string | null) => ({
  dataset_id: datasetId,
  position: c.position,
  name: c.name,
  kind: c.kind,
  role,
  unit,
  numeric_count: c.numericCount,
  text_count: c.textCount,
  missing_count: c.missingCount,
  min: c.min,
  max: c.max,
  mean: c.mean,
  std: c.std,
  first_period: c.firstPeriod,
  last_period: c.lastPeriod,
  sample: c.sample,
});

const baseName = (filename: string) => {
  const base = filename.replace(/^.*[\\/]/, "").replace(/\.(csv|tsv|txt)$/i, "").trim();
  return (base || "Untitled dataset").slice(0, 200);
};

/**
 * Reads, checks and stores an uploaded CSV in one transaction. The rows go to PostgreSQL with binary
 * COPY while the file is still being read (the transaction opens once the header is known to be
 * usable); the original bytes, the dataset and its columns follow, then COMMIT. Any problem, a stream
 * error or a database error rolls everything back: nothing of a failed upload is stored.
 *
 * Resolves `{ ok: false, report }` for a bad file (every problem, with row and column); rejects for
 * failures that are not the file's fault (stream aborted, database down) and for malformed options.
 *
 * From a route handler with a raw CSV body (multipart needs a streaming parser in front):
 *   const result = await createDataset({ workspaceId, userId, originalFilename,
 *     stream: Readable.fromWeb(request.body as import("node:stream/web").ReadableStream<Uint8Array>),
 *     totalBytes: Number(request.headers.get("content-length")) || null, options, onProgress });
 *   if (!result.ok) return Response.json(reportToErrorBody(result.report), { status: statusForReport(result.report) });
 *   return Response.json(result.dataset, { status: 201 });
 * The transaction stays open while the body streams in: for slow clients, stage the bytes first and
 * run this in a worker job (one pooled connection per upload in progress).
 */
export async function createDataset(input: CreateDatasetInput): Promise<CreateDatasetResult> {
  const options = datasetOptionsSchema.parse(input.options ?? {});
  const { sql } = getDatabase();
  const datasetId = input.adoptFileOf ?? randomUUID();
  const idBytes = uuidBytes(datasetId);
  const fileChunks: Buffer[] = [];
  const encoder = new CopyBuffer();
  let transaction: OpenTransaction | null = null;
  let copy: Writable | null = null;
  let columnCount = 0;
  let rowsEnded = false;
  let rowsEnding: Promise<void> | null = null;
  const progress: UploadProgress = {
    phase: "reading",
    bytesRead: 0,
    totalBytes: input.totalBytes ?? null,
    rowsParsed: 0,
    rowsStored: 0,
  };
  const report = () => input.onProgress?.({ ...progress });

  const hooks: PipelineHooks = {
    bytes: (chunk) => {
      if (!input.adoptFileOf) fileChunks.push(chunk);
    },
    progress: (bytesRead, rowsParsed) => {
      progress.bytesRead = bytesRead;
      progress.rowsParsed = rowsParsed;
      report();
    },
    headerAccepted: async (_header, names) => {
      columnCount = names.length;
      transaction = await openTransaction(sql);
      copy = await copyFrom(
        transaction.tx,
        "copy dataset_rows (dataset_id, row_number, line, numbers, texts) from stdin (format binary)",
      );
      encoder.header();
    },
    rowsAdded: async (store, from, to) => {
      if (!copy) return;
      encodeRows(encoder, store, from, to, idBytes);
      for (const chunk of encoder.take()) await writeCopy(copy, chunk);
      progress.rowsStored = to;
    },
    // The rows' COPY ends as soon as the last row is read, without waiting for it: PostgreSQL finishes
    // it while this process profiles the columns and checks the roles (awaited before anything else).
    readingDone: async (file) => {
      const open = transaction as OpenTransaction | null;
      const stream = copy as Writable | null;
      if (!open || !stream) return;
      rowsEnding = endRows(open, stream, file.rowCount);
      rowsEnding.catch(() => {}); // awaited below, or before the rollback
      // let the end of the COPY reach the socket before the CPU-bound work that follows
      await new Promise((resolve) => setImmediate(resolve));
    },
  };

  const endRows = async (open: OpenTransaction, stream: Writable, rowCount: number) => {
    progress.phase = "storing";
    report();
    encoder.trailer();
    await endCopy(open.tx, stream, encoder.take(true));
    rowsEnded = true;
    progress.rowsStored = rowCount;
    report();
  };

  const datasetRow = (file: ReadSummary, columns: number, roles: RoleCheck | null) => {
    const ready = roles !== null;
    return {
      id: datasetId,
      workspace_id: input.workspaceId,
      name: input.name?.trim() ? input.name.trim().slice(0, 200) : baseName(input.originalFilename),
      original_filename: input.originalFilename.slice(0, 500),
      byte_size: file.byteSize,
      sha256: file.sha256,
      row_count: file.rowCount,
      column_count: columns,
      delimiter: file.delimiter,
      has_bom: file.hasBom,
      line_ending: file.lineEnding,
      status: ready ? "ready" : "needs-roles",
      missing_policy: options.missingPolicy,
      dropped_row_count: roles ? roles.droppedRows.length : 0,
      min_rows: options.minRows ?? null,
      date_order: options.dateOrder,
      uploaded_by: input.userId,
      roles_assigned_by: ready ? input.userId : null,
      roles_assigned_at: ready ? new Date().toISOString() : null,
    };
  };

  const abort = async () => {
    const open = transaction as OpenTransaction | null;
    const stream = copy as Writable | null;
    transaction = null;
    copy = null;
    // a COPY already ending is let finish: the connection then rolls back cleanly
    if (rowsEnding) await rowsEnding.catch(() => {});
    if (stream && !stream.writableFinished && !stream.destroyed) stream.destroy(new Error("upload aborted"));
    if (open) await open.rollback();
  };

  let result: Awaited<ReturnType<typeof runPipeline>>;
  try {
    result = await runPipeline(input.stream, options, hooks, {}, input.totalBytes ?? null);
  } catch (error) {
    await abort().catch(() => {});
    throw error;
  }

  const { problems, file, columns, roles } = result;
  const open = transaction as OpenTransaction | null;
  const stream = copy as Writable | null;
  if (problems.any || !open || !stream) {
    await abort();
    if (!problems.any) throw new Error("internal: a valid file without an open transaction");
    return { ok: false, report: problems.report() };
  }

  try {
    if (rowsEnding) await rowsEnding;
    else if (!rowsEnded) await endRows(open, stream, file.rowCount);
    copy = null;

    await open.tx`insert into datasets ${open.tx(datasetRow(file, columns.length, roles))}`;
    if (input.adoptFileOf) {
      // length() of an uncompressed stored value reads its header only, not the bytes
      const [adopted] = await open.tx<{ bytes: string }[]>`
        select coalesce(sum(length(bytes)), 0)::text as bytes from dataset_files where dataset_id = ${datasetId}`;
      if (Number(adopted.bytes) !== file.byteSize) {
        throw new Error(`internal: the staged file holds ${adopted.bytes} bytes, ${file.byteSize} were read`);
      }
    } else {
      const files = await copyFrom(open.tx, "copy dataset_files (dataset_id, seq, bytes) from stdin (format binary)");
      const pieces = [...encodeFileChunks(fileChunks, idBytes)];
      await endCopy(open.tx, files, pieces);
    }

    await open.tx`
      insert into dataset_columns ${open.tx(
        columns.map((c, j) => profileRow(datasetId, c, roles ? roles.columns[j].role : null, roles ? roles.columns[j].unit : null)),
      )}`;
    const earlier = await open.tx<{ id: string; name: string }[]>`
      select id, name from datasets
      where workspace_id = ${input.workspaceId} and sha256 = ${file.sha256} and id <> ${datasetId}
      order by uploaded_at limit 1`;
    if (earlier[0]) {
      problems.note({
        kind: "same-file-uploaded-before",
        message: `The same file (identical bytes) was uploaded before as “${earlier[0].name}”.`,
      });
    }
    if (input.beforeCommit) await input.beforeCommit(open.tx, datasetId);
    await open.commit();
    transaction = null;
  } catch (error) {
    await abort().catch(() => {});
    throw error;
  }
  input.afterCommit?.();
  progress.phase = "done";
  report();
  const dataset = await getDatasetById({ workspaceId: input.workspaceId, datasetId });
  if (!dataset) throw new Error("internal: the stored dataset is missing");
  return { ok: true, dataset, report: problems.report() };
}

// ---------------------------------------------------------------------------------------------------
// Reads

export async function getDatasetById(params: { workspaceId: string; datasetId: string }): Promise<DatasetDto | null> {
  const { sql } = getDatabase();
  const row = await selectDataset(sql, params.workspaceId, params.datasetId);
  if (!row) return null;
  return { ...toSummary(row), columns: await selectColumns(sql, row.id) };
}

export async function listDatasetsByWorkspace(
  workspaceId: string,
  page: { limit?: number; offset?: number } = {},
): Promise<DatasetSummaryDto[]> {
  if (!isUuid(workspaceId)) return [];
  const { sql } = getDatabase();
  const limit = Math.min(Math.max(Math.trunc(page.limit ?? 50), 1), 500);
  const offset = Math.max(Math.trunc(page.offset ?? 0), 0);
  const rows = await sql<DatasetDbRow[]>`
    select ${sql(DATASET_FIELDS)} from datasets where workspace_id = ${workspaceId}
    order by uploaded_at desc, id limit ${limit} offset ${offset}`;
  return rows.map(toSummary);
}

/** One page of rows in file order: `cells[k]` is column k + 1's number or text (null when missing). */
export async function getDatasetRowsPage(params: {
  workspaceId: string;
  datasetId: string;
  offset: number;
  limit: number;
}): Promise<DatasetRowsPageDto | null> {
  const { sql } = getDatabase();
  const dataset = await selectDataset(sql, params.workspaceId, params.datasetId);
  if (!dataset) return null;
  const columns = await selectColumns(sql, dataset.id);
  const offset = Math.max(Math.trunc(params.offset), 0);
  const limit = Math.min(Math.max(Math.trunc(params.limit), 1), 1000);
  const rows = await sql<{ row_number: number; line: number; numbers: (number | null)[]; texts: (string | null)[] | null }[]>`
    select row_number, line, numbers, texts from dataset_rows
    where dataset_id = ${dataset.id} and row_number > ${offset} and row_number <= ${offset + limit}
    order by row_number`;
  return {
    datasetId: dataset.id,
    total: dataset.row_count,
    offset,
    limit,
    columns: columns.map(({ position, name, kind, role }) => ({ position, name, kind, role })),
    rows: rows.map((r) => ({
      rowNumber: r.row_number,
      line: r.line,
      cells: columns.map((_, k) => {
        // postgres.js reads a NULL element of a float8[] as NaN
        const x = r.numbers[k] === null || r.numbers[k] === undefined ? Number.NaN : Number(r.numbers[k]);
        if (!Number.isNaN(x)) return x;
        return r.texts?.[k] ?? null;
      }),
    })),
  };
}

/** The original file, byte for byte, in chunks (for an audit download). */
export async function readDatasetFile(params: {
  workspaceId: string;
  datasetId: string;
}): Promise<{ filename: string; byteSize: number; sha256: string; chunks: AsyncIterable<Buffer> } | null> {
  const { sql } = getDatabase();
  const dataset = await selectDataset(sql, params.workspaceId, params.datasetId);
  if (!dataset) return null;
  async function* chunks(): AsyncGenerator<Buffer> {
    let seq = 0;
    for (;;) {
      // a few chunks per query keeps memory bounded without a cursor held open between yields
      const rows = await sql<{ seq: number; bytes: Buffer }[]>`
        select seq, bytes from dataset_files where dataset_id = ${dataset!.id} and seq >= ${seq}
        order by seq limit 4`;
      if (rows.length === 0) return;
      for (const r of rows) yield r.bytes;
      seq = rows[rows.length - 1].seq + 1;
    }
  }
  return { filename: dataset.original_filename, byteSize: Number(dataset.byte_size), sha256: dataset.sha256, chunks: chunks() };
}

async function fetchNumbers(sql: Sql, datasetId: string, position: number, n: number): Promise<Float64Array> {
  const [row] = await sql<{ b: Buffer | null }[]>`
    select string_agg(float8send(coalesce(numbers[${position}], 'NaN'::float8)), ''::bytea order by row_number) as b
    from dataset_rows where dataset_id = ${datasetId}`;
  const out = new Float64Array(n);
  const b = row?.b;
  if (!b || b.length !== 8 * n) throw new Error(`dataset ${datasetId}: expected ${n} rows of column ${position}`);
  for (let i = 0; i < n; i++) out[i] = b.readDoubleBE(8 * i);
  return out;
}

async function fetchTexts(sql: Sql, datasetId: string, position: number, n: number): Promise<Array<string | undefined>> {
  const [row] = await sql<{ t: (string | null)[] | null }[]>`
    select array_agg(texts[${position}] order by row_number) as t from dataset_rows where dataset_id = ${datasetId}`;
  const t = row?.t ?? [];
  if (t.length !== n) throw new Error(`dataset ${datasetId}: expected ${n} rows of column ${position}`);
  const out = new Array<string | undefined>(n);
  for (let i = 0; i < n; i++) out[i] = t[i] ?? undefined;
  return out;
}

async function fetchLines(sql: Sql, datasetId: string, n: number): Promise<Int32Array> {
  const [row] = await sql<{ b: Buffer | null }[]>`
    select string_agg(int4send(line), ''::bytea order by row_number) as b from dataset_rows where dataset_id = ${datasetId}`;
  const out = new Int32Array(n);
  const b = row?.b;
  if (n > 0 && (!b || b.length !== 4 * n)) throw new Error(`dataset ${datasetId}: expected ${n} lines`);
  for (let i = 0; i < n; i++) out[i] = b!.readInt32BE(4 * i);
  return out;
}

/** The stored rows back as a column store (phase 2 on a stored dataset). */
async function loadStore(sql: Sql, datasetId: string, rowCount: number, columns: DatasetColumnDto[]): Promise<ColumnStore> {
  const [values, texts, lines] = await Promise.all([
    Promise.all(columns.map((c) => (c.numericCount > 0 ? fetchNumbers(sql, datasetId, c.position, rowCount) : new Float64Array(rowCount).fill(NaN)))),
    Promise.all(columns.map((c) => (c.textCount > 0 ? fetchTexts(sql, datasetId, c.position, rowCount) : null))),
    fetchLines(sql, datasetId, rowCount),
  ]);
  return { names: columns.map((c) => c.name), rowCount, values, texts, lines };
}

export type DatasetFrame = {
  datasetId: string;
  /** Rows in the frame: kept by the missing-value policy, complete in every used column. */
  n: number;
  /** Data row number (1-based, file order) of each frame row. */
  rowNumbers: Int32Array;
  /** The period of each frame row (ISO date, or the number of a numeric period), when a period column is set. */
  periods: string[] | null;
  /** Numeric columns by name. */
  columns: Record<string, Float64Array>;
  roles: Record<string, ColumnRole | null>;
};

/**
 * The numbers of a dataset for fitting, in period order (file order without a period column). With
 * roles assigned, rows missing a value in the outcome, a spend, a control or the period are left out
 * (possible only under the drop-incomplete-rows policy); without roles, rows missing any value of a
 * numeric column are. `columns` limits the result to these names (default: every numeric-role
 * column, or every numeric column while roles are not assigned).
 */
export async function loadDatasetFrame(
  datasetId: string,
  options: {
    workspaceId?: string;
    columns?: string[];
    /** After each column is read (they are read in parallel): how many of how many, and the rows of each. */
    onColumnRead?: (read: number, of: number, rows: number) => void;
  } = {},
): Promise<DatasetFrame | null> {
  const { sql } = getDatabase();
  const dataset = await selectDataset(sql, options.workspaceId ?? null, datasetId);
  if (!dataset) return null;
  const all = await selectColumns(sql, dataset.id);
  const ready = dataset.status === "ready";
  const used = ready
    ? all.filter((c) => c.role === "outcome" || c.role === "spend" || c.role === "control")
    : all.filter((c) => c.kind === "numeric");
  const period = ready ? all.find((c) => c.role === "period") : undefined;
  const wanted = options.columns ? all.filter((c) => options.columns!.includes(c.name)) : used;
  const unknown = options.columns?.filter((name) => !all.some((c) => c.name === name)) ?? [];
  if (unknown.length > 0) throw new Error(`unknown columns: ${unknown.join(", ")}`);
  const numeric = [...new Map([...used, ...wanted].map((c) => [c.position, c])).values()];
  const n = dataset.row_count;
  const values = new Map<number, Float64Array>();
  const toRead = numeric.length + (period ? 1 : 0);
  let read = 0;
  const columnRead = () => options.onColumnRead?.(++read, toRead, n);
  await Promise.all(
    numeric.map(async (c) => {
      values.set(c.position, c.numericCount > 0 ? await fetchNumbers(sql, dataset.id, c.position, n) : new Float64Array(n).fill(NaN));
      columnRead();
    }),
  );
  let keys: Float64Array | null = null;
  let periodText: Array<string | undefined> | null = null;
  if (period) {
    keys = new Float64Array(n).fill(NaN);
    if (period.kind === "numeric") {
      keys.set(await fetchNumbers(sql, dataset.id, period.position, n));
      columnRead();
    } else {
      periodText = await fetchTexts(sql, dataset.id, period.position, n);
      columnRead();
      for (let i = 0; i < n; i++) {
        const t = periodText[i];
        if (t !== undefined) keys[i] = readPeriod(t, dataset.date_order);
      }
    }
  }
  const kept: number[] = [];
  for (let i = 0; i < n; i++) {
    let complete = keys === null || keys[i] === keys[i];
    for (const c of used) {
      const x = values.get(c.position)![i];
      if (x !== x) complete = false;
    }
    if (complete) kept.push(i);
  }
  if (keys) {
    const k = keys;
    kept.sort((a, b) => k[a] - k[b] || a - b);
  }
  const columns: Record<string, Float64Array> = {};
  for (const c of wanted) {
    const source = values.get(c.position)!;
    const out = new Float64Array(kept.length);
    for (let r = 0; r < kept.length; r++) out[r] = source[kept[r]];
    columns[c.name] = out;
  }
  const rowNumbers = Int32Array.from(kept, (i) => i + 1);
  const periods = keys
    ? kept.map((i) => (period!.kind === "numeric" ? String(keys![i]) : isoDate(keys![i])))
    : null;
  return {
    datasetId: dataset.id,
    n: kept.length,
    rowNumbers,
    periods,
    columns,
    roles: Object.fromEntries(all.map((c) => [c.name, c.role])),
  };
}

/** The columns for fitting, by name (see loadDatasetFrame for which rows and in which order). */
export async function loadDatasetColumns(
  datasetId: string,
  options: { workspaceId?: string; columns?: string[] } = {},
): Promise<Record<string, Float64Array> | null> {
  return (await loadDatasetFrame(datasetId, options))?.columns ?? null;
}

/**
 * Pearson correlations between the candidate predictors (spend and control columns; every numeric
 * column while roles are not assigned), over the rows a fit would use.
 */
export async function getCorrelationMatrix(params: {
  workspaceId: string;
  datasetId: string;
  columns?: string[];
}): Promise<CorrelationMatrixDto | null> {
  const dataset = await getDatasetById(params);
  if (!dataset) return null;
  const names =
    params.columns ??
    dataset.columns
      .filter((c) => (dataset.status === "ready" ? c.role === "spend" || c.role === "control" : c.kind === "numeric"))
      .map((c) => c.name);
  const frame = await loadDatasetFrame(dataset.id, { workspaceId: params.workspaceId, columns: names });
  if (!frame) return null;
  const series = names.map((name) => frame.columns[name]);
  const n = frame.n;
  const means = series.map((s) => {
    let sum = 0;
    for (let i = 0; i < n; i++) sum += s[i];
    return n > 0 ? sum / n : NaN;
  });
  const matrix = names.map(() => names.map(() => null as number | null));
  for (let a = 0; a < names.length; a++) {
    for (let b = a; b < names.length; b++) {
      const x = series[a];
      const y = series[b];
      const mx = means[a];
      const my = means[b];
      let sxy = 0;
      let sxx = 0;
      let syy = 0;
      for (let i = 0; i < n; i++) {
        const dx = x[i] - mx;
        const dy = y[i] - my;
        sxy += dx * dy;
        sxx += dx * dx;
        syy += dy * dy;
      }
      const r = sxx > 0 && syy > 0 ? Math.max(-1, Math.min(1, sxy / Math.sqrt(sxx * syy))) : null;
      matrix[a][b] = matrix[b][a] = a === b && r !== null ? 1 : r;
    }
  }
  const byName = new Map(dataset.columns.map((c) => [c.name, c]));
  return {
    datasetId: dataset.id,
    n,
    columns: names.map((name) => ({ position: byName.get(name)!.position, name, role: byName.get(name)!.role })),
    matrix,
  };
}

// ---------------------------------------------------------------------------------------------------
// Roles after the upload

export type AssignRolesInput = {
  workspaceId: string;
  datasetId: string;
  userId: string | null;
  /** Runs in the transaction that records the roles, before COMMIT (e.g. the audit entry). */
  beforeCommit?: (tx: postgres.TransactionSql, datasetId: string) => Promise<void>;
} & AssignRolesOptions;

/**
 * Phase 2 on a stored dataset: checks the roles against the stored rows and, when every check passes,
 * records them (status "ready") in one transaction. A failed check changes nothing. Null when the
 * dataset does not exist in this workspace.
 */
export async function assignDatasetRoles(
  input: AssignRolesInput,
): Promise<{ ok: true; dataset: DatasetDto; report: ProblemReport } | { ok: false; report: ProblemReport } | null> {
  const { roles, missingPolicy, minRows: minRowsInput, dateOrder: dateOrderInput } = assignRolesSchema.parse({
    roles: input.roles,
    missingPolicy: input.missingPolicy,
    minRows: input.minRows,
    dateOrder: input.dateOrder,
  });
  const { sql } = getDatabase();
  const outcome = await sql.begin(async (tx) => {
    const dataset = await selectDataset(tx, input.workspaceId, input.datasetId, true);
    if (!dataset) return null;
    const columns = await selectColumns(tx, dataset.id);
    const store = await loadStore(tx, dataset.id, dataset.row_count, columns);
    const dateOrder = dateOrderInput ?? dataset.date_order;
    const policy = missingPolicy ?? dataset.missing_policy;
    const minRows = minRowsInput ?? dataset.min_rows ?? undefined;
    const problems = new ProblemList();
    const check = checkRoles({ store, columns, dateOrder }, roles, { missingPolicy: policy, minRows }, problems);
    if (problems.any) return { ok: false as const, report: problems.report() };
    for (const [j, c] of check.columns.entries()) {
      await tx`update dataset_columns set role = ${c.role}, unit = ${c.unit}
               where dataset_id = ${dataset.id} and position = ${j + 1}`;
    }
    await tx`
      update datasets set status = 'ready', missing_policy = ${policy}, date_order = ${dateOrder},
        min_rows = ${minRowsInput ?? dataset.min_rows}, dropped_row_count = ${check.droppedRows.length},
        roles_assigned_by = ${input.userId}, roles_assigned_at = now()
      where id = ${dataset.id}`;
    if (input.beforeCommit) await input.beforeCommit(tx, dataset.id);
    return { ok: true as const, report: problems.report() };
  });
  if (!outcome) return null;
  if (!outcome.ok) return outcome;
  const dataset = await getDatasetById(input);
  if (!dataset) return null;
  return { ok: true, dataset, report: outcome.report };
}

/** Deletes a dataset with its columns, and its rows and file through the trigger on datasets (db/migrations). */
export async function deleteDataset(params: { workspaceId: string; datasetId: string }): Promise<boolean> {
  if (!isUuid(params.datasetId) || !isUuid(params.workspaceId)) return false;
  const { sql } = getDatabase();
  const rows = await sql`delete from datasets where id = ${params.datasetId} and workspace_id = ${params.workspaceId} returning id`;
  return rows.length > 0;
}

import "server-only";
import { readCsv, type ByteSource, type CsvHeader, type ReadLimits, type ReadSummary } from "./csv-reader";
import { Inspector, type ColumnProfile, type ColumnStore } from "./inspect";
import { ProblemList, type ProblemReport } from "./problems";
import { checkRoles, datasetOptionsSchema, type DatasetOptions, type DatasetOptionsInput, type RoleCheck } from "./roles";

/** Progress of an upload, for a job row or a progress bar. */
export type UploadProgress = {
  phase: "reading" | "storing" | "done";
  bytesRead: number;
  /** Total bytes when the caller knows them (Content-Length), else null. */
  totalBytes: number | null;
  rowsParsed: number;
  rowsStored: number;
};

export type PipelineHooks = {
  /** After a usable header (no header problems), before any row. */
  headerAccepted?(header: CsvHeader, names: string[]): Promise<void>;
  /** After rows [from, to) reached the column store, while the file has no problem so far. */
  rowsAdded?(store: ColumnStore, from: number, to: number): Promise<void>;
  bytes?(chunk: Buffer): void;
  progress?(bytesRead: number, rowsParsed: number): void;
  /**
   * After the last row was read and added, before the column profiles and the role check (CPU work of
   * their own), while the file has no problem so far: database work started here overlaps with them.
   */
  readingDone?(file: ReadSummary): Promise<void>;
};

export type PipelineResult = {
  problems: ProblemList;
  file: ReadSummary & { headerLine: number | null };
  store: ColumnStore;
  columns: ColumnProfile[];
  roles: RoleCheck | null;
  options: DatasetOptions;
};

/** Reads, inspects (phase 1) and, when roles are given, checks them (phase 2). */
export async function runPipeline(
  source: ByteSource,
  options: DatasetOptions,
  hooks: PipelineHooks = {},
  limits: Partial<ReadLimits> = {},
  /** The file size when known (Content-Length, file size): the column store is sized from it. */
  sizeHint: number | null = null,
): Promise<PipelineResult> {
  const problems = new ProblemList(options.maxProblems);
  const inspector = new Inspector(problems, options.dateOrder);
  let headerLine: number | null = null;
  let headerUsable = false;
  let bytesSeen = 0;
  let reserved = false;
  const file = await readCsv(
    source,
    { ...limits, maxBytes: options.maxBytes },
    {
      async header(header) {
        headerLine = header.line;
        headerUsable = inspector.header(header);
        if (headerUsable && hooks.headerAccepted) await hooks.headerAccepted(header, inspector.names);
      },
      async rows(rows, lines, firstRow) {
        if (!reserved && sizeHint !== null && sizeHint > 0 && bytesSeen > 0) {
          // rows so far per byte so far, 5% to spare (growing by doubling still covers a bad guess)
          reserved = true;
          const estimate = Math.ceil(((rows.length + inspector.rowCount) / bytesSeen) * Math.min(sizeHint, options.maxBytes) * 1.05);
          if (estimate > 0 && estimate < 50_000_000) inspector.reserve(estimate);
        }
        const from = inspector.rowCount;
        inspector.rows(rows, lines, firstRow);
        if (hooks.rowsAdded && !problems.any) await hooks.rowsAdded(inspector.store(), from, inspector.rowCount);
      },
      problem: (problem) => problems.add(problem),
      bytes: (chunk) => {
        bytesSeen += chunk.length;
        hooks.bytes?.(chunk);
      },
      progress: hooks.progress,
    },
  );
  if (hooks.readingDone && headerUsable && file.stopped === null && !problems.any) await hooks.readingDone(file);
  const { store, columns } = inspector.finish(file.stopped !== null);
  if (file.blankLines > 0) {
    problems.note({
      kind: "blank-lines-skipped",
      message: `${file.blankLines} blank ${file.blankLines === 1 ? "line was" : "lines were"} skipped.`,
      count: file.blankLines,
    });
  }
  let roles: RoleCheck | null = null;
  // roles are checked on a readable table: a usable header, at least one row, reading not cut short
  if (options.roles && headerUsable && file.stopped === null && store.rowCount > 0) {
    roles = checkRoles({ store, columns, dateOrder: options.dateOrder }, options.roles, options, problems);
  }
  return { problems, file: { ...file, headerLine }, store, columns, roles, options };
}

export type CsvCheck = {
  report: ProblemReport;
  file: PipelineResult["file"];
  columns: ColumnProfile[];
  roles: RoleCheck | null;
  store: ColumnStore;
};

/**
 * Both phases without storing anything: what an upload with these options would report. Throws a
 * ZodError when the options are malformed.
 */
export async function checkCsv(source: ByteSource, options: DatasetOptionsInput = {}, limits: Partial<ReadLimits> = {}): Promise<CsvCheck> {
  const parsed = datasetOptionsSchema.parse(options);
  const result = await runPipeline(source, parsed, {}, limits);
  return { report: result.problems.report(), file: result.file, columns: result.columns, roles: result.roles, store: result.store };
}

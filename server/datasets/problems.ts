import "server-only";
import type { CellProblemKind } from "./cells";

/** Problems found while reading the file, whatever roles the columns get later. */
export const fileProblemKinds = [
  "empty-file",
  "file-too-large",
  "invalid-utf8",
  "no-header",
  "blank-column-name",
  "duplicate-column-name",
  "too-many-columns",
  "no-rows",
  "ragged-row",
  "malformed-quotes",
  "row-too-long",
  "nul-character",
] as const;

/** Problems that depend on the roles given to the columns (outcome, spend, control, period). */
export const roleProblemKinds = [
  "unknown-column",
  "invalid-roles",
  "non-numeric",
  "non-finite",
  "thousands-separator",
  "decimal-comma",
  "negative-spend",
  "missing-value",
  "too-few-rows",
  "constant-column",
  "unparseable-period",
  "duplicate-period",
] as const satisfies readonly (string | CellProblemKind)[];

export type FileProblemKind = (typeof fileProblemKinds)[number];
export type RoleProblemKind = (typeof roleProblemKinds)[number];
export type ProblemKind = FileProblemKind | RoleProblemKind;

/**
 * One problem. `row` is the 1-based data row (the first row under the header is 1; blank lines are
 * not counted), `line` the 1-based line of the file where that row starts (the header is usually
 * line 1), `column` the 1-based column number and `columnName` its header.
 */
export type Problem = {
  kind: ProblemKind;
  message: string;
  row?: number;
  line?: number;
  column?: number;
  columnName?: string;
  /** The offending cell (shortened), when there is one. */
  value?: string;
  /** For invalid UTF-8: the offset of the first bad byte in the file (0-based, BOM included). */
  byteOffset?: number;
  /** For options/roles problems: where in the request, e.g. "roles.Sales". */
  path?: string;
};

/** Facts worth telling the analyst that do not block the upload. */
export type Note = {
  kind: "blank-lines-skipped" | "dropped-incomplete-rows" | "periods-not-ascending" | "same-file-uploaded-before";
  message: string;
  count?: number;
  rows?: number[];
  column?: number;
  columnName?: string;
};

/** The one report of an upload or role assignment: every problem (the first `limit` listed). */
export type ProblemReport = {
  ok: boolean;
  problems: Problem[];
  /** How many problems were found in all; `problems` holds the first `limit`. */
  problemCount: number;
  /** problemCount - problems.length */
  omitted: number;
  countsByKind: Partial<Record<ProblemKind, number>>;
  notes: Note[];
  /** A one-line summary suitable as the `error` of an API response. */
  summary: string;
};

export const DEFAULT_PROBLEM_LIMIT = 200;

/** Collects problems, keeping the first `limit` and counting all. */
export class ProblemList {
  readonly items: Problem[] = [];
  readonly notes: Note[] = [];
  readonly counts: Partial<Record<ProblemKind, number>> = {};
  total = 0;

  constructor(readonly limit = DEFAULT_PROBLEM_LIMIT) {}

  add(problem: Problem): void {
    this.total++;
    this.counts[problem.kind] = (this.counts[problem.kind] ?? 0) + 1;
    if (this.items.length < this.limit) this.items.push(problem);
  }

  note(note: Note): void {
    this.notes.push(note);
  }

  get any(): boolean {
    return this.total > 0;
  }

  has(kind: ProblemKind): boolean {
    return (this.counts[kind] ?? 0) > 0;
  }

  report(): ProblemReport {
    return {
      ok: this.total === 0,
      problems: [...this.items],
      problemCount: this.total,
      omitted: this.total - this.items.length,
      countsByKind: { ...this.counts },
      notes: [...this.notes],
      summary: summarize(this.total, this.counts),
    };
  }
}

const kindLabels: Record<ProblemKind, [string, string]> = {
  "empty-file": ["the file is empty", "the file is empty"],
  "file-too-large": ["the file is too large", "the file is too large"],
  "invalid-utf8": ["invalid UTF-8 byte sequence", "invalid UTF-8 byte sequences"],
  "no-header": ["no header row", "no header row"],
  "blank-column-name": ["blank column name", "blank column names"],
  "duplicate-column-name": ["duplicate column name", "duplicate column names"],
  "too-many-columns": ["too many columns", "too many columns"],
  "no-rows": ["no data rows", "no data rows"],
  "ragged-row": ["row with the wrong number of cells", "rows with the wrong number of cells"],
  "malformed-quotes": ["malformed quotes", "malformed quotes"],
  "row-too-long": ["row too long", "rows too long"],
  "nul-character": ["cell with a NUL character", "cells with a NUL character"],
  "unknown-column": ["unknown column", "unknown columns"],
  "invalid-roles": ["problem with the roles", "problems with the roles"],
  "non-numeric": ["non-numeric cell", "non-numeric cells"],
  "non-finite": ["non-finite number", "non-finite numbers"],
  "thousands-separator": ["number with thousands separators", "numbers with thousands separators"],
  "decimal-comma": ["number with a decimal comma", "numbers with a decimal comma"],
  "negative-spend": ["negative spend", "negative spends"],
  "missing-value": ["missing value", "missing values"],
  "too-few-rows": ["too few rows", "too few rows"],
  "constant-column": ["constant column", "constant columns"],
  "unparseable-period": ["unreadable period", "unreadable periods"],
  "duplicate-period": ["repeated period", "repeated periods"],
};

function summarize(total: number, counts: Partial<Record<ProblemKind, number>>): string {
  if (total === 0) return "The file is valid.";
  const parts = (Object.entries(counts) as [ProblemKind, number][]).map(([kind, n]) => {
    const [one, many] = kindLabels[kind];
    return n === 1 ? one : `${n.toLocaleString("en-US")} ${many}`;
  });
  return `The file was not stored: ${total === 1 ? "1 problem" : `${total.toLocaleString("en-US")} problems`} (${parts.join(", ")}).`;
}

/** The HTTP status for a failed upload: 413 when the file is over the size limit, else 422. */
export const statusForReport = (report: ProblemReport): 413 | 422 =>
  (report.countsByKind["file-too-large"] ?? 0) > 0 ? 413 : 422;

/**
 * The report as the project's JSON error body (`{"error", "details"}`, DEVELOPERS.md): each detail
 * carries `path`, `row`, `column` (the column's name, as server/errors.ts types it) plus `kind`,
 * `line`, `columnNumber`, and for bytes `byteOffset`.
 */
export function reportToErrorBody(report: ProblemReport): {
  error: string;
  details: Array<{ path?: string; message: string; row?: number; column?: string; kind: ProblemKind | "omitted"; [key: string]: unknown }>;
} {
  const details: ReturnType<typeof reportToErrorBody>["details"] = report.problems.map((p) => ({
    kind: p.kind,
    message: p.message,
    ...(p.path !== undefined ? { path: p.path } : { path: "file" }),
    ...(p.row !== undefined ? { row: p.row } : {}),
    ...(p.columnName !== undefined ? { column: p.columnName } : {}),
    ...(p.column !== undefined ? { columnNumber: p.column } : {}),
    ...(p.line !== undefined ? { line: p.line } : {}),
    ...(p.value !== undefined ? { value: p.value } : {}),
    ...(p.byteOffset !== undefined ? { byteOffset: p.byteOffset } : {}),
  }));
  if (report.omitted > 0) {
    details.push({ kind: "omitted", path: "file", message: `…and ${report.omitted.toLocaleString("en-US")} more problems not listed.` });
  }
  return { error: report.summary, details };
}

import "server-only";
import { createHash } from "node:crypto";
import Papa from "papaparse";
import { preview } from "./cells";
import type { Problem } from "./problems";
import { findInvalidUtf8, incompleteTail } from "./utf8";

/**
 * Streaming CSV reading: bytes in (a Node Readable, a web ReadableStream or any async iterable of
 * chunks), rows out in batches, with
 * - the sha256 of the original bytes and the byte count, computed as they pass;
 * - the size limit enforced while reading (reading stops at the first byte over it);
 * - strict UTF-8: each chunk is decoded with a fatal TextDecoder; when it refuses, the bad bytes are
 *   located (file offset, line, row, column) and reading goes on, so one report lists them all;
 * - an optional UTF-8 byte order mark removed (and remembered);
 * - the delimiter (comma, semicolon or tab) and the line ending taken from the header line;
 * - papaparse's Parser doing the CSV work (quotes, doubled quotes, delimiters and line breaks inside
 *   quotes) on each decoded chunk, the unfinished last row carried over to the next chunk;
 * - blank lines (and rows whose cells are all blank) skipped and counted;
 * - each row's 1-based data row number and the file line it starts on.
 */

export type Delimiter = "," | ";" | "\t";
export type LineEnding = "lf" | "crlf" | "cr";

export type ByteSource = AsyncIterable<Uint8Array | string>;

export type ReadLimits = {
  /** Reading stops with "file-too-large" at the first byte over this many. */
  maxBytes: number;
  /** A row longer than this (in characters) stops reading: usually an unclosed quote. */
  maxRowChars: number;
  /** A header with more cells than this stops reading. */
  maxColumns: number;
  /** Bytes gathered before each decode + parse step. */
  chunkBytes: number;
};

export const defaultReadLimits: ReadLimits = {
  maxBytes: 200 * 1024 * 1024,
  maxRowChars: 4 * 1024 * 1024,
  maxColumns: 1000,
  chunkBytes: 64 * 1024,
};

export type CsvHeader = {
  cells: string[];
  line: number;
  delimiter: Delimiter;
  lineEnding: LineEnding;
  hasBom: boolean;
};

export type CsvReadHandlers = {
  /** The header: the first row that is not blank. */
  header(header: CsvHeader): void | Promise<void>;
  /**
   * A batch of data rows: `rows[i]` is data row `firstRow + i` and starts on file line `lines[i]`.
   * Rows are papaparse's arrays of raw cell strings (their length may differ from the header's).
   */
  rows(rows: string[][], lines: Int32Array, firstRow: number): void | Promise<void>;
  problem(problem: Problem): void;
  /** Every byte read, in order, before any decoding (to keep the original). */
  bytes?(chunk: Buffer): void;
  progress?(bytesRead: number, rowsRead: number): void;
};

export type StopReason = "file-too-large" | "row-too-long" | "too-many-columns";

export type ReadSummary = {
  byteSize: number;
  /** Hex sha256 of every byte read; meaningless when `stopped` is "file-too-large". */
  sha256: string;
  hasBom: boolean;
  delimiter: Delimiter;
  lineEnding: LineEnding;
  headerFound: boolean;
  rowCount: number;
  blankLines: number;
  stopped: StopReason | null;
};

type BadBytes = { byteOffset: number; lineBase: number; lf: number; cr: number };

const MAX_DETAILED_UTF8 = 1000;

export function formatBytes(n: number): string {
  if (n >= 1024 * 1024) return `${+(n / (1024 * 1024)).toFixed(1)} MB`;
  if (n >= 1024) return `${+(n / 1024).toFixed(1)} KB`;
  return `${n} bytes`;
}

function countChar(text: string, ch: string): number {
  let n = 0;
  for (let i = text.indexOf(ch); i !== -1; i = text.indexOf(ch, i + 1)) n++;
  return n;
}

function countByte(bytes: Uint8Array, byte: number, end: number): number {
  let n = 0;
  for (let i = 0; i < end; i++) if (bytes[i] === byte) n++;
  return n;
}

function isBlankRow(row: string[]): boolean {
  const first = row[0];
  // the usual row starts with a visible character: no trim needed
  if (first.length > 0 && first.charCodeAt(0) > 32 && first.charCodeAt(0) !== 0xa0 && first.charCodeAt(0) !== 0xfeff) return false;
  if (first.trim() !== "") return false;
  for (let i = 1; i < row.length; i++) if (row[i].trim() !== "") return false;
  return true;
}

/** Counts delimiters outside quotes in the header line; the most frequent wins (ties: , ; tab). */
export function detectDelimiter(line: string): Delimiter {
  let comma = 0;
  let semicolon = 0;
  let tab = 0;
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const c = line.charCodeAt(i);
    if (c === 34) quoted = !quoted;
    else if (!quoted) {
      if (c === 44) comma++;
      else if (c === 59) semicolon++;
      else if (c === 9) tab++;
    }
  }
  if (comma >= semicolon && comma >= tab) return ",";
  return semicolon >= tab ? ";" : "\t";
}

/**
 * Finds the first non-blank line of `text`: its content and line ending. Null when the text does not
 * yet hold a whole non-blank line (unless `final`, when the rest of the text is the line).
 */
function firstContentLine(text: string, final: boolean): { line: string; lineEnding: LineEnding } | null {
  let start = 0;
  for (;;) {
    let end = start;
    while (end < text.length && text.charCodeAt(end) !== 10 && text.charCodeAt(end) !== 13) end++;
    if (end === text.length) {
      if (!final) return null;
      return { line: text.slice(start), lineEnding: "lf" };
    }
    let lineEnding: LineEnding;
    if (text.charCodeAt(end) === 10) lineEnding = "lf";
    else if (end + 1 < text.length) lineEnding = text.charCodeAt(end + 1) === 10 ? "crlf" : "cr";
    else if (final) lineEnding = "cr";
    else return null; // "\r" at the end of the chunk: wait to see whether "\n" follows
    const line = text.slice(start, end);
    if (line.trim() !== "") return { line, lineEnding };
    start = end + (lineEnding === "crlf" ? 2 : 1);
  }
}

function toBuffer(chunk: Uint8Array | string): Buffer {
  if (typeof chunk === "string") return Buffer.from(chunk, "utf8");
  return Buffer.isBuffer(chunk) ? chunk : Buffer.from(chunk.buffer, chunk.byteOffset, chunk.byteLength);
}

export async function readCsv(
  source: ByteSource,
  limitsIn: Partial<ReadLimits>,
  handlers: CsvReadHandlers,
): Promise<ReadSummary> {
  const limits: ReadLimits = { ...defaultReadLimits, ...limitsIn };
  const hash = createHash("sha256");
  const fatal = new TextDecoder("utf-8", { fatal: true, ignoreBOM: true });
  const lenient = new TextDecoder("utf-8", { ignoreBOM: true });

  let bytesRead = 0;
  let pending: Buffer[] = [];
  let pendingLength = 0;
  let carry: Buffer | null = null;
  /** File offset of the next byte to decode. */
  let decodeOffset = 0;
  let bomChecked = false;
  let hasBom = false;
  let stopped: StopReason | null = null;

  let parser: Papa.Parser | null = null;
  let head = "";
  let partial = "";
  let delimiter: Delimiter = ",";
  let lineEnding: LineEnding = "lf";
  let newline: "\n" | "\r\n" | "\r" = "\n";
  /** The file line on which the next row (the start of `partial`) begins. */
  let nextLine = 1;
  let headerFound = false;
  let rowCount = 0;
  let blankLines = 0;
  let badBytes: BadBytes[] = [];
  let utf8Problems = 0;

  const stop = (reason: StopReason, problem: Problem) => {
    if (stopped) return;
    stopped = reason;
    handlers.problem(problem);
  };

  const badByteProblem = (b: BadBytes, row: number | undefined, cells: string[] | undefined): Problem => {
    const line = b.lineBase + (lineEnding === "cr" ? b.cr : b.lf);
    let column: number | undefined;
    if (cells) {
      const index = cells.findIndex((c) => c.includes("\uFFFD"));
      if (index >= 0) column = index + 1;
    }
    const where = row !== undefined ? `row ${row}` : `line ${line}`;
    return {
      kind: "invalid-utf8",
      message: `Bytes that are not valid UTF-8 at byte ${b.byteOffset} (${where}${column ? `, column ${column}` : ""}): save the file as UTF-8 (CSV UTF-8 in Excel).`,
      byteOffset: b.byteOffset,
      line,
      ...(row !== undefined ? { row } : {}),
      ...(column !== undefined ? { column } : {}),
    };
  };

  /** Decodes a run of whole characters; on invalid bytes, records where they are and decodes leniently. */
  const decode = (bytes: Buffer): string => {
    try {
      return fatal.decode(bytes);
    } catch {
      const offsets = findInvalidUtf8(bytes);
      if (offsets.length === 0) offsets.push(0); // the decoder and the validator disagree: report the chunk
      const textBefore = parser ? partial : head;
      const lineBase = nextLine;
      const lfBase = countChar(textBefore, "\n");
      const crBase = countChar(textBefore, "\r");
      let lf = 0;
      let cr = 0;
      let counted = 0;
      for (const offset of offsets) {
        utf8Problems++;
        lf += countByte(bytes.subarray(counted), 10, offset - counted);
        cr += countByte(bytes.subarray(counted), 13, offset - counted);
        counted = offset;
        const bad = { byteOffset: decodeOffset + offset, lineBase, lf: lfBase + lf, cr: crBase + cr };
        if (utf8Problems <= MAX_DETAILED_UTF8) badBytes.push(bad);
        else handlers.problem(badByteProblem(bad, undefined, undefined));
      }
      return lenient.decode(bytes);
    }
  };

  const emit = async (rows: string[][], errors: Papa.ParseError[], quoted: boolean, final: boolean): Promise<void> => {
    const out: string[][] = [];
    const lines = new Int32Array(rows.length);
    const startLines = errors.length > 0 ? new Int32Array(rows.length) : null;
    const rowNumbers = errors.length > 0 ? new Int32Array(rows.length) : null;
    const breakChar = lineEnding === "cr" ? "\r" : "\n";
    const firstRow = rowCount + 1;
    let k = 0;
    for (let r = 0; r < rows.length; r++) {
      const row = rows[r];
      const start = nextLine;
      let extra = 0;
      if (quoted) {
        for (let c = 0; c < row.length; c++) {
          const cell = row[c];
          if (cell.indexOf(breakChar) !== -1) extra += countChar(cell, breakChar);
        }
      }
      nextLine = start + 1 + extra;
      const blank = isBlankRow(row);
      const dataRow = headerFound && !blank ? firstRow + k : undefined;
      if (startLines && rowNumbers) {
        startLines[r] = start;
        rowNumbers[r] = dataRow ?? 0;
      }
      if (badBytes.length > 0) {
        const end = nextLine - 1;
        const rest: BadBytes[] = [];
        for (const b of badBytes) {
          const line = b.lineBase + (lineEnding === "cr" ? b.cr : b.lf);
          if (line >= start && line <= end) handlers.problem(badByteProblem(b, dataRow, row));
          else rest.push(b);
        }
        badBytes = rest;
      }
      if (blank) {
        // the empty "row" after the file's last line ending is no line at all
        const afterLastLineEnding = final && r === rows.length - 1 && row.length === 1 && row[0] === "";
        if (!afterLastLineEnding) blankLines += 1 + extra;
        continue;
      }
      if (!headerFound) {
        headerFound = true;
        await handlers.header({ cells: row, line: start, delimiter, lineEnding, hasBom });
        if (row.length > limits.maxColumns) {
          stop("too-many-columns", {
            kind: "too-many-columns",
            message: `The header has ${row.length} columns; at most ${limits.maxColumns} are allowed.`,
            line: start,
          });
          return;
        }
        continue;
      }
      out.push(row);
      lines[k++] = start;
    }
    for (const e of errors) {
      if (e.row === undefined || !startLines || !rowNumbers || e.row >= rows.length) continue;
      const row = rowNumbers[e.row] || undefined;
      const line = startLines[e.row];
      const message =
        e.code === "MissingQuotes"
          ? `A quoted cell opened on line ${line} is never closed: add the closing quote (").`
          : `A quote inside a quoted cell is not doubled (line ${line}): inside quotes, write "" for a quote.`;
      handlers.problem({ kind: "malformed-quotes", message, line, ...(row ? { row } : {}) });
    }
    if (k > 0) {
      await handlers.rows(out, lines.subarray(0, k), firstRow);
      rowCount += k;
    }
  };

  const feed = async (text: string, final: boolean): Promise<void> => {
    if (!parser) {
      head += text;
      const first = firstContentLine(head, final);
      if (!first) {
        if (head.length > limits.maxRowChars) {
          stop("row-too-long", {
            kind: "row-too-long",
            message: `The first line is longer than ${formatBytes(limits.maxRowChars)}: this is not a CSV file with one row per line.`,
            line: 1,
          });
        }
        return; // wait for the rest of the first line
      }
      delimiter = detectDelimiter(first ? first.line : head);
      lineEnding = first ? first.lineEnding : "lf";
      newline = lineEnding === "crlf" ? "\r\n" : lineEnding === "cr" ? "\r" : "\n";
      parser = new Papa.Parser({ delimiter, newline, quoteChar: '"' });
      text = head;
      head = "";
    }
    const input = partial.length > 0 ? partial + text : text;
    if (input.length === 0) return;
    const result = parser.parse(input, 0, !final);
    const rows = result.data as string[][];
    const cursor: number = result.meta.cursor;
    partial = final ? "" : input.slice(cursor);
    await emit(rows, result.errors as Papa.ParseError[], input.indexOf('"') !== -1, final);
    if (!final && partial.length > limits.maxRowChars) {
      stop("row-too-long", {
        kind: "row-too-long",
        message: `The row starting on line ${nextLine} is longer than ${formatBytes(limits.maxRowChars)}; a quote that is never closed usually causes this.`,
        line: nextLine,
      });
    }
  };

  const processBytes = async (final: boolean): Promise<void> => {
    let bytes: Buffer = pending.length === 1 ? pending[0] : Buffer.concat(pending, pendingLength);
    if (carry) bytes = Buffer.concat([carry, bytes]);
    carry = null;
    pending = [];
    pendingLength = 0;
    if (!bomChecked) {
      if (bytes.length < 3 && !final) {
        carry = bytes;
        return;
      }
      bomChecked = true;
      if (bytes.length >= 3 && bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf) {
        hasBom = true;
        bytes = bytes.subarray(3);
        decodeOffset = 3;
      }
    }
    const tail = final ? 0 : incompleteTail(bytes);
    if (tail > 0) {
      carry = Buffer.from(bytes.subarray(bytes.length - tail));
      bytes = bytes.subarray(0, bytes.length - tail);
    }
    const text = bytes.length > 0 ? decode(bytes) : "";
    decodeOffset += bytes.length;
    await feed(text, final);
  };

  for await (const chunk of source) {
    const buffer = toBuffer(chunk);
    if (buffer.length === 0) continue;
    if (bytesRead + buffer.length > limits.maxBytes) {
      bytesRead += buffer.length;
      stop("file-too-large", {
        kind: "file-too-large",
        message: `The file is larger than the limit of ${formatBytes(limits.maxBytes)}; split it or aggregate the rows (e.g. weekly instead of daily).`,
      });
      break; // leaving the loop ends (destroys) the source stream
    }
    bytesRead += buffer.length;
    hash.update(buffer);
    handlers.bytes?.(buffer);
    pending.push(buffer);
    pendingLength += buffer.length;
    if (pendingLength >= limits.chunkBytes) {
      await processBytes(false);
      handlers.progress?.(bytesRead, rowCount);
      if (stopped) break;
    }
  }
  if (!stopped) {
    await processBytes(true);
    if (!stopped) {
      // bad bytes on lines that held no row (cannot happen with lenient decoding, but never lose one)
      for (const b of badBytes) handlers.problem(badByteProblem(b, undefined, undefined));
      badBytes = [];
    }
    handlers.progress?.(bytesRead, rowCount);
  }
  if (!headerFound && !stopped) {
    handlers.problem({
      kind: "empty-file",
      message: bytesRead === 0 ? "The file is empty." : "The file holds no rows (only blank lines or white space).",
    });
  }
  return {
    byteSize: bytesRead,
    sha256: hash.digest("hex"),
    hasBom,
    delimiter,
    lineEnding,
    headerFound,
    rowCount,
    blankLines,
    stopped,
  };
}

/** For messages that quote a cell. */
export const quoteCell = (cell: string) => JSON.stringify(preview(cell));

import "server-only";

/**
 * CSV for every export (datasets, fit reports, plans), safe to open in a spreadsheet.
 *
 * Cells that begin with `=`, `+`, `-`, `@` (and tab or carriage return, which OWASP lists too) are
 * read as formulas by Excel, LibreOffice and Google Sheets. The rule used for every export:
 * - a number (a JS number, or text that reads as a finite decimal number such as "-12.5" or "+3")
 *   is written as the number: negative values stay numbers;
 * - any other text starting with one of those characters (also after leading white space) gets a
 *   leading single quote (`'=SUM(A1)`), which spreadsheets show as text and never evaluate;
 * - then the cell is quoted when it holds the delimiter, a quote, a line break, or leading/trailing
 *   white space, with inner quotes doubled (RFC 4180).
 * Missing values (null, undefined, NaN, ±Infinity) are written as empty cells.
 */

export type CsvCell = string | number | boolean | Date | null | undefined;

const FORMULA_START = /^[=+\-@\t\r]|^\s+[=+\-@]/;
const FINITE_NUMBER = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

export type CsvOptions = {
  delimiter?: "," | ";" | "\t";
  /** Line ending between rows (default CRLF, as RFC 4180 and Excel expect). */
  newline?: "\r\n" | "\n";
  /** Start with a UTF-8 byte order mark so Excel detects UTF-8 (default false). */
  bom?: boolean;
};

/** One cell, escaped for a CSV with the given delimiter. */
export function escapeCsvCell(value: CsvCell, delimiter: "," | ";" | "\t" = ","): string {
  if (value === null || value === undefined) return "";
  if (typeof value === "number") return Number.isFinite(value) ? String(value) : "";
  if (typeof value === "boolean") return value ? "true" : "false";
  let text = value instanceof Date ? (Number.isNaN(value.getTime()) ? "" : value.toISOString()) : String(value);
  if (FORMULA_START.test(text) && !(FINITE_NUMBER.test(text) && Number.isFinite(Number(text)))) text = `'${text}`;
  const needsQuotes =
    text.includes(delimiter) || text.includes('"') || text.includes("\n") || text.includes("\r") || text !== text.trim();
  return needsQuotes ? `"${text.replace(/"/g, '""')}"` : text;
}

/** Rows to one CSV text (each row is an array of cells; the header is just the first row). */
export function toCsv(rows: Iterable<readonly CsvCell[]>, options: CsvOptions = {}): string {
  return [...csvLines(rows, options)].join("");
}

/** The same, line by line (each with its line ending), for streaming a large export. */
export function* csvLines(rows: Iterable<readonly CsvCell[]>, options: CsvOptions = {}): Generator<string> {
  const delimiter = options.delimiter ?? ",";
  const newline = options.newline ?? "\r\n";
  let first = true;
  for (const row of rows) {
    const line = row.map((cell) => escapeCsvCell(cell, delimiter)).join(delimiter) + newline;
    yield first && options.bom ? `\uFEFF${line}` : line;
    first = false;
  }
}

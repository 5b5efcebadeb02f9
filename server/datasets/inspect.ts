import "server-only";
import {
  canonicalIsoDay as canonicalIsoDayImported,
  cellKind,
  fastNumber as fastNumberImported,
  isoDate,
  preview,
  readPeriod,
  type DateOrder,
} from "./cells";

// local bindings: module-namespace getters of transpiled imports cost in the hot loop
const fastNumber = fastNumberImported;
const canonicalIsoDay = canonicalIsoDayImported;
import type { CsvHeader } from "./csv-reader";
import type { ProblemList } from "./problems";

/**
 * Phase 1 of an upload, "inspect": the header and every row go into a column store, and each column
 * gets a profile. Everything checked here is independent of the roles the columns get later.
 *
 * A column is `numeric` when every non-missing cell is a number, `period` when every non-missing
 * cell is a readable date/period, `text` otherwise (also when all cells are missing). A text column
 * is not an error: it only becomes one when the analyst gives it a numeric role (phase 2, roles.ts).
 */

export type ColumnKind = "numeric" | "period" | "text";

/**
 * The parsed table: row i (0-based; data row i + 1) of column j is `values[j][i]`, NaN when the cell
 * is missing or not a number. A cell that is neither a number nor missing is text: a cell that is
 * exactly a YYYY-MM-DD date is kept as its day number in `dates[j][i]` (no string per row for the
 * usual date column), any other text as the trimmed cell in `texts[j][i]`; read text with
 * {@link cellText}. `lines[i]` is the file line where row i starts.
 */
export type ColumnStore = {
  names: string[];
  rowCount: number;
  values: Float64Array[];
  texts: (Array<string | undefined> | null)[];
  /** Day numbers of the YYYY-MM-DD cells (NaN elsewhere); null for a column without such cells. */
  dates?: (Float64Array | null)[];
  lines: Int32Array;
  /**
   * For columns profiled as periods: each row's day number (NaN when missing), read with
   * `periodDateOrder`; phase 2 reuses them instead of reading every date again.
   */
  periodDays?: (Float64Array | null)[];
  periodDateOrder?: DateOrder;
};

export type ColumnProfile = {
  /** 1-based column number. */
  position: number;
  name: string;
  kind: ColumnKind;
  numericCount: number;
  textCount: number;
  missingCount: number;
  /** Over the numeric cells (also in a text column that has some), null when there are none. */
  min: number | null;
  max: number | null;
  mean: number | null;
  /** Sample standard deviation (n - 1), null with fewer than two numbers. */
  std: number | null;
  /** For period columns: the first and last period as ISO dates. */
  firstPeriod: string | null;
  lastPeriod: string | null;
  /** Up to five distinct values in file order, as text. */
  sample: string[];
  /** A numeric column whose numbers are all equal. */
  constant: boolean;
};

/** The text of a cell (undefined for numbers and missing cells). */
export function cellText(store: ColumnStore, j: number, i: number): string | undefined {
  const t = store.texts[j]?.[i];
  if (t !== undefined) return t;
  const day = store.dates?.[j]?.[i];
  return day !== undefined && day === day ? isoDate(day) : undefined;
}

const INITIAL_CAPACITY = 1024;
const POW10 = [1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15];

/** White space that String.prototype.trim removes, beyond the ASCII controls and space. */
const isWhiteSpace = (c: number) => c === 0x1680 || (c >= 0x2000 && c <= 0x200a) || c === 0x2028 || c === 0x2029 || c === 0x202f || c === 0x205f || c === 0x3000;

function looksLikeData(cell: string, dateOrder: DateOrder): boolean {
  const t = cell.trim();
  if (t === "") return false;
  return typeof cellKind(t) === "number" || Number.isFinite(readPeriod(t, dateOrder));
}

export class Inspector {
  names: string[] = [];
  columnCount = 0;
  headerOk = false;
  rowCount = 0;
  private capacity = 0;
  private values: Float64Array[] = [];
  private texts: (Array<string | undefined> | null)[] = [];
  private dates: (Float64Array | null)[] = [];
  private lines = new Int32Array(0);
  private raggedRows = 0;

  constructor(
    private readonly problems: ProblemList,
    private readonly dateOrder: DateOrder = "YMD",
  ) {}

  /** Checks the header; true when it is usable (no blank, duplicate or data-like names). */
  header(header: CsvHeader): boolean {
    const names = header.cells.map((c) => c.trim());
    const before = this.problems.total;
    const seen = new Map<string, number>();
    names.forEach((name, j) => {
      if (name === "") {
        this.problems.add({
          kind: "blank-column-name",
          message:
            j === names.length - 1 && names.length > 1
              ? `Column ${j + 1} has no name (a delimiter at the end of the header line?).`
              : `Column ${j + 1} has no name.`,
          line: header.line,
          column: j + 1,
        });
        return;
      }
      if (name.includes("\u0000")) {
        this.problems.add({ kind: "nul-character", message: `Column ${j + 1}'s name holds a NUL character.`, line: header.line, column: j + 1 });
      }
      const key = name.normalize("NFC").toLowerCase();
      const first = seen.get(key);
      if (first !== undefined) {
        this.problems.add({
          kind: "duplicate-column-name",
          message: `Column ${j + 1} “${preview(name)}” has the same name as column ${first + 1} “${preview(names[first])}” (names are compared ignoring case).`,
          line: header.line,
          column: j + 1,
          columnName: name,
        });
      } else seen.set(key, j);
    });
    const nonBlank = names.filter((n) => n !== "");
    if (nonBlank.length > 0 && nonBlank.every((n) => looksLikeData(n, this.dateOrder))) {
      this.problems.add({
        kind: "no-header",
        message: `The first line (${preview(names.join(", "), 60)}) holds data, not column names: add a header row naming each column.`,
        line: header.line,
      });
    }
    this.names = names;
    this.columnCount = names.length;
    this.values = names.map(() => new Float64Array(0));
    this.texts = names.map(() => null);
    this.dates = names.map(() => null);
    this.headerOk = this.problems.total === before;
    return this.headerOk;
  }

  /** Allocates room for `rows` rows at once (from an estimate), sparing the copies of growing. */
  reserve(rows: number): void {
    this.grow(rows, true);
  }

  private grow(needed: number, exact = false): void {
    if (needed <= this.capacity) return;
    let capacity = Math.max(INITIAL_CAPACITY, this.capacity);
    if (exact) capacity = needed;
    else while (capacity < needed) capacity *= 2;
    for (let j = 0; j < this.columnCount; j++) {
      const next = new Float64Array(capacity);
      next.set(this.values[j].subarray(0, this.rowCount));
      this.values[j] = next;
      const dates = this.dates[j];
      if (dates) {
        const nextDates = new Float64Array(capacity).fill(NaN);
        nextDates.set(dates.subarray(0, this.rowCount));
        this.dates[j] = nextDates;
      }
    }
    const lines = new Int32Array(capacity);
    lines.set(this.lines.subarray(0, this.rowCount));
    this.lines = lines;
    this.capacity = capacity;
  }

  /** The hot loop: one batch of rows into the column store. */
  rows(rows: string[][], lines: Int32Array, firstRow: number): void {
    const n = this.columnCount;
    const base = this.rowCount;
    this.grow(base + rows.length);
    const values = this.values;
    const storeLines = this.lines;
    for (let r = 0; r < rows.length; r++) {
      const row = rows[r];
      const i = base + r;
      storeLines[i] = lines[r];
      const m = row.length < n ? row.length : n;
      if (row.length !== n) this.ragged(row.length, firstRow + r, lines[r]);
      for (let j = 0; j < m; j++) {
        const cell = row[j];
        // fastNumber, inlined: plain decimals of at most 15 digits (see cells.ts)
        const len = cell.length;
        let k = 0;
        let c = cell.charCodeAt(0);
        let negative = false;
        if (c === 45) {
          negative = true;
          k = 1;
        } else if (c === 43) k = 1;
        let mantissa = 0;
        let digits = 0;
        let scale = 0;
        let dot = false;
        for (; k < len; k++) {
          c = cell.charCodeAt(k);
          if (c >= 48 && c <= 57) {
            mantissa = mantissa * 10 + (c - 48);
            digits++;
            if (dot) scale++;
          } else if (c === 46 && !dot) dot = true;
          else break;
        }
        if (k === len && digits > 0 && digits <= 15) {
          const x = scale === 0 ? mantissa : mantissa / POW10[scale];
          values[j][i] = negative ? -x : x;
          continue;
        }
        // stopped at a character no number has there (not an exponent, not white space): text
        if (k < len && k > 0 && c > 32 && c !== 101 && c !== 69 && c !== 0xa0 && c < 0x1680) {
          const day = k === 4 && c === 45 ? canonicalIsoDay(cell) : NaN;
          if (day === day) {
            values[j][i] = NaN;
            (this.dates[j] ?? this.allocateDates(j))[i] = day;
          } else this.slowCell(j, i, cell, firstRow + r, lines[r]);
          continue;
        }
        const x = fastNumber(cell);
        if (x === x) values[j][i] = x;
        else this.slowCell(j, i, cell, firstRow + r, lines[r]);
      }
      for (let j = m; j < n; j++) values[j][i] = NaN;
    }
    this.rowCount = base + rows.length;
  }

  private ragged(cells: number, row: number, line: number): void {
    this.raggedRows++;
    const n = this.columnCount;
    this.problems.add({
      kind: "ragged-row",
      message: `Row ${row} (line ${line}) has ${cells} ${cells === 1 ? "cell" : "cells"}; the header has ${n}.`,
      row,
      line,
      column: cells < n ? cells + 1 : n + 1,
    });
  }

  private slowCell(j: number, i: number, cell: string, row: number, line: number): void {
    // fastNumber already tried Number() on any cell that starts like a number; a cell without white
    // space around it that is longer than every missing token is therefore text (dates, names…)
    const first = cell.charCodeAt(0);
    const last = cell.charCodeAt(cell.length - 1);
    if (cell.length > 4 && first > 32 && last > 32 && first !== 0xa0 && last !== 0xa0 && first !== 0xfeff && last !== 0xfeff && !isWhiteSpace(first) && !isWhiteSpace(last)) {
      this.values[j][i] = NaN;
      this.addText(j, i, cell, row, line);
      return;
    }
    const kind = cellKind(cell);
    if (typeof kind === "number") {
      this.values[j][i] = kind;
      return;
    }
    this.values[j][i] = NaN;
    if (kind === "missing") return;
    this.addText(j, i, cell.trim(), row, line);
  }

  private addText(j: number, i: number, text: string, row: number, line: number): void {
    if (text.includes("\u0000")) {
      this.problems.add({
        kind: "nul-character",
        message: `Row ${row}, column ${j + 1} holds a NUL character (a binary file?).`,
        row,
        line,
        column: j + 1,
        columnName: this.names[j],
      });
    }
    let texts = this.texts[j];
    if (!texts) texts = this.texts[j] = [];
    texts[i] = text;
  }

  private allocateDates(j: number): Float64Array {
    const dates = new Float64Array(this.capacity).fill(NaN);
    this.dates[j] = dates;
    return dates;
  }

  store(): ColumnStore {
    return {
      names: this.names,
      rowCount: this.rowCount,
      values: this.values.map((v) => v.subarray(0, this.rowCount)),
      texts: this.texts,
      dates: this.dates.map((d) => (d ? d.subarray(0, this.rowCount) : null)),
      lines: this.lines.subarray(0, this.rowCount),
    };
  }

  /** Ends phase 1: the no-rows check (unless reading stopped early) and the profile of each column. */
  finish(readingStopped = false): { store: ColumnStore; columns: ColumnProfile[] } {
    if (this.headerOk && this.rowCount === 0 && !readingStopped) {
      this.problems.add({ kind: "no-rows", message: "The file has a header but no data rows." });
    }
    const store = this.store();
    return { store, columns: profileColumns(store, this.dateOrder) };
  }
}

/**
 * Profiles every column of a store (also used on a store loaded back from the database), and keeps
 * the day numbers of period columns in `store.periodDays`.
 */
export function profileColumns(store: ColumnStore, dateOrder: DateOrder): ColumnProfile[] {
  store.periodDays = store.names.map(() => null);
  store.periodDateOrder = dateOrder;
  return store.names.map((name, j) => profileColumn(store, j, dateOrder));
}

function profileColumn(store: ColumnStore, j: number, dateOrder: DateOrder): ColumnProfile {
  const values = store.values[j];
  const texts = store.texts[j];
  const n = store.rowCount;
  let numericCount = 0;
  let min = Infinity;
  let max = -Infinity;
  let sum = 0;
  for (let i = 0; i < n; i++) {
    const x = values[i];
    if (x === x) {
      numericCount++;
      sum += x;
      if (x < min) min = x;
      if (x > max) max = x;
    }
  }
  const mean = numericCount > 0 ? sum / numericCount : null;
  let std: number | null = null;
  if (mean !== null && numericCount > 1) {
    let ss = 0;
    for (let i = 0; i < n; i++) {
      const x = values[i];
      if (x === x) ss += (x - mean) * (x - mean);
    }
    std = Math.sqrt(ss / (numericCount - 1));
  }
  const dates = store.dates?.[j] ?? null;
  let textCount = 0;
  let dateCount = 0;
  if (texts) for (let i = 0; i < texts.length; i++) if (texts[i] !== undefined) textCount++;
  let lo = Infinity;
  let hi = -Infinity;
  if (dates) {
    for (let i = 0; i < n; i++) {
      const day = dates[i];
      if (day === day) {
        dateCount++;
        if (day < lo) lo = day;
        if (day > hi) hi = day;
      }
    }
  }
  let kind: ColumnKind = textCount + dateCount === 0 && numericCount > 0 ? "numeric" : "text";
  let firstPeriod: string | null = null;
  let lastPeriod: string | null = null;
  if (textCount + dateCount > 0 && numericCount === 0) {
    let all = true;
    let days: Float64Array | null = dates;
    if (texts && textCount > 0) {
      // the other texts must be periods too (2024-W05, 2024-01, 31/01/2024 with DMY…)
      days = dates ? dates.slice() : new Float64Array(n).fill(NaN);
      for (let i = 0; i < n; i++) {
        const t = texts[i];
        if (t === undefined) continue;
        const day = readPeriod(t, dateOrder);
        if (day !== day) {
          all = false;
          break;
        }
        days[i] = day;
        if (day < lo) lo = day;
        if (day > hi) hi = day;
      }
    }
    if (all && days) {
      kind = "period";
      firstPeriod = isoDate(lo);
      lastPeriod = isoDate(hi);
      store.periodDays![j] = days;
    }
  }
  textCount += dateCount;
  const sample: string[] = [];
  const seen = new Set<string>();
  for (let i = 0; i < n && sample.length < 5 && i < 10_000; i++) {
    const x = values[i];
    const s = x === x ? String(x) : cellText(store, j, i);
    if (s !== undefined && !seen.has(s)) {
      seen.add(s);
      sample.push(preview(s, 60));
    }
  }
  return {
    position: j + 1,
    name: store.names[j],
    kind,
    numericCount,
    textCount,
    missingCount: n - numericCount - textCount,
    min: numericCount > 0 ? min : null,
    max: numericCount > 0 ? max : null,
    mean,
    std,
    firstPeriod,
    lastPeriod,
    sample,
    constant: kind === "numeric" && numericCount > 0 && min === max,
  };
}

import "server-only";
import { writeIsoDate } from "./cells";
import type { ColumnStore } from "./inspect";

/**
 * PostgreSQL's binary COPY format (https://www.postgresql.org/docs/current/sql-copy.html#id-1.9.3.55.9.4),
 * written straight from the column store: the doubles go over as 8 bytes each, so the server parses no
 * text at all (measured: 1,000,000 rows of 12 values in ~3 s binary vs ~5 s as text arrays).
 */

const SIGNATURE = Buffer.from([0x50, 0x47, 0x43, 0x4f, 0x50, 0x59, 0x0a, 0xff, 0x0d, 0x0a, 0x00]);
const FLOAT8_OID = 701;
const TEXT_OID = 25;
const DEFAULT_SIZE = 1024 * 1024;

export function uuidBytes(uuid: string): Buffer {
  const hex = uuid.replace(/-/g, "");
  if (!/^[0-9a-f]{32}$/i.test(hex)) throw new Error(`not a uuid: ${uuid}`);
  return Buffer.from(hex, "hex");
}

/** A growing list of COPY data chunks of about 1 MiB. */
export class CopyBuffer {
  private buffer: Buffer;
  private view: DataView;
  private pos = 0;
  private readonly full: Buffer[] = [];

  constructor(private readonly size = DEFAULT_SIZE) {
    this.buffer = Buffer.allocUnsafe(size);
    this.view = new DataView(this.buffer.buffer, this.buffer.byteOffset, this.buffer.byteLength);
  }

  /** Makes room for `n` more bytes, moving the filled part to the list of full chunks. */
  ensure(n: number): void {
    if (this.pos + n <= this.buffer.length) return;
    if (this.pos > 0) this.full.push(this.buffer.subarray(0, this.pos));
    this.buffer = Buffer.allocUnsafe(Math.max(this.size, n));
    this.view = new DataView(this.buffer.buffer, this.buffer.byteOffset, this.buffer.byteLength);
    this.pos = 0;
  }

  /** Chunks ready to send (the current, partly filled chunk stays unless `all`). */
  take(all = false): Buffer[] {
    if (all && this.pos > 0) {
      this.full.push(this.buffer.subarray(0, this.pos));
      this.buffer = Buffer.allocUnsafe(this.size);
      this.view = new DataView(this.buffer.buffer, this.buffer.byteOffset, this.buffer.byteLength);
      this.pos = 0;
    }
    return this.full.splice(0, this.full.length);
  }

  header(): void {
    this.ensure(19);
    SIGNATURE.copy(this.buffer, this.pos);
    this.pos += 11;
    this.int32(0); // flags
    this.int32(0); // header extension length
  }

  trailer(): void {
    this.ensure(2);
    this.int16(-1);
  }

  int16(v: number): void {
    this.view.setInt16(this.pos, v);
    this.pos += 2;
  }

  int32(v: number): void {
    this.view.setInt32(this.pos, v);
    this.pos += 4;
  }

  float64(v: number): void {
    this.view.setFloat64(this.pos, v);
    this.pos += 8;
  }

  bytes(b: Uint8Array): void {
    this.buffer.set(b, this.pos);
    this.pos += b.length;
  }

  /** Writes UTF-8 text (room must have been ensured: 3 bytes per UTF-16 unit) and returns its length. */
  utf8(s: string): number {
    const n = this.buffer.write(s, this.pos, "utf8");
    this.pos += n;
    return n;
  }

  /** Writes a day number as its 10-byte ISO date. */
  isoDate(day: number): void {
    writeIsoDate(this.buffer, this.pos, day);
    this.pos += 10;
  }

  get position(): number {
    return this.pos;
  }

  patchInt32(at: number, v: number): void {
    this.view.setInt32(at, v);
  }
}

/**
 * Appends rows [from, to) of the store as tuples of
 * `dataset_rows (dataset_id, row_number, line, numbers, texts)`.
 */
export function encodeRows(out: CopyBuffer, store: ColumnStore, from: number, to: number, datasetId: Buffer): void {
  const n = store.names.length;
  const values = store.values;
  const texts = store.texts;
  const dates = store.dates ?? [];
  const textColumns: number[] = [];
  for (let j = 0; j < n; j++) if (texts[j] || dates[j]) textColumns.push(j);
  for (let i = from; i < to; i++) {
    // texts of this row: the last column holding text, and the room the texts need
    let lastText = -1;
    let textRoom = 0;
    for (let t = 0; t < textColumns.length; t++) {
      const j = textColumns[t];
      const s = texts[j]?.[i];
      if (s !== undefined) {
        lastText = j;
        textRoom += 4 + 3 * s.length;
      } else {
        const day = dates[j]?.[i];
        if (day !== undefined && day === day) {
          lastText = j;
          textRoom += 4 + 10;
        }
      }
    }
    out.ensure(2 + 20 + 8 + 8 + 4 + 20 + n * 12 + (lastText < 0 ? 4 : 4 + 20 + (lastText + 1) * 4 + textRoom));

    out.int16(5);
    out.int32(16);
    out.bytes(datasetId);
    out.int32(4);
    out.int32(i + 1);
    out.int32(4);
    out.int32(store.lines[i]);

    // the array's length and null flag are patched after its elements
    const numbersAt = out.position;
    out.int32(0);
    out.int32(1); // dimensions
    out.int32(0);
    out.int32(FLOAT8_OID);
    out.int32(n);
    out.int32(1); // lower bound
    let nulls = 0;
    for (let j = 0; j < n; j++) {
      const x = values[j][i];
      if (x !== x) {
        out.int32(-1);
        nulls++;
      } else {
        out.int32(8);
        out.float64(x);
      }
    }
    out.patchInt32(numbersAt, out.position - numbersAt - 4);
    if (nulls > 0) out.patchInt32(numbersAt + 8, 1);

    if (lastText < 0) {
      out.int32(-1);
      continue;
    }
    const textsAt = out.position;
    out.int32(0); // length, patched below
    out.int32(1);
    out.int32(0); // null flag, patched below
    out.int32(TEXT_OID);
    out.int32(lastText + 1);
    out.int32(1);
    let textNulls = 0;
    for (let j = 0; j <= lastText; j++) {
      const s = texts[j]?.[i];
      if (s !== undefined) {
        const at = out.position;
        out.int32(0);
        out.patchInt32(at, out.utf8(s));
        continue;
      }
      const day = dates[j]?.[i];
      if (day !== undefined && day === day) {
        out.int32(10);
        out.isoDate(day);
      } else {
        out.int32(-1);
        textNulls++;
      }
    }
    out.patchInt32(textsAt, out.position - textsAt - 4);
    if (textNulls > 0) out.patchInt32(textsAt + 8, 1);
  }
}

/** Tuples of `dataset_files (dataset_id, seq, bytes)`: the original bytes in pieces of `pieceSize`. */
export function* encodeFileChunks(chunks: Buffer[], datasetId: Buffer, pieceSize = DEFAULT_SIZE): Generator<Buffer> {
  const out = new CopyBuffer(64);
  out.header();
  let seq = 0;
  let piece: Buffer[] = [];
  let pieceLength = 0;
  const emit = function* (): Generator<Buffer> {
    out.ensure(2 + 20 + 8 + 4);
    out.int16(3);
    out.int32(16);
    out.bytes(datasetId);
    out.int32(4);
    out.int32(seq++);
    out.int32(pieceLength);
    yield* out.take(true);
    yield* piece;
    piece = [];
    pieceLength = 0;
  };
  for (const chunk of chunks) {
    let offset = 0;
    while (offset < chunk.length) {
      const take = Math.min(pieceSize - pieceLength, chunk.length - offset);
      piece.push(chunk.subarray(offset, offset + take));
      pieceLength += take;
      offset += take;
      if (pieceLength === pieceSize) yield* emit();
    }
  }
  if (pieceLength > 0) yield* emit();
  out.trailer();
  yield* out.take(true);
}

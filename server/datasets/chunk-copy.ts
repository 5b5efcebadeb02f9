import "server-only";

/**
 * The (seq, bytes) tuples of a binary COPY TO STDOUT of `select seq, bytes …`, parsed as the parts
 * arrive. PostgreSQL sends one CopyData message per tuple and postgres.js passes each on whole, so a
 * 4 MiB chunk is normally one part and its bytes are a view of it, never copied again; a tuple split
 * across parts is still joined.
 */
export class ChunkCopyParser {
  readonly rows: { seq: number; bytes: Buffer }[] = [];
  private rest: Buffer | null = null;
  private headerRead = false;
  private ended = false;

  push(part: Buffer): void {
    const data = this.rest ? Buffer.concat([this.rest, part]) : part;
    this.rest = null;
    let at = 0;
    if (!this.headerRead) {
      if (data.length < 19) {
        this.rest = data;
        return;
      }
      at = 11 + 4; // signature, flags
      at += 4 + data.readInt32BE(at); // header extension
      this.headerRead = true;
    }
    while (!this.ended) {
      if (data.length - at < 2) break;
      const fields = data.readInt16BE(at);
      if (fields === -1) {
        this.ended = true;
        return;
      }
      if (fields !== 2) throw new Error(`staging: unexpected COPY tuple with ${fields} fields`);
      if (data.length - at < 2 + 8 + 4) break;
      const seqLength = data.readInt32BE(at + 2);
      const seq = data.readInt32BE(at + 6);
      const lengthAt = at + 2 + 4 + seqLength;
      const length = data.readInt32BE(lengthAt);
      if (data.length - (lengthAt + 4) < length) break;
      this.rows.push({ seq, bytes: data.subarray(lengthAt + 4, lengthAt + 4 + length) });
      at = lengthAt + 4 + length;
    }
    if (at < data.length) this.rest = data.subarray(at);
  }

  finish(): { seq: number; bytes: Buffer }[] {
    if (!this.ended || this.rest) throw new Error("staging: the chunks' COPY ended early");
    return this.rows;
  }
}

// The staged chunks come back as a binary COPY; its tuples are read as the parts arrive, however the
// parts are cut.
import { describe, expect, it } from "vitest";
import { ChunkCopyParser } from "@/server/datasets/chunk-copy";

function copyOf(chunks: Buffer[]): Buffer {
  const header = Buffer.concat([Buffer.from("PGCOPY\n\xff\r\n\0", "latin1"), Buffer.alloc(8)]);
  const tuples = chunks.map((bytes, seq) => {
    const head = Buffer.alloc(2 + 4 + 4 + 4);
    head.writeInt16BE(2, 0);
    head.writeInt32BE(4, 2);
    head.writeInt32BE(seq, 6);
    head.writeInt32BE(bytes.length, 10);
    return Buffer.concat([head, bytes]);
  });
  return Buffer.concat([header, ...tuples, Buffer.from([0xff, 0xff])]);
}

const chunks = [Buffer.from("date,sales\n2024-01-01,1\n"), Buffer.alloc(0), Buffer.from("2024-01-02,2\n".repeat(40))];

describe("ChunkCopyParser", () => {
  it("reads every tuple when each arrives whole, without copying the bytes", () => {
    const data = copyOf(chunks);
    const parser = new ChunkCopyParser();
    parser.push(data);
    const rows = parser.finish();
    expect(rows.map((r) => r.seq)).toEqual([0, 1, 2]);
    expect(rows.map((r) => r.bytes.toString())).toEqual(chunks.map((c) => c.toString()));
    expect(rows[2].bytes.buffer).toBe(data.buffer); // a view of the part
  });

  it("reads the same tuples whatever the parts' boundaries", () => {
    const data = copyOf(chunks);
    for (let cut = 1; cut < data.length; cut++) {
      for (const size of [1, 3, cut]) {
        const parser = new ChunkCopyParser();
        parser.push(data.subarray(0, cut));
        for (let at = cut; at < data.length; at += size) parser.push(data.subarray(at, Math.min(at + size, data.length)));
        expect(parser.finish().map((r) => [r.seq, r.bytes.toString()])).toEqual(chunks.map((c, i) => [i, c.toString()]));
      }
    }
  });

  it("refuses a COPY that ended before its trailer", () => {
    const data = copyOf(chunks);
    const parser = new ChunkCopyParser();
    parser.push(data.subarray(0, data.length - 5));
    expect(() => parser.finish()).toThrow(/ended early/);
  });
});

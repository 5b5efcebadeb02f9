// The web server cuts a staged upload into the chunks of dataset_files while it arrives: whole chunks
// of the fixed size (only the file's last one shorter), bytes in order, nothing copied or lost.
import fc from "fast-check";
import { expect, test } from "vitest";
import { PendingBytes } from "@/server/datasets/staging";

const joined = (chunks: Buffer[][]) => chunks.map((pieces) => Buffer.concat(pieces));

test("whole chunks only until the end, then the rest as a last shorter chunk", () => {
  const pending = new PendingBytes();
  pending.push(Buffer.from("abcde"));
  pending.push(Buffer.from("fg"));
  expect(joined(pending.take(3, false)).map(String)).toEqual(["abc", "def"]);
  expect(pending.size).toBe(1);
  pending.push(Buffer.from("hijk"));
  expect(joined(pending.take(3, false)).map(String)).toEqual(["ghi"]);
  expect(joined(pending.take(3, true)).map(String)).toEqual(["jk"]);
  expect(pending.size).toBe(0);
  expect(pending.take(3, true)).toEqual([]);
});

test("pieces are views of what arrived, not copies", () => {
  const arrived = Buffer.from("0123456789");
  const pending = new PendingBytes();
  pending.push(arrived);
  const [first] = pending.take(4, false);
  expect(first[0].buffer).toBe(arrived.buffer);
});

test("any arrival pattern: the chunks put back together are the bytes, every chunk but the last full", () => {
  fc.assert(
    fc.property(fc.array(fc.uint8Array({ maxLength: 50 }), { maxLength: 40 }), fc.integer({ min: 1, max: 17 }), fc.integer({ min: 1, max: 4 }), (pieces, size, every) => {
      const pending = new PendingBytes();
      const chunks: Buffer[] = [];
      pieces.forEach((piece, index) => {
        pending.push(Buffer.from(piece));
        if (index % every === 0) chunks.push(...joined(pending.take(size, false)));
      });
      chunks.push(...joined(pending.take(size, true)));
      expect(Buffer.concat(chunks).equals(Buffer.concat(pieces.map((p) => Buffer.from(p))))).toBe(true);
      expect(chunks.slice(0, -1).every((chunk) => chunk.length === size)).toBe(true);
      expect(chunks.every((chunk) => chunk.length > 0 && chunk.length <= size)).toBe(true);
    }),
  );
});

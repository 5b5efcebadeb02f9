// The UTF-8 helpers agree with TextDecoder (WHATWG), which decides what is valid.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { findInvalidUtf8, incompleteTail } from "@/server/datasets/utf8";

const fatal = new TextDecoder("utf-8", { fatal: true });
const valid = (bytes: Uint8Array) => {
  try {
    fatal.decode(bytes);
    return true;
  } catch {
    return false;
  }
};

describe("UTF-8", () => {
  it("finds invalid bytes exactly when TextDecoder refuses them", () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 64 }), (bytes) => {
        expect(findInvalidUtf8(bytes).length === 0).toBe(valid(bytes));
      }),
      { numRuns: 20000 },
    );
  });

  it("locates the first bad byte (what TextDecoder decodes before it is valid)", () => {
    fc.assert(
      fc.property(fc.string({ unit: "grapheme" }), fc.uint8Array({ minLength: 1, maxLength: 3 }), fc.string(), (before, junk, after) => {
        const bytes = Buffer.concat([Buffer.from(before), Buffer.from(junk), Buffer.from(after)]);
        const bad = findInvalidUtf8(bytes);
        if (bad.length === 0) return;
        expect(valid(bytes.subarray(0, bad[0]))).toBe(true);
        expect(bad[0]).toBeGreaterThanOrEqual(Buffer.from(before).length);
      }),
      { numRuns: 3000 },
    );
  });

  it.each([
    ["Latin-1 é", [0x43, 0x61, 0x66, 0xe9], [3]],
    ["overlong /", [0xc0, 0xaf], [0, 1]],
    ["surrogate", [0xed, 0xa0, 0x80], [0, 1, 2]],
    ["above U+10FFFF", [0xf4, 0x90, 0x80, 0x80], [0, 1, 2, 3]],
    ["truncated at the end", [0x61, 0xe2, 0x82], [1]],
  ])("%s", (_name, bytes, offsets) => {
    expect(findInvalidUtf8(Uint8Array.from(bytes))).toEqual(offsets);
    expect(valid(Uint8Array.from(bytes))).toBe(false);
  });

  it("holds back exactly the bytes of a character cut by a chunk boundary", () => {
    fc.assert(
      fc.property(fc.string({ unit: "grapheme", minLength: 1 }), fc.nat(), (text, at) => {
        const bytes = Buffer.from(text);
        const cut = at % (bytes.length + 1);
        const head = bytes.subarray(0, cut);
        const tail = incompleteTail(head);
        expect(valid(head.subarray(0, head.length - tail))).toBe(true);
        expect(valid(Buffer.concat([head.subarray(head.length - tail), bytes.subarray(cut)]))).toBe(true);
      }),
      { numRuns: 3000 },
    );
  });
});

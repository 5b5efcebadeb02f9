// Fuzzing the reader: random bytes and CSV-like text never make it throw; it always ends with a report
// (ok, or problems of known kinds with sane positions), in any chunking.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { checkCsv } from "@/server/datasets/pipeline";
import { fileProblemKinds, roleProblemKinds } from "@/server/datasets/problems";
import { splitAt } from "./helpers";

const kinds = new Set<string>([...fileProblemKinds, ...roleProblemKinds]);

const csvish = fc
  .array(
    fc.array(
      fc.oneof(
        fc.constantFrom("", "1", "-2.5", "1e999", "NaN", "NA", "2024-01-01", "x", '"', '""', '"a,b"', '"a\nb"', " ", "\uFEFF", "é", "\u0000", "1,5"),
        fc.string({ maxLength: 6 }),
      ),
      { maxLength: 6 },
    ),
    { maxLength: 12 },
  )
  .chain((rows) =>
    fc.tuple(fc.constant(rows), fc.constantFrom(",", ";", "\t"), fc.constantFrom("\n", "\r\n", "\r"), fc.boolean()),
  )
  .map(([rows, delimiter, newline, bom]) => (bom ? "\uFEFF" : "") + rows.map((r) => r.join(delimiter)).join(newline));

const header = fc.constantFrom("", "a,b,c\n", "week;sales;tv\n", "a\tb\n");
const options = fc.constantFrom(
  {},
  { roles: { a: { role: "outcome" as const }, b: { role: "spend" as const } } },
  { roles: { sales: { role: "outcome" as const }, tv: { role: "spend" as const }, week: { role: "period" as const } }, missingPolicy: "drop-incomplete-rows" as const },
  { maxBytes: 40 },
);

async function checkInvariants(bytes: Uint8Array, cuts: number[], opts: object) {
  const { report, file, store } = await checkCsv(splitAt(bytes, cuts), opts, { chunkBytes: 16, maxRowChars: 256, maxColumns: 50 });
  expect(typeof report.ok).toBe("boolean");
  expect(report.ok).toBe(report.problemCount === 0);
  expect(report.problems.length).toBe(Math.min(report.problemCount, 200));
  for (const p of report.problems) {
    expect(kinds.has(p.kind)).toBe(true);
    expect(p.message).toBeTruthy();
    if (p.row !== undefined) expect(p.row).toBeGreaterThanOrEqual(1);
    if (p.row !== undefined && !file.stopped) expect(p.row).toBeLessThanOrEqual(store.rowCount);
    if (p.line !== undefined) expect(p.line).toBeGreaterThanOrEqual(1);
    if (p.byteOffset !== undefined) expect(p.byteOffset).toBeLessThan(bytes.length);
  }
  expect(file.byteSize).toBeLessThanOrEqual(bytes.length);
}

describe("fuzz", () => {
  it("random bytes", async () => {
    await fc.assert(
      fc.asyncProperty(fc.uint8Array({ maxLength: 300 }), fc.array(fc.nat({ max: 300 }), { maxLength: 5 }), options, (bytes, cuts, opts) =>
        checkInvariants(bytes, cuts, opts),
      ),
      { numRuns: 1500 },
    );
  });

  it("CSV-like text", async () => {
    await fc.assert(
      fc.asyncProperty(header, csvish, fc.array(fc.nat({ max: 400 }), { maxLength: 5 }), options, (h, body, cuts, opts) =>
        checkInvariants(Buffer.from(h + body), cuts, opts),
      ),
      { numRuns: 1500 },
    );
  });

  it("CSV-like text with stray bytes", async () => {
    await fc.assert(
      fc.asyncProperty(csvish, fc.uint8Array({ minLength: 1, maxLength: 4 }), fc.nat(), (body, junk, at) => {
        const b = Buffer.from(body);
        const i = b.length ? at % b.length : 0;
        return checkInvariants(Buffer.concat([b.subarray(0, i), junk, b.subarray(i)]), [i], {});
      }),
      { numRuns: 800 },
    );
  });
});

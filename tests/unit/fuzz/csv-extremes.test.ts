// The CSV reader fuzzed where tests/unit/datasets/fuzz.test.ts does not go (that file covers random bytes,
// CSV-like text and stray bytes with small cells): random numeric tables must read back exactly (every
// finite double, in any dialect and chunking); extreme cells (±1e309, 400-digit numbers, denormals,
// 2^53 + 1, 5,000-character text) in columns given numeric roles are reported as problems of known kinds,
// never thrown; an unterminated quote running past the row limit, more columns than the column limit, a quote opened and never
// closed, and files over the size limit stop with their problem. A report always lists only known kinds
// with sane positions.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { checkCsv } from "@/server/datasets/pipeline";
import { fileProblemKinds, roleProblemKinds } from "@/server/datasets/problems";
import { splitAt } from "../datasets/helpers";

const kinds = new Set<string>([...fileProblemKinds, ...roleProblemKinds]);
const SEED = 20261201;

function expectSaneReport(report: Awaited<ReturnType<typeof checkCsv>>["report"], bytes: number) {
  expect(report.ok).toBe(report.problemCount === 0);
  for (const problem of report.problems) {
    expect(kinds.has(problem.kind), problem.kind).toBe(true);
    expect(problem.message).toBeTruthy();
    if (problem.row !== undefined) expect(problem.row).toBeGreaterThanOrEqual(1);
    if (problem.byteOffset !== undefined) expect(problem.byteOffset).toBeLessThan(Math.max(bytes, 1));
  }
}

describe("CSV reader, extremes", () => {
  it("random tables of finite doubles read back exactly, in any dialect and chunking", async () => {
    const table = fc.integer({ min: 1, max: 6 }).chain((columns) =>
      fc.array(fc.array(fc.double({ noNaN: true, noDefaultInfinity: true }), { minLength: columns, maxLength: columns }), { minLength: 1, maxLength: 20 }),
    );
    await fc.assert(
      fc.asyncProperty(table, fc.constantFrom(",", ";", "\t"), fc.constantFrom("\n", "\r\n"), fc.array(fc.nat({ max: 2000 }), { maxLength: 6 }), async (rows, delimiter, newline, cuts) => {
        const header = rows[0].map((_, j) => `c${j}`).join(delimiter);
        const text = [header, ...rows.map((row) => row.map(String).join(delimiter))].join(newline) + newline;
        const { report, store } = await checkCsv(splitAt(Buffer.from(text), cuts), {}, { chunkBytes: 64 });
        expect(report.problems).toEqual([]);
        expect(store.rowCount).toBe(rows.length);
        rows.forEach((row, i) => row.forEach((value, j) => expect(store.values[j][i]).toBe(Number(String(value)))));
      }),
      { seed: SEED, numRuns: 300 },
    );
  });

  it("extreme cells in numeric columns are problems with their row and column, never exceptions", async () => {
    const extreme = fc.constantFrom(
      "1e309", "-1e309", "1e400", "1" + "0".repeat(400), "0." + "0".repeat(400) + "1", "4.9e-324", "1e-400", "9007199254740993",
      "-0", "+1", ".5", "5.", "1e", "e5", "--1", "0x10", "1_000", "١٢٣", "Infinity", "-Infinity", "NaN", "x".repeat(5000), "",
    );
    const rows = fc.array(fc.tuple(extreme, extreme, fc.double({ noNaN: true, noDefaultInfinity: true, min: 0 })), { minLength: 1, maxLength: 15 });
    await fc.assert(
      fc.asyncProperty(rows, fc.constantFrom("reject" as const, "drop-incomplete-rows" as const), async (table, missingPolicy) => {
        const text = "week,sales,tv,radio\n" + table.map(([a, b, c], i) => `2024-01-${String((i % 28) + 1).padStart(2, "0")},${a},${b},${c}`).join("\n");
        const bytes = Buffer.from(text);
        const { report } = await checkCsv(splitAt(bytes, [7, 100]), {
          roles: { week: { role: "period" }, sales: { role: "outcome" }, tv: { role: "spend" }, radio: { role: "spend" } },
          missingPolicy,
        });
        expectSaneReport(report, bytes.length);
        // Non-finite numbers are never accepted as data.
        if (table.some(([a, b]) => [a, b].some((cell) => /^-?(1e309|1e400|Infinity)$/.test(cell) || cell === "1" + "0".repeat(400)))) {
          expect(report.ok).toBe(false);
        }
      }),
      { seed: SEED, numRuns: 300 },
    );
  });

  it("rows over the row limit, too many columns, unterminated quotes and files over the size limit stop with their problem", async () => {
    const cases = fc.oneof(
      // a quote never closed, followed by more than the row limit: the reader stops buffering (row-too-long)
      // or reports the quote at the end of the file (malformed-quotes); either way it never holds it all
      fc.integer({ min: 300, max: 5000 }).map((n) => ({ text: `a,b\n1,"${"9,\n".repeat(n)}`, kind: "row-too-long|malformed-quotes" })),
      fc.integer({ min: 51, max: 120 }).map((n) => ({ text: `${Array.from({ length: n }, (_, i) => `c${i}`).join(",")}\n${"1,".repeat(n - 1)}1\n`, kind: "too-many-columns|row-too-long" })), // a header past the row limit stops first
      fc.string({ maxLength: 100 }).map((tail) => ({ text: `a,b\n1,"never closed ${tail.replaceAll('"', "")}\n2,3\n`, kind: "malformed-quotes" })),
      fc.integer({ min: 1, max: 50 }).map((extra) => ({ text: `a,b\n${"1,2\n".repeat(10 + extra)}`, kind: "file-too-large" })),
    );
    await fc.assert(
      fc.asyncProperty(cases, fc.array(fc.nat({ max: 500 }), { maxLength: 4 }), async ({ text, kind }, cuts) => {
        const bytes = Buffer.from(text);
        const { report } = await checkCsv(splitAt(bytes, cuts), kind === "file-too-large" ? { maxBytes: 40 } : {}, { maxRowChars: 256, maxColumns: 50, chunkBytes: 32 });
        expectSaneReport(report, bytes.length);
        expect(report.problems.some((p) => kind.split("|").includes(p.kind)), JSON.stringify(report.problems.map((p) => p.kind))).toBe(true);
      }),
      { seed: SEED, numRuns: 200 },
    );
  });
});

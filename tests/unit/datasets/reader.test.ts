// The streaming reader: results do not depend on where chunks end; the size limit stops reading; Node and
// web streams are both accepted.
import { Readable } from "node:stream";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { detectDelimiter } from "@/server/datasets/csv-reader";
import { cellText } from "@/server/datasets/inspect";
import { checkCsv } from "@/server/datasets/pipeline";
import { OPTIONS, csv, malformedCases, validVariants } from "@/tests/fixtures/csv/cases";
import { allShapes, bytesOf, chunked, splitAt } from "./helpers";

const all = [
  ...validVariants.map((v) => ({ name: v.name, content: v.content, options: { ...OPTIONS, ...v.options } })),
  // (the size-limit case is left out: how many rows it reads before stopping depends on the chunks)
  ...malformedCases.filter((c) => !c.limits && !c.options?.maxBytes).map((c) => ({ name: c.name, content: c.content, options: c.options ?? {} })),
];

const snapshot = async (source: AsyncIterable<Uint8Array>, options: object, chunkBytes?: number) => {
  const r = await checkCsv(source, options, chunkBytes ? { chunkBytes } : {});
  return {
    problems: allShapes(r.report.problems),
    notes: r.report.notes.map((n) => n.kind),
    rows: r.store.rowCount,
    lines: Array.from(r.store.lines),
    values: r.store.values.map((v) => Array.from(v).map((x) => (Number.isNaN(x) ? null : x))),
    texts: r.store.names.map((_, j) => Array.from({ length: r.store.rowCount }, (_, i) => cellText(r.store, j, i) ?? null)),
    sha256: r.file.sha256,
  };
};

describe("streaming", () => {
  it("gives the same result wherever the chunks end", async () => {
    const reference = new Map<string, Awaited<ReturnType<typeof snapshot>>>();
    for (const c of all) reference.set(c.name, await snapshot(chunked(c.content), c.options));
    await fc.assert(
      fc.asyncProperty(
        fc.constantFrom(...all),
        fc.array(fc.nat({ max: 400 }), { maxLength: 12 }),
        fc.integer({ min: 1, max: 64 }),
        async (c, cuts, chunkBytes) => {
          expect(await snapshot(splitAt(c.content, cuts), c.options, chunkBytes)).toEqual(reference.get(c.name));
        },
      ),
      { numRuns: 400 },
    );
  });

  it("stops reading at the size limit and ends the source", async () => {
    let produced = 0;
    let ended = false;
    const source = Readable.from(
      (function* () {
        try {
          for (let i = 0; i < 10_000; i++) {
            produced++;
            yield Buffer.from(i === 0 ? "a,b\n" : `${i},${i * 2}\n`.repeat(100));
          }
        } finally {
          ended = true;
        }
      })(),
    );
    const { report, file } = await checkCsv(source, { maxBytes: 50_000 });
    expect(report.problems.map((p) => p.kind)).toEqual(["file-too-large"]);
    expect(report.problems[0].message).toMatch(/larger than the limit of 48\.8 KB/);
    expect(file.stopped).toBe("file-too-large");
    expect(produced).toBeLessThan(100);
    expect(ended || source.destroyed).toBe(true);
  });

  it("reads a web ReadableStream and a Node Readable alike", async () => {
    const text = csv();
    const web = new Blob([text]).stream();
    const a = await snapshot(web as unknown as AsyncIterable<Uint8Array>, OPTIONS);
    const b = await snapshot(Readable.from([bytesOf(text)]), OPTIONS);
    expect(a).toEqual(b);
    expect(a.rows).toBe(8);
  });

  it("propagates an error of the source", async () => {
    async function* failing() {
      yield Buffer.from(csv().slice(0, 60));
      throw new Error("connection reset");
    }
    await expect(checkCsv(failing(), OPTIONS)).rejects.toThrow("connection reset");
  });

  it("detects the delimiter from the header line, ignoring quoted ones", () => {
    expect(detectDelimiter("a,b,c")).toBe(",");
    expect(detectDelimiter("a;b;c")).toBe(";");
    expect(detectDelimiter("a\tb\tc")).toBe("\t");
    expect(detectDelimiter('"a;b";"c,d";e,f;g')).toBe(";");
    expect(detectDelimiter("single")).toBe(",");
  });
});

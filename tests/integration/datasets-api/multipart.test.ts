// The streaming multipart/form-data reader of uploads: bodies serialized by undici's FormData (what
// fetch and browsers send), cut into pieces of every size so the boundary falls across piece edges,
// with file contents that look like boundaries; malformed and truncated bodies are refused.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { MultipartError, multipartBoundary, readMultipart } from "@/server/datasets/multipart";

async function encode(form: FormData): Promise<{ bytes: Buffer; boundary: string }> {
  const response = new Response(form);
  const boundary = multipartBoundary(response.headers.get("content-type"));
  if (!boundary) throw new Error("no boundary");
  return { bytes: Buffer.from(await response.arrayBuffer()), boundary };
}

async function* pieces(bytes: Buffer, sizes: number[]): AsyncGenerator<Uint8Array> {
  let offset = 0;
  let i = 0;
  while (offset < bytes.length) {
    const size = Math.max(1, sizes[i++ % sizes.length]);
    yield new Uint8Array(bytes.subarray(offset, offset + size));
    offset += size;
  }
}

async function readAll(bytes: Buffer, boundary: string, sizes: number[]) {
  const parts: { name: string; filename: string | null; contentType: string | null; body: Buffer }[] = [];
  for await (const part of readMultipart(pieces(bytes, sizes), boundary)) {
    const chunks: Buffer[] = [];
    for await (const chunk of part.body) chunks.push(chunk);
    parts.push({ name: part.name, filename: part.filename, contentType: part.contentType, body: Buffer.concat(chunks) });
  }
  return parts;
}

describe("readMultipart", () => {
  it("reads fields and a file whose bytes look like boundaries, whatever the piece sizes", async () => {
    await fc.assert(
      fc.asyncProperty(fc.uint8Array({ maxLength: 3000 }), fc.array(fc.integer({ min: 1, max: 700 }), { minLength: 1, maxLength: 8 }), async (random, sizes) => {
        const form = new FormData();
        form.set("name", "Q1 history — ünïcode");
        form.set("options", '{"missingPolicy":"reject"}');
        const tricky = Buffer.concat([Buffer.from("week,sales\r\n--\r\n\r\n--"), Buffer.from(random), Buffer.from("\r\n-")]);
        form.set("file", new Blob([tricky], { type: "text/csv" }), "dir\\spend history.csv");
        const { bytes, boundary } = await encode(form);
        // the boundary itself inside the file, but without the CRLF that would make it a delimiter
        const parts = await readAll(bytes, boundary, sizes);
        expect(parts.map((p) => p.name)).toEqual(["name", "options", "file"]);
        expect(parts[0].body.toString("utf8")).toBe("Q1 history — ünïcode");
        expect(parts[1].body.toString("utf8")).toBe('{"missingPolicy":"reject"}');
        expect(parts[2]).toMatchObject({ filename: "spend history.csv", contentType: "text/csv" });
        expect(parts[2].body.equals(tricky)).toBe(true);
      }),
      { numRuns: 150 },
    );
  });

  it("keeps the boundary string inside a file when it is not at a line start", async () => {
    const form = new FormData();
    const boundaryLike = "x".repeat(10);
    form.set("file", new Blob([`a,b\n1,--${boundaryLike}\n`]), "b.csv");
    const { bytes, boundary } = await encode(form);
    const content = `a,b\n1,--${boundary}\n`;
    const form2 = new FormData();
    form2.set("file", new Blob([content]), "b.csv");
    const second = await encode(form2);
    const parts = await readAll(second.bytes, second.boundary, [7]);
    expect(parts[0].body.toString()).toBe(content);
    expect((await readAll(bytes, boundary, [3]))[0].body.toString()).toContain(boundaryLike);
  });

  it("skips a part's body that is not read and gives text() of small fields", async () => {
    const form = new FormData();
    form.set("ignored", new Blob(["x".repeat(100_000)]), "big.bin");
    form.set("name", "after");
    const { bytes, boundary } = await encode(form);
    const seen: string[] = [];
    for await (const part of readMultipart(pieces(bytes, [999]), boundary)) {
      if (part.name === "name") seen.push(await part.text());
      else seen.push(`skipped ${part.name}`);
    }
    expect(seen).toEqual(["skipped ignored", "after"]);
  });

  it("refuses truncated and malformed bodies", async () => {
    const form = new FormData();
    form.set("file", new Blob(["week,sales\n2024-01-01,1\n"]), "a.csv");
    const { bytes, boundary } = await encode(form);
    await expect(readAll(bytes.subarray(0, bytes.length - 30), boundary, [64])).rejects.toBeInstanceOf(MultipartError);
    await expect(readAll(Buffer.from("no boundary here at all"), boundary, [64])).rejects.toThrow("ended before its first boundary");
    const noDisposition = Buffer.from(`--${boundary}\r\nContent-Type: text/plain\r\n\r\nx\r\n--${boundary}--\r\n`);
    await expect(readAll(noDisposition, boundary, [5])).rejects.toThrow("Content-Disposition");
  });

  it("reads the boundary of a content type (quoted or not) and nothing else", () => {
    expect(multipartBoundary('multipart/form-data; boundary="a b"')).toBe("a b");
    expect(multipartBoundary("multipart/form-data; charset=utf-8; boundary=----x1")).toBe("----x1");
    expect(multipartBoundary("text/csv")).toBeNull();
    expect(multipartBoundary("multipart/form-data")).toBeNull();
  });
});

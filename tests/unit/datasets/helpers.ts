// Helpers for the dataset unit tests: feeding bytes in chosen chunk sizes, and comparing problems by shape.
import type { Problem } from "@/server/datasets/problems";
import type { ExpectedProblem } from "@/tests/fixtures/csv/cases";

export const bytesOf = (content: string | Uint8Array): Buffer =>
  typeof content === "string" ? Buffer.from(content, "utf8") : Buffer.from(content);

/** The content as an async iterable of chunks of `size` bytes (one chunk when size is Infinity). */
export async function* chunked(content: string | Uint8Array, size = Infinity): AsyncGenerator<Buffer> {
  const bytes = bytesOf(content);
  if (size === Infinity) {
    if (bytes.length > 0) yield bytes;
    return;
  }
  for (let i = 0; i < bytes.length; i += size) yield bytes.subarray(i, i + size);
}

/** The content split at the given byte offsets. */
export async function* splitAt(content: string | Uint8Array, cuts: number[]): AsyncGenerator<Buffer> {
  const bytes = bytesOf(content);
  let start = 0;
  for (const cut of [...cuts].sort((a, b) => a - b)) {
    if (cut > start && cut < bytes.length) {
      yield bytes.subarray(start, cut);
      start = cut;
    }
  }
  if (start < bytes.length) yield bytes.subarray(start);
}

/** A problem reduced to the fields the expectation names. */
export function shapeOf(problem: Problem, expected: ExpectedProblem): ExpectedProblem {
  const out: ExpectedProblem = { kind: problem.kind };
  for (const key of ["row", "line", "column", "byteOffset", "path"] as const) {
    if (key in expected) (out as Record<string, unknown>)[key] = problem[key];
  }
  return out;
}

export const allShapes = (problems: Problem[]) =>
  problems.map((p) => ({ kind: p.kind, row: p.row, line: p.line, column: p.column, byteOffset: p.byteOffset, path: p.path }));

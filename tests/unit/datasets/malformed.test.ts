// ≥ 30 malformed uploads: each gets its exact problems (kind, data row, file line, column), in one report,
// whatever the chunking of the incoming bytes.
import { describe, expect, it } from "vitest";
import { checkCsv } from "@/server/datasets/pipeline";
import { malformedCases } from "@/tests/fixtures/csv/cases";
import { allShapes, chunked, shapeOf } from "./helpers";

describe("malformed files", () => {
  it("has at least 30 cases", () => {
    expect(malformedCases.length).toBeGreaterThanOrEqual(30);
  });

  for (const c of malformedCases) {
    it(c.name, async () => {
      const { report } = await checkCsv(chunked(c.content), c.options ?? {}, c.limits ?? {});
      expect(report.ok).toBe(false);
      const shapes = report.problems.map((p, i) => shapeOf(p, c.expect[Math.min(i, c.expect.length - 1)] ?? {}));
      if (c.atLeast) {
        for (const e of c.expect) {
          expect(report.problems.map((p) => shapeOf(p, e)), JSON.stringify(allShapes(report.problems))).toContainEqual(e);
        }
      } else {
        expect(shapes, JSON.stringify(allShapes(report.problems))).toEqual(c.expect);
        expect(report.problemCount).toBe(c.expect.length);
      }
      for (const p of report.problems) expect(p.message.length).toBeGreaterThan(10);
      for (const note of c.notes ?? []) expect(report.notes.map((n) => n.kind)).toContain(note);
      expect(report.summary).toMatch(/not stored/);
    });
  }

  it("reports the same problems whatever the chunk sizes (1, 2, 3, 7 and 64 bytes)", async () => {
    for (const c of malformedCases.filter((m) => !m.limits?.chunkBytes)) {
      const whole = await checkCsv(chunked(c.content), c.options ?? {}, c.limits ?? {});
      for (const size of [1, 2, 3, 7, 64]) {
        const parts = await checkCsv(chunked(c.content, size), c.options ?? {}, { ...c.limits, chunkBytes: size });
        expect(allShapes(parts.report.problems), `${c.name}, chunks of ${size}`).toEqual(allShapes(whole.report.problems));
      }
    }
  });
});

// The report: every problem counted, the first 200 listed, per-kind counts, the API error body.
import { describe, expect, it } from "vitest";
import { checkCsv } from "@/server/datasets/pipeline";
import { reportToErrorBody, statusForReport } from "@/server/datasets/problems";
import { OPTIONS, ROWS, csv } from "@/tests/fixtures/csv/cases";
import { chunked } from "./helpers";

const many = (n: number) =>
  csv((rows) => {
    rows.length = 0;
    for (let i = 0; i < n; i++) {
      const week = new Date(Date.UTC(2000, 0, 3) + i * 7 * 86_400_000).toISOString().slice(0, 10);
      rows.push([week, String(1000 + i), String(-1 - (i % 5)), String(100 + (i % 7)), String(9 + (i % 3))]);
    }
  });

describe("the report", () => {
  it("lists the first 200 problems and counts the rest", async () => {
    const { report } = await checkCsv(chunked(many(500)), OPTIONS);
    expect(report.problemCount).toBe(500);
    expect(report.problems).toHaveLength(200);
    expect(report.omitted).toBe(300);
    expect(report.countsByKind).toEqual({ "negative-spend": 500 });
    expect(report.summary).toBe("The file was not stored: 500 problems (500 negative spends).");
    expect(report.problems[199]).toMatchObject({ kind: "negative-spend", row: 200, line: 201, column: 3, columnName: "tv" });
  });

  it("honours a smaller limit", async () => {
    const { report } = await checkCsv(chunked(many(50)), { ...OPTIONS, maxProblems: 10 });
    expect(report.problems).toHaveLength(10);
    expect(report.problemCount).toBe(50);
  });

  it("becomes the project's error body, with row and column on each detail", async () => {
    const { report } = await checkCsv(chunked(many(300)), OPTIONS);
    const body = reportToErrorBody(report);
    expect(body.error).toBe(report.summary);
    expect(body.details).toHaveLength(201);
    expect(body.details[0]).toMatchObject({ kind: "negative-spend", path: "file", row: 1, line: 2, column: "tv", columnNumber: 3 });
    expect(body.details[200]).toMatchObject({ kind: "omitted", message: "…and 100 more problems not listed." });
    expect(statusForReport(report)).toBe(422);
    const big = await checkCsv(chunked(csv()), { ...OPTIONS, maxBytes: 10 });
    expect(statusForReport(big.report)).toBe(413);
  });

  it("a valid file has an ok report", async () => {
    const { report } = await checkCsv(chunked(csv()), OPTIONS);
    expect(report).toMatchObject({ ok: true, problems: [], problemCount: 0, omitted: 0, summary: "The file is valid." });
    expect(ROWS).toHaveLength(8);
  });
});

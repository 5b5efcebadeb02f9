// The same table in other dialects (BOM, semicolon, tab, CRLF, CR, quotes, blank lines, white space, DMY
// dates, ISO weeks, multi-line text cells) reads to the same numbers, in any chunking.
import { createHash } from "node:crypto";
import { describe, expect, it } from "vitest";
import { cellText } from "@/server/datasets/inspect";
import { checkCsv } from "@/server/datasets/pipeline";
import { OPTIONS, ROWS, validVariants } from "@/tests/fixtures/csv/cases";
import { bytesOf, chunked } from "./helpers";

describe("valid variants", () => {
  for (const v of validVariants) {
    it(v.name, async () => {
      for (const size of [Infinity, 1, 5, 64]) {
        const result = await checkCsv(chunked(v.content, size), { ...OPTIONS, ...v.options }, size === Infinity ? {} : { chunkBytes: size });
        expect(result.report.problems, `${v.name} in chunks of ${size}`).toEqual([]);
        expect(result.report.ok).toBe(true);
        const { store, columns, file } = result;
        expect(store.rowCount).toBeGreaterThanOrEqual(ROWS.length);
        for (let j = 1; j < 5; j++) {
          if (v.changed?.includes(j + 1)) continue;
          expect(Array.from(store.values[j].subarray(0, ROWS.length)), `column ${j + 1}`).toEqual(ROWS.map((r) => Number(r[j])));
        }
        expect(columns[0].kind).toBe("period");
        expect(columns.slice(1, 5).map((c) => c.kind)).toEqual(["numeric", "numeric", "numeric", "numeric"]);
        expect(file.byteSize).toBe(bytesOf(v.content).length);
        expect(file.sha256).toBe(createHash("sha256").update(bytesOf(v.content)).digest("hex"));
        expect(result.roles?.columns.map((c) => c.role).slice(0, 5)).toEqual(["period", "outcome", "spend", "spend", "control"]);
        for (const note of v.notes ?? []) expect(result.report.notes.map((n) => n.kind)).toContain(note);
      }
    });
  }

  it("detects delimiter, line ending and BOM, and numbers rows and lines", async () => {
    const v = validVariants.find((x) => x.name === "BOM + tab + CRLF")!;
    const { file, store } = await checkCsv(chunked(v.content), OPTIONS);
    expect(file).toMatchObject({ delimiter: "\t", lineEnding: "crlf", hasBom: true, headerLine: 1, rowCount: 8 });
    expect(Array.from(store.lines)).toEqual([2, 3, 4, 5, 6, 7, 8, 9]);

    const blank = validVariants.find((x) => x.name.startsWith("blank lines"))!;
    const b = await checkCsv(chunked(blank.content), OPTIONS);
    expect(Array.from(b.store.lines)).toEqual([2, 3, 6, 7, 8, 9, 10, 11]);
    expect(b.file.blankLines).toBe(4);

    const multi = validVariants.find((x) => x.name.startsWith("text column with quoted"))!;
    const m = await checkCsv(chunked(multi.content), OPTIONS);
    // row 3's comment spans two lines, so row 4 starts on line 6
    expect(Array.from(m.store.lines)).toEqual([2, 3, 4, 6, 7, 8, 9, 10]);
    expect(m.store.texts[5]?.[2]).toBe('promo, "big"\nweek');
    expect(m.columns[5].kind).toBe("text");
    // YYYY-MM-DD cells are held as day numbers, and read back as the same text
    expect(m.store.texts[0]).toBeNull();
    expect(m.store.dates?.[0]?.[0]).toBe(Date.UTC(2024, 0, 1) / 86_400_000);
    expect(cellText(m.store, 0, 0)).toBe("2024-01-01");
  });

  it("profiles columns: min, max, mean, std, missing, sample, period range", async () => {
    const v = validVariants.find((x) => x.name.startsWith("missing control value"))!;
    const { columns, roles, report } = await checkCsv(chunked(v.content), { ...OPTIONS, ...v.options });
    const sales = ROWS.map((r) => Number(r[1])).concat(1650);
    const mean = sales.reduce((a, b) => a + b, 0) / sales.length;
    const sd = Math.sqrt(sales.reduce((a, b) => a + (b - mean) ** 2, 0) / (sales.length - 1));
    expect(columns[1]).toMatchObject({ name: "sales", kind: "numeric", numericCount: 9, missingCount: 0, min: 1200.5, max: 1650 });
    expect(columns[1].mean).toBeCloseTo(mean, 10);
    expect(columns[1].std).toBeCloseTo(sd, 10);
    expect(columns[4]).toMatchObject({ name: "price", missingCount: 1, numericCount: 8 });
    expect(columns[0]).toMatchObject({ kind: "period", firstPeriod: "2024-01-01", lastPeriod: "2024-02-26" });
    expect(columns[0].sample).toEqual(["2024-01-01", "2024-01-08", "2024-01-15", "2024-01-22", "2024-01-29"]);
    expect(roles?.droppedRows).toEqual([8]);
    expect(roles?.keptRowCount).toBe(8);
    expect(report.notes.find((n) => n.kind === "dropped-incomplete-rows")).toMatchObject({ count: 1, rows: [9] });
  });

  it("keeps a text column as text until a numeric role is given to it", async () => {
    const content = "week,sales,tv,region\n" + ROWS.map((r, i) => `${r[0]},${r[1]},${r[2]},${i % 2 ? "north" : "south"}`).join("\n");
    const inspect = await checkCsv(chunked(content));
    expect(inspect.report.ok).toBe(true);
    expect(inspect.columns[3]).toMatchObject({ kind: "text", textCount: 8, numericCount: 0 });
    const assigned = await checkCsv(chunked(content), { roles: { sales: { role: "outcome" }, tv: { role: "spend" }, region: { role: "ignored" } } });
    expect(assigned.report.ok).toBe(true);
  });
});

// Every CSV export escapes formula-like text and quotes what needs quoting; numbers stay numbers.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { csvLines, escapeCsvCell, toCsv } from "@/server/datasets/csv-export";
import { cellText } from "@/server/datasets/inspect";
import { checkCsv } from "@/server/datasets/pipeline";
import { chunked } from "./helpers";

describe("escapeCsvCell", () => {
  it.each([
    ["=SUM(A1:A9)", "'=SUM(A1:A9)"],
    ["+CMD|' /C calc'!A0", "'+CMD|' /C calc'!A0"],
    ["-2+3", "'-2+3"],
    ["@SUM(1)", "'@SUM(1)"],
    ["\t=1", "'\t=1"],
    ["  =1", "'  =1"],
    ["-", "'-"],
    ["-inf", "'-inf"],
    ["-1e999", "'-1e999"],
    ["-12.5", "-12.5"],
    ["+3", "+3"],
    ["-0", "-0"],
    ["plain", "plain"],
    ["a,b", '"a,b"'],
    ['say "hi"', '"say ""hi"""'],
    ["two\nlines", '"two\nlines"'],
    [" padded ", '" padded "'],
    ["=a,b", `"'=a,b"`],
  ])("%j → %j", (input, output) => {
    expect(escapeCsvCell(input)).toBe(output);
  });

  it("writes numbers as numbers, negative ones included, and non-finite ones as empty cells", () => {
    expect(escapeCsvCell(-5)).toBe("-5");
    expect(escapeCsvCell(1.5e-7)).toBe("1.5e-7");
    expect(escapeCsvCell(Number.NaN)).toBe("");
    expect(escapeCsvCell(Number.NEGATIVE_INFINITY)).toBe("");
    expect(escapeCsvCell(null)).toBe("");
    expect(escapeCsvCell(undefined)).toBe("");
    expect(escapeCsvCell(true)).toBe("true");
    expect(escapeCsvCell(new Date("2024-01-29T00:00:00Z"))).toBe("2024-01-29T00:00:00.000Z");
  });

  it("quotes for the chosen delimiter", () => {
    expect(escapeCsvCell("a;b", ";")).toBe('"a;b"');
    expect(escapeCsvCell("a;b", ",")).toBe("a;b");
    expect(escapeCsvCell("a\tb", "\t")).toBe('"a\tb"');
  });
});

describe("toCsv", () => {
  it("joins rows with CRLF, optionally after a BOM", () => {
    expect(toCsv([["name", "spend"], ["=HYPERLINK(\"x\")", -3], ["TV", 12.5]])).toBe(
      "name,spend\r\n\"'=HYPERLINK(\"\"x\"\")\",-3\r\nTV,12.5\r\n",
    );
    expect(toCsv([["a"]], { bom: true, newline: "\n" })).toBe("\uFEFFa\n");
    expect([...csvLines([["a", 1], ["b", 2]], { delimiter: ";" })]).toEqual(["a;1\r\n", "b;2\r\n"]);
  });

  it("reads back through the upload parser as the same cells (formula text with its quote)", async () => {
    const cell = fc.oneof(
      fc.string(),
      fc.constantFrom("=1+1", "-x", "+", "@a", "a,b", '"', "\r\n", "\n", " x "),
      fc.double({ noNaN: true, noDefaultInfinity: true }),
    );
    await fc.assert(
      fc.asyncProperty(fc.array(fc.array(cell, { minLength: 2, maxLength: 2 }), { minLength: 1, maxLength: 6 }), async (rows) => {
        const clean = rows.map((r) => r.map((c) => (typeof c === "string" ? c.replace(/\u0000/g, "") : c)));
        const text = toCsv([["first", "second"], ...clean]);
        const { store, file } = await checkCsv(chunked(text));
        if (file.stopped) return;
        // every non-blank row comes back; cells compare as the exported text (trimmed, as the reader trims)
        const expected = clean
          .map((r) => r.map((c) => escapeForCompare(c)))
          .filter((r) => r.some((c) => c !== ""));
        expect(store.rowCount).toBe(expected.length);
        expected.forEach((r, i) => {
          r.forEach((c, j) => {
            const x = store.values[j][i];
            const t = cellText(store, j, i);
            const got = Number.isNaN(x) ? (t ?? "") : String(x);
            expect(got).toBe(c);
          });
        });
      }),
      { numRuns: 300 },
    );
  });
});

/** What the reader gives back for an exported cell: numbers as numbers, text trimmed, missing tokens empty. */
function escapeForCompare(c: string | number): string {
  if (typeof c === "number") return String(c);
  const formula = /^[=+\-@\t\r]|^\s+[=+\-@]/.test(c) && !(/^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/.test(c) && Number.isFinite(Number(c)));
  const text = (formula ? `'${c}` : c).trim();
  if (["", "na", "n/a", "null", "#n/a"].includes(text.toLowerCase())) return "";
  const n = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/.test(text) ? Number(text) : Number.NaN;
  return Number.isFinite(n) ? String(n) : text;
}

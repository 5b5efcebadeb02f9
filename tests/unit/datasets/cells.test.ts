// The numeric and period rules of a cell, decided once for every upload (server/datasets/cells.ts).
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { canonicalIsoDay, cellKind, dayNumber, fastNumber, isoDate, readCell, readPeriod, writeIsoDate } from "@/server/datasets/cells";
import { cellText } from "@/server/datasets/inspect";
import { checkCsv } from "@/server/datasets/pipeline";
import { chunked } from "./helpers";

describe("numbers", () => {
  it.each([
    ["12", 12],
    ["-3.5", -3.5],
    [".5", 0.5],
    ["5.", 5],
    ["+1e6", 1e6],
    ["1E-3", 0.001],
    ["  42  ", 42],
    ["0007", 7],
    ["-0", -0],
    ["1e-999", 0],
    ["123456789012345678901234567890", 1.2345678901234568e29],
  ])("reads %j as %d", (cell, value) => {
    expect(readCell(cell)).toEqual({ kind: "number", value });
    expect(cellKind(cell)).toBe(value);
  });

  it.each([
    ["", "missing"],
    ["   ", "missing"],
    ["NA", "missing"],
    ["n/a", "missing"],
    ["NULL", "missing"],
    ["#N/A", "missing"],
    ["NaN", "non-finite"],
    ["-nan", "non-finite"],
    ["Infinity", "non-finite"],
    ["-inf", "non-finite"],
    ["+INF", "non-finite"],
    ["1e999", "non-finite"],
    ["-1e400", "non-finite"],
    ["1,234", "thousands-separator"],
    ["1,234,567.89", "thousands-separator"],
    ["1.234.567", "thousands-separator"],
    ["1.234,5", "thousands-separator"],
    ["1 234", "thousands-separator"],
    ["1'234", "thousands-separator"],
    ["3,5", "decimal-comma"],
    ["1234,56", "decimal-comma"],
    ["$12", "non-numeric"],
    ["12 €", "non-numeric"],
    ["12%", "non-numeric"],
    ["0x1F", "non-numeric"],
    ["0b101", "non-numeric"],
    ["1.2.3", "non-numeric"],
    ["abc", "non-numeric"],
    ["=1+1", "non-numeric"],
    ["1_000", "non-numeric"],
    ["１２", "non-numeric"],
  ])("reads %j as %s", (cell, kind) => {
    expect(readCell(cell).kind).toBe(kind);
    expect(Number.isNaN(fastNumber(cell))).toBe(true);
  });

  it("the hot path gives exactly Number() for every decimal the rules accept", () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (x) => {
        const text = String(x);
        expect(Object.is(fastNumber(text), Number(text))).toBe(true);
      }),
      { numRuns: 3000 },
    );
    const decimal = fc
      .tuple(fc.constantFrom("", "-", "+"), fc.stringMatching(/^\d{1,18}$/), fc.option(fc.stringMatching(/^\d{0,18}$/)), fc.option(fc.integer({ min: -330, max: 330 })))
      .map(([sign, int, frac, exp]) => `${sign}${int}${frac !== null ? `.${frac}` : ""}${exp !== null ? `e${exp}` : ""}`);
    fc.assert(
      fc.property(decimal, (text) => {
        const expected = Number(text);
        const got = fastNumber(text);
        if (Number.isFinite(expected)) expect(Object.is(got, expected)).toBe(true);
        else expect(Number.isNaN(got)).toBe(true);
        const cell = readCell(text);
        expect(cell.kind).toBe(Number.isFinite(expected) ? "number" : "non-finite");
      }),
      { numRuns: 5000 },
    );
  });

  it("never takes text for a number on the hot path", () => {
    fc.assert(
      fc.property(fc.string(), (s) => {
        const x = fastNumber(s);
        if (!Number.isNaN(x)) expect(readCell(s)).toEqual({ kind: "number", value: x });
      }),
      { numRuns: 5000 },
    );
  });
});

describe("the reader's hot path (inlined in inspect.ts)", () => {
  it("stores exactly what readCell says, for any cell", async () => {
    const decimal = fc
      .tuple(fc.constantFrom("", "-", "+", " "), fc.stringMatching(/^\d{0,17}$/), fc.constantFrom("", ".", "e", "E-", " ", ",", "-", "x"), fc.stringMatching(/^\d{0,4}$/))
      .map((parts) => parts.join(""));
    const cell = fc.oneof(decimal, fc.string({ maxLength: 8 }), fc.constantFrom("NA", "NaN", "-inf", "1e999", "0x1F", "1.5\u3000", "\u00a07", "2024-01-01", "1,5"));
    await fc.assert(
      fc.asyncProperty(fc.array(cell, { minLength: 1, maxLength: 25 }), async (cells) => {
        const text = "x\n" + cells.map((c) => `"${c.replace(/"/g, '""')}"`).join("\n") + "\n";
        const { store } = await checkCsv(chunked(text));
        const kept = cells.filter((c) => c.trim() !== "");
        expect(store.rowCount).toBe(kept.length);
        kept.forEach((c, i) => {
          const reading = readCell(c);
          const x = store.values[0][i];
          const t = cellText(store, 0, i);
          if (reading.kind === "number") expect(Object.is(x, reading.value) || (x === 0 && reading.value === 0)).toBe(true);
          else expect(x).toBeNaN();
          if (reading.kind === "number" || reading.kind === "missing") expect(t).toBeUndefined();
          else expect(t).toBe(c.trim());
        });
      }),
      { numRuns: 1500 },
    );
  });
});

describe("periods", () => {
  it.each([
    ["2024-01-29", "2024-01-29"],
    ["2024-1-9", "2024-01-09"],
    ["2024/01/29", "2024-01-29"],
    ["2024-01-29T10:15:00Z", "2024-01-29"],
    ["2024-01-29 10:15", "2024-01-29"],
    ["2024-02", "2024-02-01"],
    ["2024-W05", "2024-01-29"],
    ["2024W05", "2024-01-29"],
    ["2020-W53", "2020-12-28"],
    ["2025-W01", "2024-12-30"],
    ["2024-Q2", "2024-04-01"],
    ["2024-02-29", "2024-02-29"],
  ])("reads %j as %s", (cell, iso) => {
    expect(isoDate(readPeriod(cell))).toBe(iso);
  });

  it.each(["2023-02-29", "2024-13-01", "2024-00-10", "2024-04-31", "2021-W53", "2024-W00", "31/01/2024", "yesterday", "", "2024-01-29x"])(
    "refuses %j",
    (cell) => {
      expect(readPeriod(cell)).toBeNaN();
    },
  );

  it("takes only exact YYYY-MM-DD cells as canonical dates", () => {
    for (const cell of ["2024-1-05", "2024-01-5 ", " 2024-01-05", "2024/01/05", "2024-02-30", "20240-1-05", "2024-0a-05", "-024-01-05"]) {
      expect(canonicalIsoDay(cell)).toBeNaN();
    }
    expect(isoDate(canonicalIsoDay("0001-01-01"))).toBe("0001-01-01");
  });

  it("reads day-first and month-first dates only when told", () => {
    expect(isoDate(readPeriod("31/01/2024", "DMY"))).toBe("2024-01-31");
    expect(isoDate(readPeriod("31.01.2024", "DMY"))).toBe("2024-01-31");
    expect(isoDate(readPeriod("01/31/2024", "MDY"))).toBe("2024-01-31");
    expect(readPeriod("01/31/2024", "DMY")).toBeNaN();
  });

  it("day numbers agree with Date for any date in years 1-9999", () => {
    fc.assert(
      fc.property(fc.date({ min: new Date("0001-01-01T00:00:00Z"), max: new Date("9999-12-31T00:00:00Z"), noInvalidDate: true }), (d) => {
        const day = Math.floor(d.getTime() / 86_400_000);
        const iso = new Date(day * 86_400_000).toISOString().slice(0, 10);
        expect(isoDate(day)).toBe(iso);
        expect(dayNumber(+iso.slice(0, 4), +iso.slice(5, 7), +iso.slice(8, 10))).toBe(day);
        expect(readPeriod(iso)).toBe(day);
        expect(canonicalIsoDay(iso)).toBe(day);
        const bytes = new Uint8Array(12);
        writeIsoDate(bytes, 1, day);
        expect(Buffer.from(bytes.subarray(1, 11)).toString("latin1")).toBe(iso);
      }),
      { numRuns: 2000 },
    );
  });
});

import "server-only";

/**
 * How one CSV cell is read. The rules, decided once for every upload:
 * - Leading and trailing white space is ignored.
 * - Numbers use a dot as decimal point and an optional exponent: `12`, `-3.5`, `.5`, `5.`, `+1e6`.
 *   Nothing else is a number: no thousands separators (`1,234` / `1.234.567` / `1 234`), no decimal
 *   comma (`3,5`), no currency or percent signs, no hex. Each of these is reported with its own kind
 *   so the message can say exactly what to change.
 * - `NaN`, `Infinity`, `inf` (any sign, any case) and values that overflow a double (`1e999`) are
 *   non-finite and refused. A value that underflows (`1e-999`) reads as 0.
 * - Missing: an empty cell or one of `NA`, `N/A`, `null`, `#N/A` (any case).
 * - Anything else is text. A column with any text cell is a text column; it only becomes an error
 *   when the analyst gives it a numeric role (outcome, spend, control).
 */

export type CellProblemKind = "non-finite" | "thousands-separator" | "decimal-comma" | "non-numeric";

export type CellReading =
  | { kind: "number"; value: number }
  | { kind: "missing" }
  | { kind: CellProblemKind; hint: string };

const MISSING_TOKENS = new Set(["", "na", "n/a", "null", "#n/a"]);
const DECIMAL = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;
const NON_FINITE = /^[+-]?(?:nan|inf|infinity)$/i;
const THOUSANDS = [
  /^[+-]?\d{1,3}(?:,\d{3})+(?:\.\d*)?$/, // 1,234 or 1,234.5
  /^[+-]?\d{1,3}(?:\.\d{3}){2,}(?:,\d*)?$/, // 1.234.567
  /^[+-]?\d{1,3}(?:\.\d{3})+,\d*$/, // 1.234,5
  /^[+-]?\d{1,3}(?:[ \u00a0\u202f'’]\d{3})+(?:[.,]\d*)?$/, // 1 234 / 1'234
];
const DECIMAL_COMMA = /^[+-]?\d*,\d+(?:[eE][+-]?\d+)?$/;
const CURRENCY = /^[+-]?[$€£¥₹]|[$€£¥₹]$|^[+-]?(?:USD|EUR|GBP|CHF|JPY)\s?\d|\d\s?(?:USD|EUR|GBP|CHF|JPY)$/i;

const POW10 = [1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15];

/**
 * The hot path: the number in a cell that is a plain decimal number without surrounding text, or NaN
 * when the cell needs the full rules of {@link readCell} (missing, text, white space, problems).
 * Accepts exactly what {@link DECIMAL} accepts (possibly with trailing white space).
 *
 * Cells of at most 15 digits without exponent are converted here: the digits form an exact integer
 * below 2^53 and 10^k (k <= 15) is exact, so one correctly rounded division gives the same double as
 * Number() (the classic fast path of decimal conversion). Other cells go through Number().
 */
export function fastNumber(cell: string): number {
  const len = cell.length;
  let i = 0;
  let c = cell.charCodeAt(0);
  let negative = false;
  if (c === 45) {
    negative = true;
    i = 1;
  } else if (c === 43) i = 1;
  let mantissa = 0;
  let digits = 0;
  let scale = 0;
  let dot = false;
  for (; i < len; i++) {
    c = cell.charCodeAt(i);
    if (c >= 48 && c <= 57) {
      mantissa = mantissa * 10 + (c - 48);
      digits++;
      if (dot) scale++;
    } else if (c === 46 && !dot) dot = true;
    else break;
  }
  if (i === len && digits > 0 && digits <= 15) {
    const x = scale === 0 ? mantissa : mantissa / POW10[scale];
    return negative ? -x : x;
  }
  return slowNumber(cell);
}

function slowNumber(cell: string): number {
  const c = cell.charCodeAt(0);
  // digits, '+', '-', '.'; an empty cell gives NaN here (charCodeAt(0) is NaN)
  if (!((c >= 48 && c <= 57) || c === 45 || c === 46 || c === 43)) return NaN;
  // Number() also reads 0x1F, 0b1, 0o7: refuse those prefixes.
  if (c === 48 && cell.length > 1) {
    const d = cell.charCodeAt(1) | 0x20;
    if (d === 0x78 || d === 0x62 || d === 0x6f) return NaN;
  }
  const x = +cell;
  // NaN, ±Infinity (from "-Infinity" or overflow) go to the slow path
  return x - x === 0 ? x : NaN;
}

/**
 * What phase 1 needs to know of a cell the hot path did not take: a number (after trimming),
 * missing, or text (anything else; the exact problem is worked out by {@link readCell} only when the
 * column gets a numeric role).
 */
export function cellKind(cell: string): number | "missing" | "text" {
  const t = cell.trim();
  if (t.length <= 4 && MISSING_TOKENS.has(t.toLowerCase())) return "missing";
  if (DECIMAL.test(t)) {
    const value = Number(t);
    return Number.isFinite(value) ? value : "text";
  }
  return "text";
}

/** Reads a cell with all the rules above. */
export function readCell(cell: string): CellReading {
  const t = cell.trim();
  if (t.length <= 4 && MISSING_TOKENS.has(t.toLowerCase())) return { kind: "missing" };
  if (DECIMAL.test(t)) {
    const value = Number(t);
    if (Number.isFinite(value)) return { kind: "number", value };
    return { kind: "non-finite", hint: "it is too large for a double-precision number" };
  }
  if (NON_FINITE.test(t)) return { kind: "non-finite", hint: "NaN and infinities are not values" };
  if (THOUSANDS.some((re) => re.test(t))) {
    return { kind: "thousands-separator", hint: "write numbers without thousands separators, with a dot as decimal point (1234.5)" };
  }
  if (DECIMAL_COMMA.test(t)) return { kind: "decimal-comma", hint: "use a dot as decimal point (3.5, not 3,5)" };
  if (CURRENCY.test(t)) {
    return { kind: "non-numeric", hint: "remove the currency; set the column's currency when assigning roles" };
  }
  if (/%$/.test(t)) return { kind: "non-numeric", hint: "remove the percent sign (write 12.5 or 0.125)" };
  return { kind: "non-numeric", hint: "it is not a number" };
}

/** Shortens a cell for messages. */
export function preview(value: string, max = 40): string {
  const oneLine = value.replace(/[\r\n\t]+/g, " ");
  return oneLine.length > max ? `${oneLine.slice(0, max - 1)}…` : oneLine;
}

// ---------------------------------------------------------------------------------------------------
// Periods

/** How to read day-first or month-first dates such as 03/01/2024; ISO dates are always accepted. */
export type DateOrder = "YMD" | "DMY" | "MDY";

const ISO_DATE = /^(\d{4})-(\d{1,2})-(\d{1,2})(?:[T ](\d{2}):(\d{2})(?::(\d{2})(?:\.\d+)?)?(?:Z|[+-]\d{2}:?\d{2})?)?$/;
const YMD_OTHER = /^(\d{4})[/.](\d{1,2})[/.](\d{1,2})$/;
const YEAR_MONTH = /^(\d{4})-(\d{2})$/;
const ISO_WEEK = /^(\d{4})-?W(\d{2})(?:-?([1-7]))?$/i;
const QUARTER = /^(\d{4})-?Q([1-4])$/i;
const DAY_FIRST = /^(\d{1,2})[/.-](\d{1,2})[/.-](\d{4})$/;

/** Days since 1970-01-01 of a proleptic Gregorian date, or NaN when it does not exist. */
export function dayNumber(y: number, m: number, d: number): number {
  if (m < 1 || m > 12 || d < 1 || d > daysInMonth(y, m)) return NaN;
  // days-from-civil (H. Hinnant)
  const yy = m <= 2 ? y - 1 : y;
  const era = Math.floor(yy / 400);
  const yoe = yy - era * 400;
  const doy = Math.floor((153 * (m + (m > 2 ? -3 : 9)) + 2) / 5) + d - 1;
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy;
  return era * 146097 + doe - 719468;
}

function daysInMonth(y: number, m: number): number {
  if (m === 2) return (y % 4 === 0 && y % 100 !== 0) || y % 400 === 0 ? 29 : 28;
  return m === 4 || m === 6 || m === 9 || m === 11 ? 30 : 31;
}

/** The ISO date (YYYY-MM-DD) of a day number. */
export function isoDate(day: number): string {
  const z = day + 719468;
  const era = Math.floor(z / 146097);
  const doe = z - era * 146097;
  const yoe = Math.floor((doe - Math.floor(doe / 1460) + Math.floor(doe / 36524) - Math.floor(doe / 146096)) / 365);
  const doy = doe - (365 * yoe + Math.floor(yoe / 4) - Math.floor(yoe / 100));
  const mp = Math.floor((5 * doy + 2) / 153);
  const d = doy - Math.floor((153 * mp + 2) / 5) + 1;
  const m = mp < 10 ? mp + 3 : mp - 9;
  const y = yoe + era * 400 + (m <= 2 ? 1 : 0);
  return `${String(y).padStart(4, "0")}-${String(m).padStart(2, "0")}-${String(d).padStart(2, "0")}`;
}

/** Writes the ISO date (YYYY-MM-DD, years 0-9999) of a day number as 10 ASCII bytes at `at`. */
export function writeIsoDate(out: Uint8Array, at: number, day: number): void {
  // civil-from-days with integer division (z >= 0 for years >= 0, so truncation is floor)
  const z = day + 719468;
  const era = (z / 146097) | 0;
  const doe = z - era * 146097;
  const yoe = ((doe - ((doe / 1460) | 0) + ((doe / 36524) | 0) - ((doe / 146096) | 0)) / 365) | 0;
  const doy = doe - (365 * yoe + ((yoe / 4) | 0) - ((yoe / 100) | 0));
  const mp = ((5 * doy + 2) / 153) | 0;
  const d = doy - (((153 * mp + 2) / 5) | 0) + 1;
  const m = mp < 10 ? mp + 3 : mp - 9;
  const y = yoe + era * 400 + (m <= 2 ? 1 : 0);
  out[at] = 48 + ((y / 1000) | 0);
  out[at + 1] = 48 + (((y / 100) | 0) % 10);
  out[at + 2] = 48 + (((y / 10) | 0) % 10);
  out[at + 3] = 48 + (y % 10);
  out[at + 4] = 45;
  out[at + 5] = 48 + ((m / 10) | 0);
  out[at + 6] = 48 + (m % 10);
  out[at + 7] = 45;
  out[at + 8] = 48 + ((d / 10) | 0);
  out[at + 9] = 48 + (d % 10);
}

/**
 * The day number of a cell that is exactly a valid YYYY-MM-DD date (then `isoDate` gives the cell
 * back unchanged), else NaN.
 */
export function canonicalIsoDay(cell: string): number {
  if (cell.length !== 10 || cell.charCodeAt(4) !== 45 || cell.charCodeAt(7) !== 45) return NaN;
  const a = digit(cell, 0), b = digit(cell, 1), c = digit(cell, 2), d = digit(cell, 3);
  const e = digit(cell, 5), f = digit(cell, 6), g = digit(cell, 8), h = digit(cell, 9);
  // (x >>> 0) < 10 holds exactly for the digits 0-9 (a character below "0" gives a negative x)
  if (!((a >>> 0) < 10 && (b >>> 0) < 10 && (c >>> 0) < 10 && (d >>> 0) < 10 && (e >>> 0) < 10 && (f >>> 0) < 10 && (g >>> 0) < 10 && (h >>> 0) < 10)) {
    return NaN;
  }
  return dayNumber(a * 1000 + b * 100 + c * 10 + d, e * 10 + f, g * 10 + h);
}

/** Weekday of a day number, Monday = 0. */
const weekday = (day: number) => (((day + 3) % 7) + 7) % 7;

/** Monday of ISO week `w` of ISO year `y` plus `wd - 1` days, or NaN when the week does not exist. */
function isoWeekDay(y: number, w: number, wd: number): number {
  const jan4 = dayNumber(y, 1, 4);
  const week1Monday = jan4 - weekday(jan4);
  const dec28 = dayNumber(y, 12, 28);
  const weeksInYear = (dec28 - weekday(dec28) - week1Monday) / 7 + 1;
  if (w < 1 || w > weeksInYear) return NaN;
  return week1Monday + (w - 1) * 7 + (wd - 1);
}

const digit = (s: string, i: number) => s.charCodeAt(i) - 48;

/**
 * Reads a period: an ISO date (2024-01-29, optionally with a time), 2024/01/29, a month (2024-01), an
 * ISO week (2024-W05, 2024W05, 2024-W05-1) or a quarter (2024-Q1); with `DMY`/`MDY` also 29/01/2024,
 * 29.01.2024, 01/29/2024. Returns the first day it denotes as a day number (days since 1970-01-01;
 * {@link isoDate} turns it into text), or NaN.
 */
export function readPeriod(cell: string, order: DateOrder = "YMD"): number {
  // fast path: exactly YYYY-MM-DD
  const canonical = canonicalIsoDay(cell);
  if (canonical === canonical) return canonical;
  const t = cell.trim();
  let m: RegExpExecArray | null;
  if ((m = ISO_DATE.exec(t)) || (m = YMD_OTHER.exec(t))) return dayNumber(+m[1], +m[2], +m[3]);
  if ((m = YEAR_MONTH.exec(t))) return dayNumber(+m[1], +m[2], 1);
  if ((m = ISO_WEEK.exec(t))) return isoWeekDay(+m[1], +m[2], m[3] ? +m[3] : 1);
  if ((m = QUARTER.exec(t))) return dayNumber(+m[1], (+m[2] - 1) * 3 + 1, 1);
  if (order !== "YMD" && (m = DAY_FIRST.exec(t))) {
    return order === "DMY" ? dayNumber(+m[3], +m[2], +m[1]) : dayNumber(+m[3], +m[1], +m[2]);
  }
  return NaN;
}

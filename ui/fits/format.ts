// Number formatting for fit screens: Intl with the workspace locale, units on every number.

export type NumberContext = { locale: string; currency: string };

// Intl.NumberFormat objects are costly to build and plots format thousands of values: keep them.
const formatters = new Map<string, Intl.NumberFormat>();
function numberFormat(locale: string, options: Intl.NumberFormatOptions): Intl.NumberFormat {
  const key = `${locale}|${JSON.stringify(options)}`;
  let formatter = formatters.get(key);
  if (!formatter) {
    formatter = new Intl.NumberFormat(locale, options);
    formatters.set(key, formatter);
  }
  return formatter;
}

const isCurrencyCode = (unit: string | null | undefined): unit is string => !!unit && /^[A-Z]{3}$/.test(unit);

/** A plain number with about `digits` significant digits (never exponent notation for everyday sizes). */
export function formatNumber(value: number | null | undefined, locale: string, digits = 4): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  if (value === 0) return "0";
  const magnitude = Math.abs(value);
  if (magnitude >= 1e15 || magnitude < 1e-6) return value.toExponential(digits - 1);
  const fractionDigits = Math.max(0, Math.min(10, digits - 1 - Math.floor(Math.log10(magnitude))));
  return numberFormat(locale, { maximumFractionDigits: fractionDigits, minimumFractionDigits: Math.min(fractionDigits, 2) }).format(value);
}

/** A value in a column's unit: currency codes as money ("€182,000"), other units after the number. */
export function formatInUnit(value: number | null | undefined, unit: string | null | undefined, locale: string, digits = 4): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  if (isCurrencyCode(unit)) {
    const magnitude = Math.abs(value);
    const fractionDigits = magnitude >= 100 ? 0 : Math.max(0, Math.min(6, digits - 1 - Math.floor(Math.log10(magnitude || 1))));
    return numberFormat(locale, { style: "currency", currency: unit, maximumFractionDigits: fractionDigits, minimumFractionDigits: 0 }).format(value);
  }
  const number = formatNumber(value, locale, digits);
  return unit ? `${number} ${unit}` : number;
}

/** Compact axis ticks: "€120k", "1.2M". */
export function formatCompact(value: number, unit: string | null | undefined, locale: string): string {
  if (isCurrencyCode(unit)) {
    return numberFormat(locale, { style: "currency", currency: unit, notation: "compact", maximumFractionDigits: 1 }).format(value);
  }
  return numberFormat(locale, { notation: "compact", maximumFractionDigits: 2 }).format(value);
}

/** p-values as numbers, never stars: "< 0.0001", "0.0138", "0.840". */
export function formatPValue(p: number | null | undefined): string {
  if (p === null || p === undefined || !Number.isFinite(p)) return "—";
  if (p < 0.0001) return "< 0.0001";
  if (p < 0.001) return p.toFixed(4);
  return p.toFixed(3);
}

export function formatPercent(value: number, locale: string, fractionDigits = 1): string {
  return numberFormat(locale, { style: "percent", maximumFractionDigits: fractionDigits, minimumFractionDigits: fractionDigits }).format(value);
}

/** "EUR", "weeks" or "no unit" for headings and axis labels. */
export function unitLabel(unit: string | null | undefined): string {
  return unit ?? "no unit";
}

export function formatDateTime(value: Date | string, locale: string): string {
  return new Intl.DateTimeFormat(locale, { dateStyle: "medium", timeStyle: "short", timeZone: "UTC" }).format(new Date(value)) + " UTC";
}

/** An ISO date label as "Jan 2024" for time axes (other labels pass through). */
export function shortPeriod(label: string, locale: string): string {
  if (!/^\d{4}-\d{2}-\d{2}$/.test(label)) return label;
  return new Intl.DateTimeFormat(locale, { month: "short", year: "numeric", timeZone: "UTC" }).format(new Date(`${label}T00:00:00Z`));
}

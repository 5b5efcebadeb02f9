import type { CentsFormatter } from "./types";

/**
 * Converts a currency amount (e.g. 12500.5) to integer cents.
 *
 * Goes through 15 significant digits first because binary floats land just below half-cents
 * (1.005 * 100 === 100.49999999999999) and would otherwise round the wrong way.
 */
export function amountToCents(amount: number): number {
  if (!Number.isFinite(amount)) throw new RangeError(`Not a finite amount: ${amount}`);
  const scaled = Number((Math.abs(amount) * 100).toPrecision(15));
  const cents = Math.round(scaled);
  return amount < 0 && cents !== 0 ? -cents : cents;
}

/** Converts integer cents back to a currency amount (for APIs and the model, which speak currency units). */
export function centsToAmount(cents: number): number {
  return cents / 100;
}

/** Workspace money settings passed down from the workspace record. */
export interface MoneyLocale {
  /** ISO 4217 code, e.g. "EUR". */
  currency: string;
  /** BCP 47 locale, e.g. "en-IE". */
  locale: string;
}

const formatterCache = new Map<string, Intl.NumberFormat>();

function numberFormat(key: string, locale: string, options: Intl.NumberFormatOptions): Intl.NumberFormat {
  // Intl.NumberFormat construction is slow relative to a slider frame; reuse instances.
  let formatter = formatterCache.get(key);
  if (!formatter) {
    formatter = new Intl.NumberFormat(locale, options);
    formatterCache.set(key, formatter);
  }
  return formatter;
}

/**
 * Formats cents as currency in the workspace locale. Whole amounts drop the ".00"
 * ("€12,500"), others show cents ("€12,500.50"), so planners see exact values without noise.
 */
export function formatCents(cents: number, money: MoneyLocale): string {
  const whole = cents % 100 === 0;
  const key = `${money.locale}|${money.currency}|${whole ? "w" : "c"}`;
  return numberFormat(key, money.locale, {
    style: "currency",
    currency: money.currency,
    minimumFractionDigits: whole ? 0 : 2,
    maximumFractionDigits: whole ? 0 : 2,
  }).format(cents / 100);
}

/** Short currency form for sentences and strips ("€41K"), never for values a planner edits. */
export function formatCentsCompact(cents: number, money: MoneyLocale): string {
  const key = `${money.locale}|${money.currency}|compact`;
  return numberFormat(key, money.locale, {
    style: "currency",
    currency: money.currency,
    notation: "compact",
    maximumSignificantDigits: 3,
  }).format(cents / 100);
}

/** Plain number in the locale (no currency sign), as shown inside an editable amount field. */
export function formatCentsPlain(cents: number, locale: string): string {
  const whole = cents % 100 === 0;
  const key = `${locale}|plain|${whole ? "w" : "c"}`;
  return numberFormat(key, locale, {
    minimumFractionDigits: whole ? 0 : 2,
    maximumFractionDigits: whole ? 0 : 2,
  }).format(cents / 100);
}

/** Builds a {@link CentsFormatter} for reason messages. */
export function centsFormatter(money: MoneyLocale): CentsFormatter {
  return (cents) => formatCents(cents, money);
}

/** Fallback used when an edit function gets no formatter: "1,200.00"-style, no currency sign. */
export const plainCentsFormatter: CentsFormatter = (cents) => formatCentsPlain(cents, "en");

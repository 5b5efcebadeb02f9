import { amountToCents, formatCents, type MoneyLocale } from "@/server/planning/allocation";
import type { PlanShape } from "@/server/predict/plan-shape";

const numberFormats = new Map<string, Intl.NumberFormat>();

function numberFormat(locale: string, options: Intl.NumberFormatOptions): Intl.NumberFormat {
  const key = `${locale}|${JSON.stringify(options)}`;
  let format = numberFormats.get(key);
  if (!format) {
    format = new Intl.NumberFormat(locale, options);
    numberFormats.set(key, format);
  }
  return format;
}

/** Whether the outcome is money (its unit is a currency code), so it reads as "€1,234,567". */
export function outcomeIsMoney(shape: PlanShape): boolean {
  const unit = shape.outcome.unit;
  return unit === null ? /_(eur|usd|gbp|chf|sek|nok|dkk|pln|jpy|cad|aud)$/i.test(shape.outcome.name) : /^[A-Z]{3}$/.test(unit);
}

/** An outcome value in its unit, rounded to whole units (the model is not more precise than that). */
export function formatOutcome(value: number, shape: PlanShape, money: MoneyLocale): string {
  if (!Number.isFinite(value)) return "—";
  if (outcomeIsMoney(shape)) {
    const currency = shape.outcome.unit && /^[A-Z]{3}$/.test(shape.outcome.unit) ? shape.outcome.unit : money.currency;
    return numberFormat(money.locale, { style: "currency", currency, maximumFractionDigits: 0 }).format(Math.round(value));
  }
  const number = numberFormat(money.locale, { maximumFractionDigits: 0 }).format(Math.round(value));
  return shape.outcome.unit ? `${number} ${shape.outcome.unit}` : number;
}

/** A signed outcome difference ("+€12,300", "−€4,100"). */
export function formatSignedOutcome(value: number, shape: PlanShape, money: MoneyLocale): string {
  const text = formatOutcome(Math.abs(value), shape, money);
  return Math.round(value) === 0 ? text : `${value > 0 ? "+" : "−"}${text}`;
}

/** Whole currency amount ("€130,000"). */
export function formatMoney(amount: number, money: MoneyLocale): string {
  return formatCents(amountToCents(Math.round(amount)), money);
}

export function formatPercent(fraction: number, locale: string): string {
  return numberFormat(locale, { style: "percent", maximumFractionDigits: 0 }).format(fraction);
}

const dateTimes = new Map<string, Intl.DateTimeFormat>();

/** "1 Dec 2026, 10:42" in the viewer's time zone. */
export function formatDateTime(iso: string, locale: string): string {
  let format = dateTimes.get(locale);
  if (!format) {
    format = new Intl.DateTimeFormat(locale, { dateStyle: "medium", timeStyle: "short" });
    dateTimes.set(locale, format);
  }
  return format.format(new Date(iso));
}

/** Short axis labels ("€2.1M", "−€40K"). */
export function formatOutcomeCompact(value: number, shape: PlanShape, money: MoneyLocale): string {
  const sign = value < 0 ? "−" : "";
  const magnitude = Math.abs(value);
  if (outcomeIsMoney(shape)) {
    const currency = shape.outcome.unit && /^[A-Z]{3}$/.test(shape.outcome.unit) ? shape.outcome.unit : money.currency;
    return sign + numberFormat(money.locale, { style: "currency", currency, notation: "compact", maximumSignificantDigits: 3 }).format(magnitude);
  }
  return sign + numberFormat(money.locale, { notation: "compact", maximumSignificantDigits: 3 }).format(magnitude);
}

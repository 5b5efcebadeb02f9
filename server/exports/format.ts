import "server-only";
import type { ComparisonColumnDto, ComparisonDto } from "@/server/comparisons/types";

export type Money = { currency: string; locale: string };

/** Whether an outcome is money (its unit, or its column's suffix, is a currency code). */
function outcomeCurrency(outcome: ComparisonColumnDto["outcomeShape"], money: Money): string | null {
  if (outcome.unit) return /^[A-Z]{3}$/.test(outcome.unit) ? outcome.unit : null;
  return /_(eur|usd|gbp|chf|sek|nok|dkk|pln|jpy|cad|aud)$/i.test(outcome.name) ? money.currency : null;
}

/** An outcome in its unit, whole units ("€1,234,567", "1,234 orders"). */
export function formatOutcomeValue(value: number, outcome: ComparisonColumnDto["outcomeShape"], money: Money, signed = false): string {
  if (!Number.isFinite(value)) return "—";
  const currency = outcomeCurrency(outcome, money);
  const magnitude = signed ? Math.abs(value) : value;
  const text = currency
    ? new Intl.NumberFormat(money.locale, { style: "currency", currency, maximumFractionDigits: 0 }).format(Math.round(magnitude))
    : `${new Intl.NumberFormat(money.locale, { maximumFractionDigits: 0 }).format(Math.round(magnitude))}${outcome.unit ? ` ${outcome.unit}` : ""}`;
  if (!signed || Math.round(value) === 0) return text;
  return `${value > 0 ? "+" : "−"}${text}`;
}

/** Spend in the workspace currency, whole units ("€130,000"). */
export function formatSpend(amount: number, money: Money): string {
  return new Intl.NumberFormat(money.locale, { style: "currency", currency: money.currency, maximumFractionDigits: 0 }).format(Math.round(amount));
}

export function formatDate(iso: string | null, locale: string): string {
  if (!iso) return "—";
  return new Intl.DateTimeFormat(locale, { dateStyle: "medium", timeZone: "UTC" }).format(new Date(iso));
}

export const percentLevel = (level: number) => `${Math.round(level * 1000) / 10}%`;

/** "Signed off by Felix Brandt on 2 Dec 2026" / "Declined by … : reason" / "Not signed off". */
export function signoffSentence(column: ComparisonColumnDto, locale: string): string {
  const decision = column.signoff;
  if (!decision) return "Not signed off";
  const who = decision.decidedByName ?? "someone";
  const when = formatDate(decision.decidedAt, locale);
  return decision.decision === "signed_off"
    ? `Signed off by ${who} on ${when}${decision.reason ? ` (${decision.reason})` : ""}`
    : `Declined by ${who} on ${when}: ${decision.reason}`;
}

export const columnTitle = (column: ComparisonColumnDto) => `${column.scenarioName} v${column.version}`;

export const comparisonTitle = (comparison: ComparisonDto) =>
  comparison.name ?? comparison.columns.map((column) => columnTitle(column)).join(" vs ");

/** The cautions printed with every comparison (design notes, "Cautions"). */
export const comparisonCautions = [
  "These effects are associations in past data, not the result of changing one channel alone.",
  "The intervals assume the fitted model still describes the market.",
  "Before moving a large share of budget, test the shift on part of it first.",
] as const;

import type { MoneyLocale } from "@/server/planning/allocation";
import type { PlanShape } from "@/server/predict/plan-shape";
import { formatOutcome, formatOutcomeCompact, formatSignedOutcome } from "@/ui/scenario/format";

/** The outcome formatters of the scenario screens, given only the outcome's column description. */
const shapeOf = (outcome: PlanShape["outcome"]): PlanShape => ({ outcome, channels: [], controls: [], periodNoun: "period" });

export const outcomeText = (value: number, outcome: PlanShape["outcome"], money: MoneyLocale) => formatOutcome(value, shapeOf(outcome), money);
export const signedOutcomeText = (value: number, outcome: PlanShape["outcome"], money: MoneyLocale) => formatSignedOutcome(value, shapeOf(outcome), money);
export const compactOutcomeText = (value: number, outcome: PlanShape["outcome"], money: MoneyLocale) => formatOutcomeCompact(value, shapeOf(outcome), money);

export const levelText = (level: number) => `${Math.round(level * 1000) / 10}%`;

const dates = new Map<string, Intl.DateTimeFormat>();

/** "1 Dec 2026, 10:42" (viewer's time zone) or "1 Dec 2026" with `dateOnly`. */
export function dateText(iso: string | null, locale: string, dateOnly = false): string {
  if (!iso) return "—";
  const key = `${locale}|${dateOnly}`;
  let format = dates.get(key);
  if (!format) {
    format = new Intl.DateTimeFormat(locale, dateOnly ? { dateStyle: "medium" } : { dateStyle: "medium", timeStyle: "short" });
    dates.set(key, format);
  }
  return format.format(new Date(iso));
}

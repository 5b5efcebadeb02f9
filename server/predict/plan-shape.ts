/**
 * What a planner can move on a fit: its spend channels and its controls, read from the fit
 * record's specification. Isomorphic (no `server-only`): the scenario page computes its instant
 * preview in the browser with the same code the predict route runs. See README.md.
 */
// Straight from the module, not the engine's index: the browser bundles of the scenario room import
// this file on first paint and should not pull the rest of the engine with it.
import type { FitRecord } from "@/server/stats";
import { predictorColumns } from "@/server/stats/model-specification";

/** A spend channel: a raw column the planner allocates money to. */
export interface PlanChannel {
  /** The model's column name (the stable key in allocations). */
  name: string;
  label: string;
  /** Spend per period the fit saw, in currency units. */
  observed: { minimum: number; maximum: number };
}

/**
 * A control the plan holds fixed over the horizon.
 * - `count`: an on/off indicator (observed only as 0 and 1, e.g. a promotion week); the plan gives
 *   how many periods of the horizon have it on, and those periods get 1, the others 0.
 * - `level`: any other control (a price, a temperature); the plan gives its value per period,
 *   held the same in every period.
 */
export interface PlanControl {
  name: string;
  label: string;
  kind: "count" | "level";
  observed: { minimum: number; maximum: number };
}

export interface PlanShape {
  /** The outcome column; `unit` is its currency or unit ("EUR", "orders") when the dataset names one. */
  outcome: { name: string; label: string; unit: string | null };
  channels: PlanChannel[];
  controls: PlanControl[];
  /** Word for one period of the fit's data ("week"). */
  periodNoun: string;
}

/**
 * Reads a column name the way planners say it: "search_eur" → "Search", "promo_week" → "Promo week".
 * A trailing currency or unit suffix is dropped; explicit labels win.
 */
export function columnLabel(column: string, labels: Readonly<Record<string, string>> = {}): string {
  if (labels[column]) return labels[column];
  const words = column
    .replace(/_(eur|usd|gbp|chf|sek|nok|dkk|pln|jpy|cad|aud|amount|spend|cost)$/i, "")
    .replace(/[_\-.]+/g, " ")
    .trim();
  if (words === "") return column;
  return words.charAt(0).toUpperCase() + words.slice(1);
}

/**
 * Channels and controls of a fit. Columns read by `control` terms are controls; every other
 * predictor column (linear, log1p, power, interaction terms) is spend.
 *
 * @example describePlanShape(record).channels.map((c) => c.name) // => ["search_eur", "social_eur", …]
 */
export function describePlanShape(
  record: FitRecord,
  options: { labels?: Readonly<Record<string, string>>; periodNoun?: string; outcomeUnit?: string | null } = {},
): PlanShape {
  const specification = record.specification;
  const controlColumns = new Set(specification.terms.filter((term) => term.kind === "control").map((term) => (term as { column: string }).column));
  const range = (column: string) => {
    const observed = record.columnRanges[column];
    return { minimum: observed?.minimum ?? 0, maximum: observed?.maximum ?? 0 };
  };
  const labels = options.labels ?? {};
  const channels: PlanChannel[] = [];
  const controls: PlanControl[] = [];
  for (const column of predictorColumns(specification)) {
    const observed = range(column);
    if (controlColumns.has(column)) {
      const indicator = observed.minimum === 0 && observed.maximum === 1;
      controls.push({ name: column, label: columnLabel(column, labels), kind: indicator ? "count" : "level", observed });
    } else {
      channels.push({ name: column, label: columnLabel(column, labels), observed });
    }
  }
  return {
    outcome: { name: specification.outcome, label: columnLabel(specification.outcome, labels), unit: options.outcomeUnit ?? null },
    channels,
    controls,
    periodNoun: options.periodNoun ?? "week",
  };
}

/** "week" → "weeks"; one period keeps the singular. */
export function periodsWord(count: number, noun: string): string {
  return `${count} ${count === 1 ? noun : `${noun}s`}`;
}

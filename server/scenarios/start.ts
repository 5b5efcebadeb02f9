import "server-only";
import { amountToCents, centsToAmount } from "@/server/planning/allocation";
import type { CachedFit } from "@/server/predict/fit-cache";
import { periodsWord } from "@/server/predict/plan-shape";
import { readRecentHistory } from "./history";

/** Periods in a quarter of a year, by the fit's period: the default horizon. */
const quarterIn: Record<string, number> = { day: 91, week: 13, month: 3, quarter: 1, year: 1 };

/**
 * Default horizon: a quarter of a year in the fit's periods (13 weeks, 3 months, 91 days), never
 * more than the periods the fit was estimated on; a quarter of the fit's periods when the period
 * length is unknown.
 */
export function defaultHorizon(periodNoun: string, observationCount: number): number {
  const quarter = quarterIn[periodNoun] ?? Math.round(observationCount / 4);
  return Math.max(1, Math.min(quarter, observationCount));
}

export interface StartingPlan {
  horizon: number;
  /** Channel → cents for the horizon. */
  allocationCents: Record<string, number>;
  controls: Record<string, number>;
  description: string;
}

/**
 * The plan a new scenario starts from: the spend of the most recent `horizon` periods of the fit's
 * history per channel (scaled up when the history is shorter), its controls (promotion weeks in
 * those periods; average level), rounded to whole cents. When the history cannot be read (rows
 * removed), each channel's midpoint of its observed range × horizon.
 */
export async function startingPlanFromHistory(fit: CachedFit, horizon: number): Promise<StartingPlan> {
  const shape = fit.shape;
  const recent = await readRecentHistory(fit.datasetId, shape, horizon);
  if (recent) {
    const scale = horizon / recent.periods;
    const allocationCents = Object.fromEntries(shape.channels.map((channel) => [channel.name, amountToCents(recent.spend[channel.name] * scale)]));
    const controls = Object.fromEntries(
      shape.controls.map((control) => [
        control.name,
        control.kind === "count" ? Math.min(horizon, Math.round(recent.controls[control.name] * scale)) : recent.controls[control.name],
      ]),
    );
    const span = recent.firstPeriod && recent.lastPeriod ? ` (${recent.firstPeriod} to ${recent.lastPeriod})` : "";
    const description =
      recent.periods === horizon
        ? `Spend of the last ${periodsWord(horizon, shape.periodNoun)} in the history${span}`
        : `Spend of the last ${periodsWord(recent.periods, shape.periodNoun)} in the history${span}, scaled to ${periodsWord(horizon, shape.periodNoun)}`;
    return { horizon, allocationCents, controls, description };
  }
  const allocationCents = Object.fromEntries(
    shape.channels.map((channel) => [channel.name, amountToCents(((channel.observed.minimum + channel.observed.maximum) / 2) * horizon)]),
  );
  const controls = Object.fromEntries(shape.controls.map((control) => [control.name, control.kind === "count" ? 0 : control.observed.minimum]));
  return { horizon, allocationCents, controls, description: "Middle of each channel's observed range (the history rows could not be read)" };
}

/** Cents → currency amounts, for the API. */
export function centsToAmounts(cents: Readonly<Record<string, number>>): Record<string, number> {
  return Object.fromEntries(Object.entries(cents).map(([name, value]) => [name, centsToAmount(value)]));
}

/**
 * The periods of a horizon as the model sees them. Spend is the same in every period (horizon
 * amount ÷ H, `horizonToPerPeriod`); controls may differ between periods (a promotion on in 4 of
 * 13 weeks), so the horizon is a few groups of identical periods. One group covers a horizon
 * whose controls are constant, and a model without controls needs nothing else.
 */
import { centsToAmount, horizonToPerPeriod } from "@/server/planning/allocation";
import { type FitRecord, type NamedPoint, type Plan, predictorColumns } from "@/server/stats";

/**
 * `periods` periods of the horizon that share the control values in `point`. Values for spend
 * channels in `point` are ignored (the plan's amounts replace them), so the output of the scenario
 * code's period grouping can be passed as it is.
 */
export interface PeriodGroup {
  point: NamedPoint;
  periods: number;
}

/** One group covering the whole horizon with no control values (a model without controls). */
export function wholeHorizon(horizonPeriods: number): PeriodGroup[] {
  return [{ point: {}, periods: horizonPeriods }];
}

/**
 * What is wrong with the groups for this fit and horizon, in plain sentences (empty when usable):
 * periods must be whole, positive and add up to the horizon; every column the model reads that is
 * not a channel must have a finite value in every group.
 */
export function periodGroupProblems(
  record: FitRecord,
  channelNames: readonly string[],
  groups: readonly PeriodGroup[],
  horizonPeriods: number,
): { path: string; message: string }[] {
  const problems: { path: string; message: string }[] = [];
  if (!Number.isInteger(horizonPeriods) || horizonPeriods < 1) {
    return [{ path: "horizonPeriods", message: `The horizon must be a whole number of periods above 0 (got ${horizonPeriods}).` }];
  }
  let covered = 0;
  groups.forEach((group, index) => {
    if (!Number.isInteger(group.periods) || group.periods < 1) {
      problems.push({ path: `controlPeriods.${index}.periods`, message: `Each group of periods needs a whole number of periods above 0 (got ${group.periods}).` });
    } else covered += group.periods;
  });
  if (problems.length === 0 && covered !== horizonPeriods) {
    problems.push({ path: "controlPeriods", message: `The groups of periods cover ${covered} periods, but the horizon has ${horizonPeriods}.` });
  }
  const channels = new Set(channelNames);
  const controls = predictorColumns(record.specification).filter((column) => !channels.has(column));
  groups.forEach((group, index) => {
    for (const column of controls) {
      const value = Object.hasOwn(group.point, column) ? group.point[column] : undefined;
      if (typeof value !== "number" || !Number.isFinite(value)) {
        problems.push({ path: `controlPeriods.${index}.${column}`, message: `Give a value for "${column}": the fit reads it and plans hold it fixed.` });
      }
    }
  });
  return problems;
}

/**
 * Spend per period in currency units for a horizon amount in cents — the same arithmetic as the
 * scenario screen (cents → currency, then ÷ H), so a bound checked here is the bound it checks.
 */
export function perPeriodSpend(amountCents: number, horizonPeriods: number): number {
  return horizonToPerPeriod(centsToAmount(amountCents), horizonPeriods);
}

/** A group's point with the channels' per-period spend filled in. */
export function pointWithSpend(
  group: PeriodGroup,
  channelNames: readonly string[],
  amountsCents: ArrayLike<number>,
  horizonPeriods: number,
): Record<string, number> {
  const point: Record<string, number> = { ...group.point };
  channelNames.forEach((name, index) => (point[name] = perPeriodSpend(amountsCents[index], horizonPeriods)));
  return point;
}

/** The engine's plan for these amounts: one repeated point, or one point per period. Cost: O(H). */
export function enginePlan(
  groups: readonly PeriodGroup[],
  channelNames: readonly string[],
  amountsCents: ArrayLike<number>,
  horizonPeriods: number,
): Plan {
  if (groups.length === 1) return { point: pointWithSpend(groups[0], channelNames, amountsCents, horizonPeriods), periods: horizonPeriods };
  const points: NamedPoint[] = [];
  for (const group of groups) {
    const point = pointWithSpend(group, channelNames, amountsCents, horizonPeriods);
    for (let period = 0; period < group.periods; period++) points.push(point);
  }
  return { points };
}

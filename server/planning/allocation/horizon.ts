/**
 * Horizon ↔ per-period conversion.
 *
 * Planners enter spend **per horizon** (e.g. €120,000 over 13 weeks) because that is how budgets are
 * signed off. The regression model was fitted on **per-period** spend (one row per week), so before a
 * prediction every horizon amount is spread evenly over the horizon:
 *
 *     perPeriod = horizonAmount / horizonPeriods
 *
 * and the observed per-period range of a channel becomes a horizon range by multiplying by the
 * number of periods. Spreading evenly is an assumption of the plan, not of the data; the UI states it.
 */
import { centsToAmount } from "./money";
import type { AllocationState } from "./types";

function checkPeriods(horizonPeriods: number): void {
  if (!Number.isInteger(horizonPeriods) || horizonPeriods <= 0) {
    throw new RangeError(`The horizon must be a whole number of periods above 0 (got ${horizonPeriods})`);
  }
}

/** Per-period amount (currency units, unrounded: the model takes real numbers) for a horizon amount. */
export function horizonToPerPeriod(horizonAmount: number, horizonPeriods: number): number {
  checkPeriods(horizonPeriods);
  return horizonAmount / horizonPeriods;
}

/** Horizon amount for a per-period amount (same unit in, same unit out). */
export function perPeriodToHorizon(perPeriodAmount: number, horizonPeriods: number): number {
  checkPeriods(horizonPeriods);
  return perPeriodAmount * horizonPeriods;
}

/** Horizon cents → per-period cents, unrounded (a weekly share of €1,000 over 3 weeks is 33333.33… cents). */
export function horizonCentsToPerPeriodCents(horizonCents: number, horizonPeriods: number): number {
  return horizonToPerPeriod(horizonCents, horizonPeriods);
}

/** Per-period cents → horizon cents, rounded to a whole cent (horizon amounts are stored in cents). */
export function perPeriodCentsToHorizonCents(perPeriodCents: number, horizonPeriods: number): number {
  return Math.round(perPeriodToHorizon(perPeriodCents, horizonPeriods));
}

/** The allocation in currency units per horizon, keyed by channel name (what the API stores). */
export function allocationPerHorizon(state: AllocationState): Record<string, number> {
  const out: Record<string, number> = {};
  for (const channel of state.channels) out[channel.name] = centsToAmount(channel.amountCents);
  return out;
}

/** The allocation in currency units per period, keyed by channel name (what the model is evaluated on). */
export function allocationPerPeriod(state: AllocationState): Record<string, number> {
  const out: Record<string, number> = {};
  for (const channel of state.channels) {
    out[channel.name] = horizonToPerPeriod(centsToAmount(channel.amountCents), state.horizonPeriods);
  }
  return out;
}

/** A channel's observed range over the horizon (per-period range × periods), in cents; undefined if unknown. */
export function observedRangeForHorizon(
  observed: { minPerPeriodCents: number; maxPerPeriodCents: number } | undefined,
  horizonPeriods: number,
): { minCents: number; maxCents: number } | undefined {
  if (!observed) return undefined;
  return {
    minCents: perPeriodCentsToHorizonCents(observed.minPerPeriodCents, horizonPeriods),
    maxCents: perPeriodCentsToHorizonCents(observed.maxPerPeriodCents, horizonPeriods),
  };
}

import { plainCentsFormatter } from "./money";
import { sumCents } from "./state";
import type { AllocationState, EditOptions } from "./types";

/** One thing wrong with an allocation; `path` names the field (as in the API's error details). */
export interface AllocationProblem {
  path: string;
  message: string;
}

/** Tolerance of the fixed-total rule: the amounts must sum to the total within ±0.01. */
export const FIXED_TOTAL_TOLERANCE_CENTS = 1;

/**
 * Checks an allocation the way the server does before storing a version: whole cents, no negative
 * amounts, amounts within their floor/ceiling, floor ≤ ceiling, unique channel names, a positive whole
 * horizon; in fixed mode the amounts sum to the total (±0.01); in growing mode the total is at most the
 * ceiling. Returns every problem found (an empty list means valid).
 */
export function validateAllocation(
  state: AllocationState,
  options: EditOptions = {},
): { ok: boolean; problems: AllocationProblem[] } {
  const format = options.format ?? plainCentsFormatter;
  const problems: AllocationProblem[] = [];
  const seen = new Set<string>();

  if (!Number.isInteger(state.horizonPeriods) || state.horizonPeriods <= 0) {
    problems.push({ path: "horizonPeriods", message: "The horizon must be a whole number of periods above 0." });
  }
  for (const channel of state.channels) {
    const path = `channels.${channel.name}`;
    if (seen.has(channel.name)) problems.push({ path, message: `${channel.label} appears more than once.` });
    seen.add(channel.name);
    const amount = channel.amountCents;
    if (!Number.isInteger(amount)) {
      problems.push({ path: `${path}.amount`, message: `${channel.label}'s amount must be in whole cents.` });
      continue;
    }
    if (amount < 0) problems.push({ path: `${path}.amount`, message: `${channel.label}'s spend can't be negative (${format(amount)}).` });
    const { floorCents: floor, ceilingCents: ceiling } = channel;
    if (floor !== undefined && ceiling !== undefined && floor > ceiling) {
      problems.push({ path: `${path}.floor`, message: `${channel.label}'s floor (${format(floor)}) is above its ceiling (${format(ceiling)}).` });
    }
    if (floor !== undefined && amount < floor) {
      problems.push({ path: `${path}.amount`, message: `${channel.label} (${format(amount)}) is below its floor (${format(floor)}).` });
    }
    if (ceiling !== undefined && amount > ceiling) {
      problems.push({ path: `${path}.amount`, message: `${channel.label} (${format(amount)}) is above its ceiling (${format(ceiling)}).` });
    }
  }

  const sum = sumCents(state.channels);
  if (state.mode === "fixed" && Math.abs(sum - state.totalCents) > FIXED_TOTAL_TOLERANCE_CENTS) {
    problems.push({
      path: "total",
      message: `The channels add up to ${format(sum)}, but the fixed total is ${format(state.totalCents)}.`,
    });
  }
  if (state.mode === "growing") {
    if (sum !== state.totalCents) {
      problems.push({ path: "total", message: `The channels add up to ${format(sum)}, but the total says ${format(state.totalCents)}.` });
    }
    if (sum > state.ceilingCents) {
      problems.push({ path: "ceiling", message: `The total (${format(sum)}) is above the ceiling (${format(state.ceilingCents)}).` });
    }
  }
  return { ok: problems.length === 0, problems };
}

// With the hull constraint on (every period's leverage at most the largest in the history), the
// suggestion must be feasible and optimal. Checked on small instances whose channels moved together
// in the history (so the hull is narrow and binds) against a brute-force search: a dense grid over
// every plan the other constraints allow, each grid plan's leverage from the engine's own
// `predict` (not the optimiser's leverage code), keeping the best grid plan inside the hull. The
// suggestion must be at least as good as every feasible grid plan — the optimality check, up to
// the solver's tolerance — and itself inside the hull.
import { describe, expect, it } from "vitest";
import type { AllocationState } from "@/server/planning/allocation";
import { suggestAllocation } from "@/server/planning/suggest";
import { type FitRecord, predict } from "@/server/stats";
import { makeInstance, makePlan } from "./support/instances";

/** The suggestion may trail a feasible grid plan by this fraction of the outcome (barrier gap ~1e-10). */
const optimalityTolerance = 1e-8;
/** The engine's own margin for "above the largest training leverage". */
const leverageMargin = 1e-9;

function perPeriodPoint(state: AllocationState, amounts: number[]): Record<string, number> {
  return Object.fromEntries(state.channels.map((channel, j) => [channel.name, amounts[j] / 100 / state.horizonPeriods]));
}

/** Horizon total and leverage of a plan with constant spend (no controls): H × the period's mean. */
function evaluate(record: FitRecord, state: AllocationState, amounts: number[]) {
  const prediction = predict(record, perPeriodPoint(state, amounts));
  return { total: prediction.mean * state.horizonPeriods, leverage: prediction.leverage };
}

/** The observed range over the horizon, rounded inward to whole cents. */
function observedBounds(record: FitRecord, state: AllocationState) {
  const H = state.horizonPeriods;
  return state.channels.map((channel) => {
    const range = record.columnRanges[channel.name];
    return { low: Math.ceil(range.minimum * H * 100), high: Math.floor(range.maximum * H * 100) };
  });
}

/** Best plan on a grid over the feasible set (2 or 3 channels), or null when no grid plan is feasible. */
function bruteForce(record: FitRecord, state: AllocationState, steps: number) {
  const bounds = observedBounds(record, state);
  const n = bounds.length;
  const free = state.mode === "fixed" ? n - 1 : n;
  const budget = state.mode === "fixed" ? state.totalCents : state.ceilingCents;
  let best: { total: number; amounts: number[] } | null = null;
  const index = new Array(free).fill(0);
  for (;;) {
    const amounts = index.map((k, j) => bounds[j].low + ((bounds[j].high - bounds[j].low) * k) / steps);
    if (state.mode === "fixed") amounts.push(budget - amounts.reduce((sum, value) => sum + value, 0));
    const inside =
      amounts.every((value, j) => value >= bounds[j].low && value <= bounds[j].high) && amounts.reduce((sum, value) => sum + value, 0) <= budget;
    if (inside) {
      const { total, leverage } = evaluate(record, state, amounts);
      if (leverage <= record.maxTrainingLeverage && (!best || total > best.total)) best = { total, amounts };
    }
    let position = 0;
    while (position < free && ++index[position] > steps) index[position++] = 0;
    if (position === free) return best;
  }
}

describe("hull kept: the suggestion is inside the hull and no feasible plan beats it", () => {
  const cases = Array.from({ length: 24 }, (_, index) => ({
    index,
    kind: index % 2 === 0 ? ("linear" as const) : ("log1p" as const),
    channelCount: 2 + (index % 3 === 2 ? 1 : 0),
    mode: index % 4 < 2 ? ("fixed" as const) : ("growing" as const),
  }));
  let bindingCount = 0;

  it.each(cases)("instance $index ($kind, $channelCount channels, $mode)", ({ index, kind, channelCount, mode }) => {
    const instance = makeInstance({ kind, channelCount, seed: 9100 + index, correlated: true, noise: 300, negative: false });
    const state = makePlan(instance, { seed: 9300 + index, mode });
    const result = suggestAllocation({ record: instance.record, allocation: state });
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    const { suggestion } = result;
    const amounts = state.channels.map((channel) => suggestion.allocation[channel.name]);
    const mine = evaluate(instance.record, state, amounts);
    expect(suggestion.hull.status).toBe("kept");
    expect(mine.leverage).toBeLessThanOrEqual(instance.record.maxTrainingLeverage * (1 + leverageMargin));
    if (suggestion.hull.binding) bindingCount += 1;
    // Grid steps per free dimension: 1 → 4000, 2 → 200, 3 → 40 (tens of thousands of plans at most).
    const dimensions = channelCount - (mode === "fixed" ? 1 : 0);
    const best = bruteForce(instance.record, state, [0, 4000, 200, 40][dimensions]);
    expect(best).not.toBeNull();
    if (!best) return;
    expect(mine.total).toBeGreaterThanOrEqual(best.total - optimalityTolerance * Math.abs(best.total));
    expect(suggestion.method).toBe("exact");
  });

  it("has the hull binding in most of those instances (so the check above is not vacuous)", () => {
    expect(bindingCount).toBeGreaterThanOrEqual(cases.length / 2);
  });
});

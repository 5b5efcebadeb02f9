// With an interaction between two channels (β·A·B) the predicted outcome is not concave in spend,
// so no local method can certify the best plan: the suggestion must say so (`method: "local"`,
// with a note naming the interaction) and must never be worse than the current plan when that plan
// meets every constraint. Also checked: starting the search elsewhere cannot beat it by much — a
// dense grid over two channels with a fixed total (the same engine predictions) finds nothing
// better than the suggestion beyond the solver's tolerance on these small instances.
import { describe, expect, it } from "vitest";
import { enginePlan, suggestAllocation } from "@/server/planning/suggest";
import { predictTotal } from "@/server/stats";
import { makeInstance, makePlan } from "./support/instances";

const noWorseTolerance = 1e-9;

describe("interaction fits: a labelled local optimum, never worse than the current plan", () => {
  const cases = Array.from({ length: 12 }, (_, index) => ({
    index,
    channelCount: 2 + (index % 3),
    mode: index % 2 === 0 ? ("fixed" as const) : ("growing" as const),
    keepInsideHull: index % 4 < 2,
  }));

  it.each(cases)("instance $index ($channelCount channels, $mode, hull $keepInsideHull)", ({ index, channelCount, mode, keepInsideHull }) => {
    const instance = makeInstance({ kind: "interaction", channelCount, seed: 4400 + index });
    const state = makePlan(instance, { seed: 4600 + index, mode, bounds: true });
    const result = suggestAllocation({ record: instance.record, allocation: state, keepInsideHull });
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    const { suggestion } = result;
    expect(suggestion.method).toBe("local");
    expect(suggestion.solver).toBe("multi-start-barrier");
    expect(suggestion.notes.join(" ")).toMatch(/CH0 × CH1 interaction.*local searches, not a guaranteed best plan/);
    const currentInsideHull = !keepInsideHull || predictTotal(instance.record, enginePlan([{ point: {}, periods: 13 }], instance.channels, state.channels.map((c) => c.amountCents), 13)).extrapolation.every((r) => !r.hiddenExtrapolation);
    if (currentInsideHull) expect(suggestion.predicted.mean).toBeGreaterThanOrEqual(suggestion.current.mean * (1 - noWorseTolerance));
  });

  it("finds the best plan a dense grid finds on two channels with a fixed total", () => {
    for (let index = 0; index < 6; index++) {
      const instance = makeInstance({ kind: "interaction", channelCount: 2, seed: 4800 + index });
      const state = makePlan(instance, { seed: 4900 + index, mode: "fixed" });
      const result = suggestAllocation({ record: instance.record, allocation: state, keepInsideHull: false });
      if (!result.ok) throw new Error("no suggestion");
      const H = state.horizonPeriods;
      const [first, second] = instance.channels.map((name) => instance.record.columnRanges[name]);
      const low = Math.max(Math.ceil(first.minimum * H * 100), state.totalCents - Math.floor(second.maximum * H * 100));
      const high = Math.min(Math.floor(first.maximum * H * 100), state.totalCents - Math.ceil(second.minimum * H * 100));
      let best = -Infinity;
      for (let k = 0; k <= 4000; k++) {
        const amount = Math.round(low + ((high - low) * k) / 4000);
        const plan = enginePlan([{ point: {}, periods: H }], instance.channels, [amount, state.totalCents - amount], H);
        best = Math.max(best, predictTotal(instance.record, plan).total);
      }
      expect(result.suggestion.predicted.mean).toBeGreaterThanOrEqual(best - noWorseTolerance * Math.abs(best));
    }
  });
});

// For a concave outcome (log(1 + spend) with positive coefficients, linear channels, controls), the
// suggestion must satisfy the Karush–Kuhn–Tucker conditions of
//     max F(A)  subject to  low ≤ A ≤ high,  Σ A = T (fixed)  or  Σ A ≤ C (growing):
// one price λ with ∂F/∂Aⱼ = λ for channels strictly inside their bounds, ≤ λ at the low end, ≥ λ
// at the high end; for a growing total λ ≥ 0, and λ = 0 when the ceiling is not reached
// (Boyd & Vandenberghe, Convex Optimization, §5.5.3). For a concave problem these conditions are
// sufficient, so passing them proves the optimum. The slopes ∂F/∂Aⱼ are taken here by central
// differences of the engine's `predictTotal`, independent of the optimiser's derivative code.
import { describe, expect, it } from "vitest";
import { type PeriodGroup, enginePlan, suggestAllocation } from "@/server/planning/suggest";
import { predictTotal } from "@/server/stats";
import { controlGroups, makeInstance, makePlan } from "./support/instances";

/** Marginals agree within this fraction of the largest |marginal| (rounding to cents moves them ~1e-8). */
const marginalTolerance = 1e-6;
/** Central-difference step, cents: F is smooth, the truncation error is ~F‴h². */
const differenceStep = 500;

describe("concave fits: the suggestion meets the KKT conditions", () => {
  const cases = Array.from({ length: 40 }, (_, index) => ({
    index,
    channelCount: 2 + (index % 5),
    mode: index % 2 === 0 ? ("fixed" as const) : ("growing" as const),
    kind: index % 3 === 2 ? ("mixed-control" as const) : ("log1p" as const),
  }));

  it.each(cases)("instance $index ($kind, $channelCount channels, $mode)", ({ index, channelCount, mode, kind }) => {
    const instance = makeInstance({ kind, channelCount, seed: 7000 + index, noise: 200, negative: false });
    const state = makePlan(instance, { seed: 8000 + index, mode, locks: index % 4 === 0, bounds: true });
    const H = state.horizonPeriods;
    const groups: PeriodGroup[] = kind === "mixed-control" ? controlGroups(H, index % 5) : [{ point: {}, periods: H }];
    // Half the instances drop the observed-range bounds, so more channels end strictly inside.
    const keepInsideObservedRange = index % 4 < 2;
    const result = suggestAllocation({ record: instance.record, allocation: state, controlPeriods: groups, keepInsideHull: false, keepInsideObservedRange });
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    const { suggestion } = result;
    // Every log1p coefficient came out positive (the instance is concave), so the method is exact.
    const logCoefficients = instance.record.estimableTerms.flatMap((term, position) => (term.startsWith("log1p") ? [instance.record.coefficients[position]] : []));
    expect(logCoefficients.every((value) => value > 0)).toBe(true);
    expect(suggestion.method).toBe("exact");
    expect(suggestion.solver === "water-filling" || suggestion.solver === "none").toBe(true);

    const names = state.channels.map((channel) => channel.name);
    const amounts = names.map((name) => suggestion.allocation[name]);
    const total = (values: number[]) => predictTotal(instance.record, enginePlan(groups, names, values, H)).total;
    const marginals = amounts.map((_, j) => {
      const up = amounts.map((value, k) => (k === j ? value + differenceStep : value));
      const down = amounts.map((value, k) => (k === j ? value - differenceStep : value));
      return (total(up) - total(down)) / (2 * differenceStep);
    });
    const bound = suggestion.binding;
    const atLow = (j: number) => bound.some((b) => b.channel === names[j] && ["floor", "observed-min", "zero"].includes(b.kind));
    const atHigh = (j: number) => bound.some((b) => b.channel === names[j] && ["ceiling", "observed-max"].includes(b.kind));
    const scale = Math.max(...marginals.map(Math.abs));
    const tolerance = marginalTolerance * scale;
    const movable = names.map((_, j) => !state.channels[j].locked);
    const interior = names.map((_, j) => movable[j] && !atLow(j) && !atHigh(j));
    // The price: the interior marginals' common value, else any value between the bound channels'.
    const interiorMarginals = marginals.filter((_, j) => interior[j]);
    const lowSide = Math.max(-Infinity, ...marginals.filter((_, j) => movable[j] && atLow(j)));
    const highSide = Math.min(Infinity, ...marginals.filter((_, j) => movable[j] && atHigh(j)));
    let price = interiorMarginals.length > 0 ? interiorMarginals[0] : Number.isFinite(lowSide) ? lowSide : highSide;
    const ceilingSlack = mode === "growing" && suggestion.totalCents < state.ceilingCents;
    if (ceilingSlack) price = 0;
    if (mode === "growing") expect(price).toBeGreaterThanOrEqual(-tolerance);
    for (const value of interiorMarginals) expect(Math.abs(value - price)).toBeLessThanOrEqual(tolerance);
    expect(lowSide).toBeLessThanOrEqual(price + tolerance);
    expect(highSide).toBeGreaterThanOrEqual(price - tolerance);
  });
});

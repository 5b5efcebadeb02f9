// Every suggestion satisfies every constraint, exactly, in whole cents: property tests with
// fast-check over fit shapes (linear, log(1 + spend), channel × channel interactions, controls
// with spend × control interactions), modes, horizons, locks, floors and ceilings, the observed
// range and hull switches. The observed range and the hull are checked with the engine's own
// extrapolation report, and the draft with the allocation module's own validation.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { validateAllocation } from "@/server/planning/allocation";
import { applySuggestion, enginePlan, suggestAllocation, suggestionCaution } from "@/server/planning/suggest";
import { predictTotal } from "@/server/stats";
import { controlGroups, makeInstance, makePlan } from "./support/instances";

/** A suggestion may trail a current plan that meets every constraint by no more than rounding. */
const noWorseTolerance = 1e-9;

const scenario = fc.record({
  seed: fc.integer({ min: 1, max: 1_000_000 }),
  kind: fc.constantFrom("linear" as const, "log1p" as const, "interaction" as const, "mixed-control" as const),
  channelCount: fc.integer({ min: 1, max: 5 }),
  mode: fc.constantFrom("fixed" as const, "growing" as const),
  horizonPeriods: fc.constantFrom(4, 13, 26),
  promoShare: fc.double({ min: 0, max: 1, noNaN: true }),
  locks: fc.boolean(),
  bounds: fc.boolean(),
  keepInsideObservedRange: fc.boolean(),
  keepInsideHull: fc.boolean(),
  correlated: fc.boolean(),
});

describe("every suggestion satisfies every constraint", () => {
  it("holds for random fits, plans and switches", () => {
    fc.assert(
      fc.property(scenario, (s) => {
        const channelCount = s.kind === "interaction" ? Math.max(2, s.channelCount) : s.channelCount;
        const instance = makeInstance({ kind: s.kind, channelCount, seed: s.seed, correlated: s.correlated, concave: s.seed % 3 !== 0 });
        const state = makePlan(instance, { seed: s.seed + 1, mode: s.mode, horizonPeriods: s.horizonPeriods, locks: s.locks, bounds: s.bounds });
        const H = state.horizonPeriods;
        const groups = s.kind === "mixed-control" ? controlGroups(H, Math.round(s.promoShare * H)) : [{ point: {}, periods: H }];
        const result = suggestAllocation({
          record: instance.record,
          allocation: state,
          controlPeriods: groups,
          keepInsideObservedRange: s.keepInsideObservedRange,
          keepInsideHull: s.keepInsideHull,
        });
        // The current plan meets every constraint but the hull, so a suggestion always exists.
        expect(result.ok).toBe(true);
        if (!result.ok) return;
        const { suggestion } = result;
        const names = state.channels.map((channel) => channel.name);
        const amounts = names.map((name) => suggestion.allocation[name]);
        const sum = amounts.reduce((total, value) => total + value, 0);

        expect(amounts.every((value) => Number.isInteger(value) && value >= 0)).toBe(true);
        expect(suggestion.totalCents).toBe(sum);
        if (s.mode === "fixed") expect(sum).toBe(state.totalCents);
        else expect(sum).toBeLessThanOrEqual(state.ceilingCents);
        state.channels.forEach((channel, j) => {
          if (channel.locked) expect(amounts[j]).toBe(channel.amountCents);
          if (channel.floorCents !== undefined && !channel.locked) expect(amounts[j]).toBeGreaterThanOrEqual(channel.floorCents);
          if (channel.ceilingCents !== undefined && !channel.locked) expect(amounts[j]).toBeLessThanOrEqual(channel.ceilingCents);
        });

        const reports = predictTotal(instance.record, enginePlan(groups, names, amounts, H)).extrapolation;
        if (s.keepInsideObservedRange) {
          const movedOut = reports.flatMap((report) => report.columns).filter((excursion) => {
            const j = names.indexOf(excursion.name);
            return j >= 0 && !state.channels[j].locked;
          });
          expect(movedOut).toEqual([]);
        }
        if (s.keepInsideHull && suggestion.hull.status === "kept") {
          expect(reports.some((report) => report.hiddenExtrapolation)).toBe(false);
        }
        if (!s.keepInsideHull) expect(suggestion.hull.status).toBe("off");

        // Not worse than the current plan whenever the current plan itself meets every constraint.
        const currentReports = predictTotal(instance.record, enginePlan(groups, names, state.channels.map((c) => c.amountCents), H)).extrapolation;
        const currentInside =
          (!s.keepInsideHull || suggestion.hull.status !== "kept" || !currentReports.some((report) => report.hiddenExtrapolation)) &&
          (!s.keepInsideObservedRange || currentReports.every((report) => report.columns.every((excursion) => !names.includes(excursion.name))));
        if (currentInside) {
          expect(suggestion.predicted.mean).toBeGreaterThanOrEqual(suggestion.current.mean - noWorseTolerance * Math.abs(suggestion.current.mean));
        }
        expect(suggestion.gain.mean).toBeCloseTo(suggestion.predicted.mean - suggestion.current.mean, 4);
        expect(suggestion.gain.confidence[0]).toBeLessThanOrEqual(suggestion.gain.mean);
        expect(suggestion.gain.confidence[1]).toBeGreaterThanOrEqual(suggestion.gain.mean);
        expect(suggestion.caution).toBe(suggestionCaution);
        // Two interacting channels that both move make the outcome non-concave: labelled local.
        const bothMove = state.channels.length >= 2 && !state.channels[0].locked && !state.channels[1].locked;
        if (s.kind === "interaction" && bothMove && suggestion.solver !== "none") expect(suggestion.method).toBe("local");

        const draft = applySuggestion(state, suggestion);
        expect(validateAllocation(draft).problems).toEqual([]);
      }),
      { numRuns: 80, seed: 20240611 },
    );
  });
});

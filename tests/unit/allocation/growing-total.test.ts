import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  adjustGrowingTotal,
  centsFormatter,
  createAllocationState,
  growthOf,
  headroomCents,
  lowOf,
  setCeiling,
  setGrowth,
  type AllocationChannel,
  type AllocationState,
} from "@/server/planning/allocation";
import { brokenInvariant, moveArb, stateArb } from "./arbitraries";

const eur = centsFormatter({ currency: "EUR", locale: "en-IE" });
const ch = (name: string, amountCents: number, extra: Partial<AllocationChannel> = {}): AllocationChannel => ({
  name,
  label: name[0].toUpperCase() + name.slice(1),
  amountCents,
  locked: false,
  ...extra,
});
const amounts = (state: AllocationState) => state.channels.map((c) => c.amountCents);

// Base 100,000.00 with a ceiling 10% higher.
const start = createAllocationState({
  mode: "growing",
  horizonPeriods: 13,
  growth: 0.1,
  channels: [ch("search", 6_000_000), ch("video", 3_000_000), ch("radio", 1_000_000)],
});

describe("adjustGrowingTotal", () => {
  it("sets the ceiling to base × (1 + growth)", () => {
    expect(start.baseTotalCents).toBe(10_000_000);
    expect(start.ceilingCents).toBe(11_000_000);
    expect(headroomCents(start)).toBe(1_000_000);
    expect(growthOf(start)).toBeCloseTo(0.1, 12);
  });

  it("uses the headroom first: others unchanged, the total rises", () => {
    const { state, reason } = adjustGrowingTotal(start, "search", 6_600_000);
    expect(reason).toBeUndefined();
    expect(amounts(state)).toEqual([6_600_000, 3_000_000, 1_000_000]);
    expect(state.totalCents).toBe(10_600_000);
  });

  it("past the headroom, takes from the unlocked others in proportion", () => {
    const { state } = adjustGrowingTotal(start, "search", 8_000_000);
    // 1,000,000 from headroom, 1,000,000 from video and radio in the ratio 3:1.
    expect(amounts(state)).toEqual([8_000_000, 2_250_000, 750_000]);
    expect(state.totalCents).toBe(11_000_000);
  });

  it("moving down lowers the total and nobody else rises", () => {
    const { state } = adjustGrowingTotal(start, "video", 1_000_000);
    expect(amounts(state)).toEqual([6_000_000, 1_000_000, 1_000_000]);
    expect(state.totalCents).toBe(8_000_000);
    expect(state.ceilingCents).toBe(11_000_000);
  });

  it("stops at the ceiling when the others are exhausted, and says why", () => {
    const tight = createAllocationState({
      mode: "growing",
      horizonPeriods: 13,
      growth: 0.1,
      channels: [ch("search", 6_000_000), ch("video", 3_000_000, { floorCents: 2_500_000 }), ch("radio", 1_000_000, { locked: true })],
    });
    const { state, reason } = adjustGrowingTotal(tight, "search", 9_000_000, { format: eur });
    expect(amounts(state)).toEqual([7_500_000, 2_500_000, 1_000_000]);
    expect(state.totalCents).toBe(11_000_000);
    expect(reason?.kind).toBe("total-ceiling");
    expect(reason?.message).toBe(
      "Only €15,000 more can go to Search: the total is at its ceiling (€110,000), Video is at its floor, Radio is locked.",
    );
  });

  it("keeps the invariants and the headroom rules over random moves", () => {
    fc.assert(
      fc.property(
        stateArb({ mode: "growing" }).chain((s) => fc.tuple(fc.constant(s), fc.array(moveArb(s), { minLength: 1, maxLength: 40 }))),
        ([initial, moves]) => {
          let state = initial;
          for (const { index, requested } of moves) {
            const before = state;
            const name = state.channels[index].name;
            state = adjustGrowingTotal(state, name, requested).state;
            expect(brokenInvariant(state)).toBeNull();
            expect(state.ceilingCents).toBe(initial.ceilingCents);
            const rise = state.channels[index].amountCents - before.channels[index].amountCents;
            state.channels.forEach((c, i) => {
              if (i === index) return;
              const change = c.amountCents - before.channels[i].amountCents;
              expect(change).toBeLessThanOrEqual(0); // nobody else ever rises
              if (c.locked) expect(change).toBe(0);
              // Others only give once the headroom is used up.
              if (change < 0) expect(state.totalCents).toBe(state.ceilingCents);
            });
            if (rise <= 0) expect(state.totalCents).toBe(before.totalCents + rise);
            else expect(state.totalCents).toBe(before.totalCents + Math.min(rise, headroomCents(before)));
          }
        },
      ),
      { numRuns: 300 },
    );
  });

  it("a clamped rise leaves no headroom and every unlocked other at its floor", () => {
    fc.assert(
      fc.property(stateArb({ mode: "growing", minChannels: 2 }).chain((s) => fc.tuple(fc.constant(s), moveArb(s))), ([state, move]) => {
        const name = state.channels[move.index].name;
        const { state: next, reason } = adjustGrowingTotal(state, name, move.requested);
        if (reason?.kind !== "total-ceiling") return;
        expect(next.totalCents).toBe(next.ceilingCents);
        next.channels.forEach((c, i) => {
          if (i !== move.index && !c.locked) expect(c.amountCents).toBe(lowOf(c));
        });
      }),
      { numRuns: 1000 },
    );
  });
});

describe("ceiling and growth", () => {
  it("sets the ceiling directly or as growth over the base", () => {
    expect(setCeiling(start, 12_000_000).state.ceilingCents).toBe(12_000_000);
    expect(setGrowth(start, 0.25).state.ceilingCents).toBe(12_500_000);
  });

  it("never puts the ceiling below the current total", () => {
    const { state, reason } = setCeiling(start, 9_000_000, { format: eur });
    expect(state.ceilingCents).toBe(10_000_000);
    expect(reason?.message).toBe("The ceiling can't be below the current total (€100,000); lower a channel first.");
  });
});

import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  centsFormatter,
  createAllocationState,
  highOf,
  lowOf,
  rebalanceFixedTotal,
  validateAllocation,
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

describe("rebalanceFixedTotal — examples", () => {
  const start = createAllocationState({
    horizonPeriods: 13,
    channels: [ch("search", 6_000_000), ch("video", 3_000_000), ch("radio", 1_000_000)],
  });

  it("moves the others in proportion to their amounts and keeps the total", () => {
    const { state, reason } = rebalanceFixedTotal(start, "search", 7_200_000);
    expect(reason).toBeUndefined();
    // The others give 1,200,000 in the ratio 3:1.
    expect(amounts(state)).toEqual([7_200_000, 2_100_000, 700_000]);
    expect(state.totalCents).toBe(10_000_000);
  });

  it("rounds to the cent by largest remainder", () => {
    const thirds = createAllocationState({ horizonPeriods: 1, channels: [ch("a", 0), ch("b", 100), ch("c", 100), ch("d", 100)] });
    const { state } = rebalanceFixedTotal(thirds, "a", 100);
    // Each gives 33⅓ cents: 33 each, and the one leftover cent goes to the first on a tie.
    expect(amounts(state)).toEqual([100, 66, 67, 67]);
  });

  it("splits equally when every other channel is at zero", () => {
    const zeros = createAllocationState({ horizonPeriods: 1, channels: [ch("a", 900), ch("b", 0), ch("c", 0), ch("d", 0)] });
    expect(amounts(rebalanceFixedTotal(zeros, "a", 0).state)).toEqual([0, 300, 300, 300]);
  });

  it("never moves a locked channel and refuses to move it", () => {
    const locked = { ...start, channels: start.channels.map((c) => (c.name === "radio" ? { ...c, locked: true } : c)) };
    expect(amounts(rebalanceFixedTotal(locked, "search", 6_600_000).state)).toEqual([6_600_000, 2_400_000, 1_000_000]);
    const refused = rebalanceFixedTotal(locked, "radio", 0);
    expect(refused.state).toBe(locked);
    expect(refused.reason?.kind).toBe("channel-locked");
  });

  it("fixes channels that hit a floor and spreads the rest over the others", () => {
    const floored = createAllocationState({
      horizonPeriods: 13,
      channels: [ch("search", 4_000_000), ch("video", 3_000_000, { floorCents: 2_900_000 }), ch("podcast", 3_000_000)],
    });
    const { state, reason } = rebalanceFixedTotal(floored, "search", 5_000_000);
    expect(reason).toBeUndefined();
    // Video would give 500,000 but only has 100,000 above its floor; podcast gives the other 900,000.
    expect(amounts(state)).toEqual([5_000_000, 2_900_000, 2_100_000]);
  });

  it("stops at the feasible extreme and says why", () => {
    const tight = createAllocationState({
      horizonPeriods: 13,
      channels: [
        ch("podcast", 1_000_000),
        ch("search", 5_000_000, { floorCents: 4_000_000 }),
        ch("video", 3_000_000, { floorCents: 2_880_000 }),
        ch("radio", 1_000_000, { locked: true }),
      ],
    });
    const first = rebalanceFixedTotal(tight, "podcast", 9_000_000, { format: eur });
    expect(amounts(first.state)).toEqual([2_120_000, 4_000_000, 2_880_000, 1_000_000]);
    expect(first.reason?.kind).toBe("others-exhausted");
    expect(first.reason?.message).toBe("Only €11,200 can move: Search and Video are at their floors, Radio is locked.");
    const again = rebalanceFixedTotal(first.state, "podcast", 9_500_000, { format: eur });
    expect(again.state).toBe(first.state);
    expect(again.reason?.message).toBe("Podcast can't go higher than €21,200: Search and Video are at their floors, Radio is locked.");
  });

  it("stops when lowering a channel would push the others past their ceilings", () => {
    const capped = createAllocationState({
      horizonPeriods: 1,
      channels: [ch("a", 1000), ch("b", 500, { ceilingCents: 600 }), ch("c", 0, { ceilingCents: 50 })],
    });
    const { state, reason } = rebalanceFixedTotal(capped, "a", 0, { format: eur });
    expect(amounts(state)).toEqual([850, 600, 50]);
    expect(reason?.message).toBe("Only €1.50 can move: B and C are at their ceilings.");
  });

  it("clamps to the channel's own bounds and to zero", () => {
    const own = createAllocationState({ horizonPeriods: 1, channels: [ch("a", 500, { ceilingCents: 700 }), ch("b", 500)] });
    expect(rebalanceFixedTotal(own, "a", 900, { format: eur }).reason?.message).toBe("A can't go above its ceiling (€7).");
    expect(amounts(rebalanceFixedTotal(own, "a", -5).state)).toEqual([0, 1000]);
    expect(rebalanceFixedTotal(own, "a", -5).reason?.kind).toBe("negative");
  });

  it("returns the same object when nothing changes and reports unknown channels", () => {
    expect(rebalanceFixedTotal(start, "search", 6_000_000).state).toBe(start);
    expect(rebalanceFixedTotal(start, "nope", 1).reason?.kind).toBe("invalid");
  });

  it("stays exact with amounts far beyond 2^53 / 100 products", () => {
    const big = createAllocationState({
      horizonPeriods: 52,
      channels: [ch("a", 3_333_333_333_333), ch("b", 2_222_222_222_221), ch("c", 1_111_111_111_117)],
    });
    const { state } = rebalanceFixedTotal(big, "a", 7);
    expect(state.totalCents).toBe(big.totalCents);
    expect(amounts(state).reduce((a, b) => a + b)).toBe(big.totalCents);
  });
});

describe("rebalanceFixedTotal — properties", () => {
  it("keeps the total exact, bounds and locks, over thousands of random moves", () => {
    fc.assert(
      fc.property(
        stateArb({ minChannels: 2 }).chain((state) => fc.tuple(fc.constant(state), fc.array(moveArb(state), { minLength: 1, maxLength: 60 }))),
        ([start, moves]) => {
          let state = start;
          for (const { index, requested } of moves) {
            const before = state;
            const name = state.channels[index].name;
            state = rebalanceFixedTotal(state, name, requested).state;
            expect(brokenInvariant(state)).toBeNull();
            expect(state.totalCents).toBe(start.totalCents);
            state.channels.forEach((channel, i) => {
              if (channel.locked) expect(channel.amountCents).toBe(before.channels[i].amountCents);
            });
          }
          expect(validateAllocation(state).ok).toBe(true);
        },
      ),
      { numRuns: 300 },
    );
  });

  it("moves the unbounded others in proportion to their amounts, within a cent", () => {
    fc.assert(
      fc.property(
        stateArb({ bounds: false, minChannels: 2 }).chain((s) => fc.tuple(fc.constant(s), moveArb(s))),
        ([state, { index, requested }]) => {
          const moved = state.channels[index];
          const result = rebalanceFixedTotal(state, moved.name, requested);
          if (moved.locked || result.reason) return;
          const others = state.channels.map((c, i) => ({ c, i })).filter(({ c, i }) => i !== index && !c.locked);
          const delta = moved.amountCents - result.state.channels[index].amountCents;
          const weight = others.reduce((sum, { c }) => sum + c.amountCents, 0);
          for (const { c, i } of others) {
            const exact = weight > 0 ? (delta * c.amountCents) / weight : delta / others.length;
            const change = result.state.channels[i].amountCents - c.amountCents;
            expect(Math.abs(change - exact)).toBeLessThan(1 + 1e-6 * Math.abs(exact));
          }
        },
      ),
      { numRuns: 2000 },
    );
  });

  it("with bounds, free channels share the move at one rate and bounded ones got no more than that", () => {
    // Each free channel ends within a cent of rate × amount, so it pins the one rate to the interval
    // ((change − 1) / amount, (change + 1) / amount). All free channels' intervals must overlap, and
    // no bounded channel may have moved more than the largest rate they allow (plus its cent).
    // A tiny free channel pins the rate only loosely: with one of 3 cents beside one of 672 million
    // at its ceiling, 0 cents of change says little about the rate (a case found by this property).
    const check = (state: AllocationState, index: number, requested: number) => {
      const result = rebalanceFixedTotal(state, state.channels[index].name, requested);
      const changes = state.channels
        .map((c, i) => ({ c, i, change: result.state.channels[i].amountCents - c.amountCents, now: result.state.channels[i].amountCents }))
        .filter(({ c, i }) => i !== index && !c.locked);
      const free = changes.filter(({ c, now }) => now > lowOf(c) && now < highOf(c) && c.amountCents > 0);
      if (free.length === 0) return;
      const slack = 1e-12;
      const rateLow = Math.max(...free.map(({ c, change }) => (change - 1) / c.amountCents)) - slack;
      const rateHigh = Math.min(...free.map(({ c, change }) => (change + 1) / c.amountCents)) + slack;
      expect(rateLow).toBeLessThanOrEqual(rateHigh);
      const largestRate = Math.max(Math.abs(rateLow), Math.abs(rateHigh));
      for (const entry of changes) {
        expect(Math.abs(entry.change)).toBeLessThanOrEqual(largestRate * entry.c.amountCents + 1 + 1e-9 * entry.c.amountCents);
      }
    };

    const found = createAllocationState({
      horizonPeriods: 13,
      channels: [
        ch("search", 702, { floorCents: 0, ceilingCents: 3_624_581_380 }),
        ch("social", 0, { floorCents: 0, ceilingCents: 21 }),
        ch("video", 0),
        ch("radio", 3, { floorCents: 0, ceilingCents: 436_638_783 }),
        ch("podcast", 672_278_848, { floorCents: 0, ceilingCents: 672_278_856 }),
        ch("tv", 0, { locked: true, floorCents: 0, ceilingCents: 159_955_980 }),
      ],
    });
    check(found, 0, 694);
    // There the 8 cents all go to Podcast (its exact share is 7.99999996), Radio's share rounds to 0.
    expect(amounts(rebalanceFixedTotal(found, "search", 694).state)).toEqual([694, 0, 0, 3, 672_278_856, 0]);

    fc.assert(
      fc.property(stateArb({ minChannels: 3 }).chain((s) => fc.tuple(fc.constant(s), moveArb(s))), ([state, { index, requested }]) =>
        check(state, index, requested),
      ),
      { numRuns: 2000 },
    );
  });

  it("clamps only when the others are exhausted, and then says so", () => {
    fc.assert(
      fc.property(
        stateArb({ minChannels: 1 }).chain((s) => fc.tuple(fc.constant(s), moveArb(s))),
        ([state, { index, requested }]) => {
          const moved = state.channels[index];
          const { state: next, reason } = rebalanceFixedTotal(state, moved.name, requested);
          const wanted = Math.min(highOf(moved), Math.max(lowOf(moved), requested));
          const got = next.channels[index].amountCents;
          if (moved.locked) {
            expect(next).toBe(state);
            expect(reason?.kind).toBe("channel-locked");
            return;
          }
          if (got !== wanted) {
            expect(reason?.kind).toBe("others-exhausted");
            expect(reason?.message).toMatch(/^(Only .* can move|.* can't go (higher|lower) than .*): /);
            // Every unlocked other sits at the bound in the direction it had to move.
            const othersGave = wanted > moved.amountCents;
            next.channels.forEach((c, i) => {
              if (i === index || c.locked) return;
              expect(c.amountCents).toBe(othersGave ? lowOf(c) : highOf(c));
            });
          } else if (reason) {
            expect(["own-floor", "own-ceiling", "negative"]).toContain(reason.kind);
          }
        },
      ),
      { numRuns: 2000 },
    );
  });
});

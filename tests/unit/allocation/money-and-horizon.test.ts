import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  allocationPerHorizon,
  allocationPerPeriod,
  amountToCents,
  centsToAmount,
  createAllocationState,
  distributeProportionally,
  formatCents,
  formatCentsCompact,
  horizonToPerPeriod,
  observedPosition,
  observedRangeForHorizon,
  perPeriodToHorizon,
} from "@/server/planning/allocation";

describe("money", () => {
  it("converts amounts to cents without float drift", () => {
    expect(amountToCents(1.005)).toBe(101);
    expect(amountToCents(12500.5)).toBe(1_250_050);
    expect(amountToCents(0.1 + 0.2)).toBe(30);
    expect(amountToCents(-2.675)).toBe(-268);
    expect(centsToAmount(1_250_050)).toBe(12500.5);
    fc.assert(fc.property(fc.integer({ min: -1e13, max: 1e13 }), (cents) => {
        expect(amountToCents(centsToAmount(cents))).toBe(cents);
      }),
    );
  });

  it("formats with the workspace currency and locale", () => {
    const eur = { currency: "EUR", locale: "en-IE" };
    expect(formatCents(1_250_000, eur)).toBe("€12,500");
    expect(formatCents(1_250_050, eur)).toBe("€12,500.50");
    expect(formatCents(1_250_050, { currency: "EUR", locale: "de-DE" })).toBe("12.500,50\u00a0€");
    expect(formatCentsCompact(4_100_000, eur)).toBe("€41K");
  });
});

describe("distributeProportionally", () => {
  it("refuses more than the slots can take", () => {
    expect(() => distributeProportionally([{ amountCents: 5, lowCents: 0, highCents: 10 }], -6)).toThrow(RangeError);
  });

  it("moves exactly the delta, within bounds", () => {
    fc.assert(
      fc.property(
        fc.array(
          fc.record({ amountCents: fc.integer({ min: 0, max: 1e9 }), lo: fc.integer({ min: 0, max: 1e9 }), hi: fc.option(fc.integer({ min: 0, max: 1e9 })) }),
          { minLength: 1, maxLength: 10 },
        ),
        fc.double({ min: -1, max: 1, noNaN: true }),
        (raw, share) => {
          const slots = raw.map(({ amountCents, lo, hi }) => ({
            amountCents,
            lowCents: Math.min(lo, amountCents),
            highCents: hi === null ? Infinity : amountCents + hi,
          }));
          const room = share < 0 ? slots.reduce((s, x) => s + x.amountCents - x.lowCents, 0) : slots.reduce((s, x) => s + x.highCents - x.amountCents, 0);
          const delta = Math.trunc(share * Math.min(room, 1e10));
          const next = distributeProportionally(slots, delta);
          expect(next.reduce((a, b) => a + b, 0)).toBe(slots.reduce((a, b) => a + b.amountCents, 0) + delta);
          next.forEach((v, i) => {
            expect(Number.isInteger(v)).toBe(true);
            expect(v).toBeGreaterThanOrEqual(slots[i].lowCents);
            expect(v).toBeLessThanOrEqual(slots[i].highCents);
          });
        },
      ),
      { numRuns: 1000 },
    );
  });
});

describe("horizon ↔ per period", () => {
  const state = createAllocationState({
    horizonPeriods: 13,
    channels: [
      { name: "search", label: "Search", amountCents: 1_300_000, locked: false },
      { name: "podcast", label: "Podcast", amountCents: 4_100_000, locked: false, observed: { minPerPeriodCents: 100_000, maxPerPeriodCents: 269_231 } },
    ],
  });

  it("divides horizon amounts by the number of periods (the model's unit)", () => {
    expect(horizonToPerPeriod(13_000, 13)).toBe(1000);
    expect(perPeriodToHorizon(1000, 13)).toBe(13_000);
    expect(allocationPerHorizon(state)).toEqual({ search: 13_000, podcast: 41_000 });
    expect(allocationPerPeriod(state)).toEqual({ search: 1000, podcast: 41_000 / 13 });
    expect(() => horizonToPerPeriod(1, 0)).toThrow(RangeError);
  });

  it("scales the observed per-period range to the horizon", () => {
    expect(observedRangeForHorizon(state.channels[1].observed, 13)).toEqual({ minCents: 1_300_000, maxCents: 3_500_003 });
  });

  it("writes the Beyond observed range sentence", () => {
    const position = observedPosition(state.channels[1], 13, { currency: "EUR", locale: "en-IE" });
    expect(position.status).toBe("above");
    expect(position.beyondCents).toBe(599_997);
    expect(position.sentence).toBe("Podcast at €41K is 17% above the most it ever had (€35K).");
    const low = { ...state.channels[1], amountCents: 650_000 };
    expect(observedPosition(low, 13, { currency: "EUR", locale: "en-IE" }).sentence).toBe(
      "Podcast at €6.5K is 50% below the least it ever had (€13K).",
    );
    expect(observedPosition({ ...low, amountCents: 0 }, 13, { currency: "EUR", locale: "en-IE" }).sentence).toBe(
      "Podcast at €0 is below the least it ever had (€13K).",
    );
    expect(observedPosition(state.channels[0], 13, { currency: "EUR", locale: "en-IE" }).status).toBe("unknown");
  });
});

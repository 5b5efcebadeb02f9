/** Shared fast-check generators and helpers for the allocation tests (not a test file itself). */
import fc from "fast-check";
import type { AllocationChannel, AllocationState } from "@/server/planning/allocation";
import { createAllocationState, highOf, lowOf, sumCents } from "@/server/planning/allocation";

const NAMES = ["search", "social", "video", "radio", "podcast", "tv", "display", "print"];

/** A channel whose current amount satisfies its own bounds (a valid starting point). */
const channelArb = (index: number, options: { bounds: boolean; locks: boolean; maxCents: number }) =>
  fc
    .record({
      amountCents: fc.oneof(fc.constant(0), fc.integer({ min: 0, max: options.maxCents }), fc.integer({ min: 0, max: 1000 })),
      locked: options.locks ? fc.integer({ min: 0, max: 3 }).map((n) => n === 0) : fc.constant(false),
      floorShare: options.bounds ? fc.option(fc.double({ min: 0, max: 1, noNaN: true }), { nil: undefined }) : fc.constant(undefined),
      ceilingExtra: options.bounds ? fc.option(fc.integer({ min: 0, max: options.maxCents }), { nil: undefined }) : fc.constant(undefined),
    })
    .map(({ amountCents, locked, floorShare, ceilingExtra }): AllocationChannel => ({
      name: NAMES[index],
      label: NAMES[index][0].toUpperCase() + NAMES[index].slice(1),
      amountCents,
      locked,
      floorCents: floorShare === undefined ? undefined : Math.floor(amountCents * floorShare),
      ceilingCents: ceilingExtra === undefined ? undefined : amountCents + ceilingExtra,
    }));

/** A valid allocation with 1–8 channels. */
export function stateArb(
  options: { bounds?: boolean; locks?: boolean; maxCents?: number; mode?: "fixed" | "growing"; minChannels?: number } = {},
): fc.Arbitrary<AllocationState> {
  const opts = { bounds: options.bounds ?? true, locks: options.locks ?? true, maxCents: options.maxCents ?? 5_000_000_000 };
  return fc
    .integer({ min: options.minChannels ?? 1, max: NAMES.length })
    .chain((count) => fc.tuple(...Array.from({ length: count }, (_, i) => channelArb(i, opts))))
    .chain((channels) =>
      fc.double({ min: 0, max: 0.5, noNaN: true }).map((growth) =>
        createAllocationState({ channels, horizonPeriods: 13, mode: options.mode ?? "fixed", growth }),
      ),
    );
}

/** Picks a channel and a requested amount around the plausible range (including negatives and overshoot). */
export function moveArb(state: AllocationState) {
  const top = Math.max(state.totalCents, state.ceilingCents) * 2 + 1000;
  return fc.record({
    index: fc.integer({ min: 0, max: state.channels.length - 1 }),
    requested: fc.oneof(fc.integer({ min: -1000, max: top }), fc.integer({ min: 0, max: 1000 })),
  });
}

/** Asserts the invariants every state must keep; returns a message or null. */
export function brokenInvariant(state: AllocationState): string | null {
  if (sumCents(state.channels) !== state.totalCents) return `sum ${sumCents(state.channels)} ≠ total ${state.totalCents}`;
  for (const channel of state.channels) {
    if (!Number.isInteger(channel.amountCents)) return `${channel.name} not whole cents`;
    if (channel.amountCents < lowOf(channel)) return `${channel.name} below floor`;
    if (channel.amountCents > highOf(channel)) return `${channel.name} above ceiling`;
  }
  if (state.mode === "growing" && state.totalCents > state.ceilingCents) return "total above ceiling";
  return null;
}

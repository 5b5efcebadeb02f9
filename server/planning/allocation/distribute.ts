/**
 * Exact proportional redistribution of cents with per-slot bounds ("water filling").
 *
 * Arithmetic is done in BigInt: `remaining × amount` can pass 2^53 for large budgets, and a float
 * there would silently lose cents.
 */

/** One participant in a redistribution. `highCents` may be Infinity (no ceiling). */
export interface Slot {
  amountCents: number;
  lowCents: number;
  highCents: number;
}

/** How many cents the slots can absorb together in one direction (+1 = rise, -1 = fall). */
export function capacity(slots: readonly Slot[], direction: 1 | -1): number {
  let total = 0;
  for (const slot of slots) {
    total += room(slot, direction);
    if (total === Infinity) return Infinity;
  }
  return total;
}

/** Room of one slot in a direction; a slot already outside its bounds is never pushed further out. */
export function room(slot: Slot, direction: 1 | -1): number {
  if (direction > 0) return Math.max(0, slot.highCents - slot.amountCents);
  return Math.max(0, slot.amountCents - slot.lowCents);
}

/**
 * Adds `deltaCents` (signed) to the slots in proportion to their current amounts, so the slots' sum
 * changes by exactly `deltaCents`. Slots that would cross a bound are fixed at it and the rest is
 * redistributed among the others, again proportionally, until nothing is left. When every remaining
 * slot is at zero (only possible when rising) the rest is split equally.
 *
 * Rounding is by largest remainder, which keeps every slot within a cent of its exact share and never
 * past its bound (a fractional share below an integer bound rounds up to at most that bound).
 *
 * @returns the new amounts, in slot order.
 * @throws RangeError if `|deltaCents|` exceeds {@link capacity}; callers clamp first.
 */
export function distributeProportionally(slots: readonly Slot[], deltaCents: number): number[] {
  if (!Number.isInteger(deltaCents)) throw new RangeError(`deltaCents must be whole cents (got ${deltaCents})`);
  const amounts = slots.map((slot) => slot.amountCents);
  if (deltaCents === 0) return amounts;
  const direction: 1 | -1 = deltaCents > 0 ? 1 : -1;
  if (Math.abs(deltaCents) > capacity(slots, direction)) {
    throw new RangeError(`Cannot move ${deltaCents} cents: the slots can take ${capacity(slots, direction)}`);
  }

  let remaining = BigInt(Math.abs(deltaCents));
  let active = slots.map((_, index) => index).filter((index) => room(slots[index], direction) > 0);

  while (remaining > 0n && active.length > 0) {
    let weights = active.map((index) => BigInt(slots[index].amountCents));
    let weightSum = weights.reduce((sum, weight) => sum + weight, 0n);
    if (weightSum === 0n) {
      weights = active.map(() => 1n);
      weightSum = BigInt(active.length);
    }

    // Anyone whose proportional share passes their room is fixed at the bound. Fixing all of them at
    // once is safe: fixing a slot below its share raises everyone else's share, so no violator recovers.
    const violators = new Set<number>();
    active.forEach((index, k) => {
      const slotRoom = room(slots[index], direction);
      if (slotRoom !== Infinity && remaining * weights[k] > BigInt(slotRoom) * weightSum) violators.add(index);
    });
    if (violators.size > 0) {
      for (const index of violators) {
        const slotRoom = room(slots[index], direction);
        amounts[index] += direction * slotRoom;
        remaining -= BigInt(slotRoom);
      }
      active = active.filter((index) => !violators.has(index));
      continue;
    }

    const shares = active.map((index, k) => ({
      index,
      k,
      whole: (remaining * weights[k]) / weightSum,
      rest: (remaining * weights[k]) % weightSum,
    }));
    let leftover = remaining - shares.reduce((sum, share) => sum + share.whole, 0n);
    // Largest remainder first; ties go to the earlier channel so results are deterministic.
    const order = [...shares].sort((a, b) => (a.rest === b.rest ? a.k - b.k : a.rest > b.rest ? -1 : 1));
    const extra = new Set<number>();
    for (const share of order) {
      if (leftover === 0n) break;
      extra.add(share.index);
      leftover -= 1n;
    }
    for (const share of shares) {
      const cents = Number(share.whole) + (extra.has(share.index) ? 1 : 0);
      amounts[share.index] += direction * cents;
    }
    remaining = 0n;
  }

  return amounts;
}

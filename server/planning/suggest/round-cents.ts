/**
 * Whole cents from the optimiser's continuous amounts, exactly on the target total and inside
 * every channel's [low, high]: Hamilton's largest-remainder method. Each channel first gets the
 * whole cents below its amount (clipped to its bounds); the cents still missing go one each to
 * the largest fractional parts among channels with room (the smallest ones give cents back when
 * there are too many). Every channel ends within a cent of its continuous amount whenever the
 * amounts already met the bounds and the total.
 *
 * Cost: O(n log n).
 */

/**
 * @throws RangeError if the bounds cannot meet the target (Σ low > target or Σ high < target)
 */
export function roundToCents(
  amounts: ArrayLike<number>,
  lowCents: ArrayLike<number>,
  highCents: ArrayLike<number>,
  targetCents: number,
): number[] {
  const n = amounts.length;
  const whole = Array.from({ length: n }, (_, j) => Math.min(highCents[j], Math.max(lowCents[j], Math.floor(amounts[j]))));
  let missing = targetCents - whole.reduce((sum, value) => sum + value, 0);
  const remainder = (j: number) => amounts[j] - whole[j];
  const order = Array.from({ length: n }, (_, j) => j);
  // Ties go to the earlier channel, so the same input always rounds the same way.
  if (missing > 0) order.sort((a, b) => remainder(b) - remainder(a) || a - b);
  else order.sort((a, b) => remainder(a) - remainder(b) || a - b);
  for (let pass = 0; missing !== 0 && pass < 2; pass++) {
    for (const j of order) {
      if (missing === 0) break;
      // First pass: one cent each (the rounding proper); second: whatever room is left.
      const room = missing > 0 ? highCents[j] - whole[j] : whole[j] - lowCents[j];
      const step = Math.min(room, Math.abs(missing), pass === 0 ? 1 : Infinity);
      if (step <= 0) continue;
      whole[j] += Math.sign(missing) * step;
      missing -= Math.sign(missing) * step;
    }
  }
  if (missing !== 0) throw new RangeError(`roundToCents cannot reach ${targetCents} inside the bounds`);
  return whole;
}

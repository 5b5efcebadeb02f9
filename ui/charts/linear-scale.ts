// A linear scale and round tick values, for the small interval drawings on first paint (scenario room,
// comparisons, coefficient rows): a few lines instead of the chart library's scale and axis packages,
// which the charts further down the page (loaded later) still use.

export interface LinearScale {
  (value: number): number;
  readonly domain: readonly [number, number];
  readonly range: readonly [number, number];
  /** About `count` round values inside the domain (steps of 1, 2 or 5 × a power of ten). */
  ticks(count: number): number[];
}

/** Maps `domain` onto `range` linearly; with `clamp`, values outside the domain stop at its ends. */
export function linearScale(domain: readonly [number, number], range: readonly [number, number], options: { clamp?: boolean } = {}): LinearScale {
  const [d0, d1] = domain;
  const [r0, r1] = range;
  const span = d1 - d0;
  const map = (value: number) => {
    let t = span === 0 ? 0.5 : (value - d0) / span;
    if (options.clamp) t = Math.min(1, Math.max(0, t));
    return r0 + t * (r1 - r0);
  };
  return Object.assign(map, { domain: [d0, d1] as const, range: [r0, r1] as const, ticks: (count: number) => roundTicks(d0, d1, count) });
}

/**
 * Round values between `low` and `high` (either order), about `count` of them: the step is the one of
 * 1, 2, 5 or 10 × 10^k nearest (geometrically) to the span ÷ count. Values are computed as whole
 * multiples of the step (divided, for steps below one), so they print without float noise.
 */
export function roundTicks(low: number, high: number, count: number): number[] {
  if (!Number.isFinite(low) || !Number.isFinite(high) || !(count > 0)) return [];
  const reversed = high < low;
  const [start, stop] = reversed ? [high, low] : [low, high];
  if (start === stop) return [start];
  const raw = (stop - start) / count;
  const power = Math.floor(Math.log10(raw));
  const scaled = raw / 10 ** power;
  // Thresholds are the geometric means of neighbouring steps: √2 (1|2), √10 (2|5), √50 (5|10).
  const factor = scaled >= Math.sqrt(50) ? 10 : scaled >= Math.sqrt(10) ? 5 : scaled >= Math.SQRT2 ? 2 : 1;
  const values: number[] = [];
  if (power < 0) {
    const perUnit = 10 ** -power / factor; // ticks per unit
    for (let i = Math.ceil(start * perUnit); i <= Math.floor(stop * perUnit); i++) values.push(i / perUnit + 0); // + 0: no -0 label
  } else {
    const step = 10 ** power * factor;
    for (let i = Math.ceil(start / step); i <= Math.floor(stop / step); i++) values.push(i * step + 0);
  }
  return reversed ? values.reverse() : values;
}

/**
 * How the barrier method's variables y ∈ [0, 1] become a channel's horizon amount in cents.
 *
 * - `affine`: A = low + (high − low)·y — spend space, used by the local method and for channels
 *   whose terms are linear in spend.
 * - `log1p`: y moves v = log(1 + s) linearly, s = A / (100·H) the per-period spend, between the
 *   channel's bounds: the model's own coordinate for a log(1 + spend) term. In it the outcome is
 *   linear and the hull constraint is convex (see classify.ts), which is what makes the problem
 *   convex even where it is not in spend.
 * Scaling every variable to [0, 1] keeps the Newton systems well conditioned whatever the currency.
 */

export interface VariableMap {
  toCents(y: number): number;
  /** dA/dy. */
  first(y: number): number;
  /** d²A/dy². */
  second(y: number): number;
  fromCents(cents: number): number;
}

export function affineMap(lowCents: number, highCents: number): VariableMap {
  const width = highCents - lowCents;
  return {
    toCents: (y) => lowCents + width * y,
    first: () => width,
    second: () => 0,
    fromCents: (cents) => (cents - lowCents) / width,
  };
}

export function log1pMap(lowCents: number, highCents: number, centsPerUnit: number): VariableMap {
  const low = Math.log1p(lowCents / centsPerUnit);
  const width = Math.log1p(highCents / centsPerUnit) - low;
  return {
    toCents: (y) => centsPerUnit * Math.expm1(low + width * y),
    first: (y) => centsPerUnit * Math.exp(low + width * y) * width,
    second: (y) => centsPerUnit * Math.exp(low + width * y) * width * width,
    fromCents: (cents) => (Math.log1p(cents / centsPerUnit) - low) / width,
  };
}

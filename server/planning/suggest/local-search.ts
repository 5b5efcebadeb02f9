/**
 * The local method for outcomes that are not concave in spend (an interaction between two
 * channels, a rising curvature term): the barrier method with shifted Newton steps (barrier.ts)
 * run in spend coordinates from several starts — the current plan, the balanced plan and seeded
 * random plans — keeping the best. Each run ends at a local optimum; none is a certificate that
 * no better plan exists, which is why the result is labelled `method: "local"`.
 *
 * Cost: starts × one barrier solve.
 */
import { barrierSolve } from "./barrier-solve";
import type { FormulationInput } from "./formulation";
import { balancedStart, pullInside } from "./interior-start";
import { horizonOutcome } from "./outcome-model";

export interface LocalSearch {
  amountsCents: Float64Array;
  newtonSteps: number;
  /** Every run that reached the hull converged. */
  converged: boolean;
  hullReachable: boolean;
  starts: number;
}

/** mulberry32: a tiny seeded generator, so the same plan always gets the same suggestion. */
function seededUniform(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let mixed = state;
    mixed = Math.imul(mixed ^ (mixed >>> 15), mixed | 1);
    mixed ^= mixed + Math.imul(mixed ^ (mixed >>> 7), mixed | 61);
    return ((mixed ^ (mixed >>> 14)) >>> 0) / 4294967296;
  };
}

/** Runs the multi-start search; `currentCents` (every channel) seeds the first start. */
export function multiStartLocalSearch(input: FormulationInput, currentCents: ArrayLike<number>, randomStarts = 6): LocalSearch {
  const centre = balancedStart(input.maps, input.budget);
  const current = Float64Array.from(input.free, (channel, a) => input.maps[a].fromCents(currentCents[channel]));
  const uniform = seededUniform(0x5eed);
  const seeds = [current, centre, ...Array.from({ length: randomStarts }, () => Float64Array.from(input.free, () => uniform()))];
  let best: { amounts: Float64Array; outcome: number } | null = null;
  let newtonSteps = 0;
  let converged = true;
  for (const seed of seeds) {
    const start = pullInside(seed, centre, input.maps, input.budget);
    const run = barrierSolve(input, start);
    newtonSteps += run.newtonSteps;
    if (!run.hullReachable) continue;
    converged &&= run.converged;
    const outcome = horizonOutcome(input.model, run.amountsCents);
    if (!best || outcome > best.outcome) best = { amounts: run.amountsCents, outcome };
  }
  if (!best) return { amountsCents: Float64Array.from(input.baseAmounts), newtonSteps, converged: false, hullReachable: false, starts: seeds.length };
  return { amountsCents: best.amounts, newtonSteps, converged, hullReachable: true, starts: seeds.length };
}

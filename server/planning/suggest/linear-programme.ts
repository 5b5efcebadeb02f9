/**
 * The linear programme of an all-linear fit, solved exactly by a bounded-variable greedy method.
 *
 *     maximise Σ cⱼAⱼ  subject to  lowⱼ ≤ Aⱼ ≤ highⱼ,  Σ Aⱼ = B (fixed)  or  Σ Aⱼ ≤ B (growing)
 *
 * With a single coupling row whose coefficients are all 1, this is Dantzig's continuous knapsack
 * (G. B. Dantzig, "Discrete-variable extremum problems", Operations Research 5, 1957): the optimum
 * fills channels in decreasing order of return cⱼ from their low ends. Its LP dual proves it: with
 * λ the return of the channel the budget runs out in (0 when a growing budget is not used up),
 * every channel above λ is at its high end and every one below at its low end, which are the
 * optimality conditions of the bounded-variable simplex method. It is what that method would
 * reach, without pivoting. With whole-cent ends and budget the answer is in whole cents already.
 *
 * Cost: O(n log n).
 */

export interface LinearProgramme {
  /** Return of one more cent in each channel. */
  returns: ArrayLike<number>;
  lowCents: ArrayLike<number>;
  highCents: ArrayLike<number>;
  /** Budget for these channels (the total minus locked channels). */
  budgetCents: number;
  /** "equal": spend exactly the budget; "at-most": any total up to it. */
  budgetRule: "equal" | "at-most";
}

export interface LinearProgrammeSolution {
  amountsCents: Float64Array;
  /** The dual price of the budget: return of the marginal channel (0 when the budget is slack). */
  budgetPrice: number;
  /** Channels visited. */
  iterations: number;
}

/** Solves the programme; the caller has checked Σ low ≤ budget (and ≤ Σ high when "equal"). */
export function solveLinearProgramme(programme: LinearProgramme): LinearProgrammeSolution {
  const n = programme.returns.length;
  const amounts = Float64Array.from(programme.lowCents);
  let remaining = programme.budgetCents - amounts.reduce((sum, value) => sum + value, 0);
  // Highest return first; ties keep channel order so the answer is deterministic.
  const order = Array.from({ length: n }, (_, index) => index).sort(
    (a, b) => programme.returns[b] - programme.returns[a] || a - b,
  );
  let budgetPrice = 0;
  let iterations = 0;
  for (const index of order) {
    if (remaining <= 0) break;
    const value = programme.returns[index];
    // A growing budget is only spent where it is predicted to add to the outcome.
    if (programme.budgetRule === "at-most" && !(value > 0)) break;
    iterations += 1;
    const room = programme.highCents[index] - programme.lowCents[index];
    const step = Math.min(room, remaining);
    amounts[index] += step;
    remaining -= step;
    if (remaining <= 0) budgetPrice = value;
  }
  return { amountsCents: amounts, budgetPrice, iterations };
}

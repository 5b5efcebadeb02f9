/**
 * Exact allocation for a separable concave outcome (log(1 + spend) with β ≥ 0, powers with β ≤ 0,
 * linear terms): water-filling on the budget's Lagrange multiplier.
 *
 * KKT conditions (Boyd & Vandenberghe, Convex Optimization, 2004, §5.5.3 and exercise 5.2's
 * water-filling): at the optimum there is a price λ (≥ 0 for a growing budget, 0 when it is not
 * used up) such that each channel's marginal return dⱼ(Aⱼ) = ∂F/∂Aⱼ equals λ when Aⱼ is strictly
 * inside its bounds, is ≤ λ at its low end and ≥ λ at its high end. Because each dⱼ is
 * non-increasing, Aⱼ(λ) = clip(dⱼ⁻¹(λ)) is non-increasing in λ, and the budget fixes λ by
 * bisection. Channels with a constant return (linear) jump at λ = dⱼ: those tied with the final λ
 * share what the others leave, in channel order (any split of a tie is optimal).
 *
 * Cost: about 50 × n × 50 marginal evaluations (outer bisection to 1e-15 relative, inner to a
 * millionth of a cent), each O(p): milliseconds for a dozen channels.
 */

export interface SeparableConcaveProgramme {
  /** ∂F/∂Aⱼ at Aⱼ = amount (outcome per cent); non-increasing in amount. */
  marginal: (channel: number, amountCents: number) => number;
  /** Channels whose marginal is constant (every term reading them is linear). */
  constant: ArrayLike<boolean>;
  lowCents: ArrayLike<number>;
  highCents: ArrayLike<number>;
  budgetCents: number;
  budgetRule: "equal" | "at-most";
}

export interface WaterFillingSolution {
  amountsCents: Float64Array;
  /** λ, the return of one more cent of budget. */
  budgetPrice: number;
  /** Bisection steps on λ. */
  iterations: number;
}

/** Largest Aⱼ in [low, high] with dⱼ(Aⱼ) ≥ λ (low when none), by bisection on the amount. */
function amountAtPrice(programme: SeparableConcaveProgramme, channel: number, price: number): number {
  let low = programme.lowCents[channel];
  let high = programme.highCents[channel];
  if (programme.marginal(channel, low) <= price) return low;
  if (programme.marginal(channel, high) >= price) return high;
  // A millionth of a cent is far below what rounding to cents keeps.
  for (let step = 0; step < 200 && high - low > 1e-6; step++) {
    const middle = 0.5 * (low + high);
    if (programme.marginal(channel, middle) >= price) low = middle;
    else high = middle;
  }
  return 0.5 * (low + high);
}

/** Solves the programme; the caller has checked Σ low ≤ budget (and ≤ Σ high when "equal"). */
export function waterFill(programme: SeparableConcaveProgramme): WaterFillingSolution {
  const n = programme.lowCents.length;
  const channels = Array.from({ length: n }, (_, index) => index);
  const spendAt = (price: number) => channels.reduce((sum, j) => sum + amountAtPrice(programme, j, price), 0);
  const budget = programme.budgetCents;

  // Bracket λ: above every low-end marginal nobody spends beyond the low ends; below every high-end one everybody is full.
  const lowMarginals = channels.map((j) => programme.marginal(j, programme.lowCents[j]));
  const highMarginals = channels.map((j) => programme.marginal(j, programme.highCents[j]));
  const spread = Math.max(1e-300, ...lowMarginals.map(Math.abs), ...highMarginals.map(Math.abs));
  let priceHigh = Math.max(...lowMarginals) + spread;
  let priceLow = Math.min(...highMarginals) - spread;
  let iterations = 0;
  if (programme.budgetRule === "at-most") {
    if (spendAt(0) <= budget) return finish(programme, 0, 0, budget, 0, "at-most");
    priceLow = Math.max(priceLow, 0);
  }
  while (iterations < 200 && priceHigh - priceLow > 1e-15 * Math.max(Math.abs(priceLow), Math.abs(priceHigh))) {
    const middle = 0.5 * (priceLow + priceHigh);
    if (middle <= priceLow || middle >= priceHigh) break;
    iterations += 1;
    if (spendAt(middle) > budget) priceLow = middle;
    else priceHigh = middle;
  }
  return finish(programme, priceLow, priceHigh, budget, iterations, "equal");
}

/**
 * Amounts at the final bracket [priceLow, priceHigh]: channels with a varying marginal at its
 * middle, constant ones above it full, below it empty, and inside it (ties) sharing the rest.
 */
function finish(
  programme: SeparableConcaveProgramme,
  priceLow: number,
  priceHigh: number,
  budget: number,
  iterations: number,
  rule: "equal" | "at-most",
): WaterFillingSolution {
  const n = programme.lowCents.length;
  const price = 0.5 * (priceLow + priceHigh);
  const amounts = new Float64Array(n);
  const ties: number[] = [];
  for (let j = 0; j < n; j++) {
    if (!programme.constant[j]) {
      amounts[j] = amountAtPrice(programme, j, price);
      continue;
    }
    const value = programme.marginal(j, programme.lowCents[j]);
    if (value > priceHigh) amounts[j] = programme.highCents[j];
    else if (value < priceLow || (rule === "at-most" && value <= 0)) amounts[j] = programme.lowCents[j];
    else {
      amounts[j] = programme.lowCents[j];
      ties.push(j);
    }
  }
  if (rule === "equal") {
    let remaining = budget - amounts.reduce((sum, value) => sum + value, 0);
    for (const j of ties) {
      const step = Math.max(0, Math.min(remaining, programme.highCents[j] - amounts[j]));
      amounts[j] += step;
      remaining -= step;
    }
    spreadResidual(programme, amounts, remaining);
  }
  return { amountsCents: amounts, budgetPrice: price, iterations };
}

/**
 * What the bisection's last bit leaves unspent (or overspent) goes to the channels strictly inside
 * their bounds, in proportion to their room: a fraction of a cent that rounding settles anyway.
 */
function spreadResidual(programme: SeparableConcaveProgramme, amounts: Float64Array, residual: number): void {
  if (residual === 0) return;
  const rooms = Array.from(amounts, (amount, j) =>
    residual > 0 ? programme.highCents[j] - amount : amount - programme.lowCents[j],
  );
  const totalRoom = rooms.reduce((sum, room) => sum + room, 0);
  if (totalRoom <= 0) return;
  const share = Math.min(1, Math.abs(residual) / totalRoom);
  rooms.forEach((room, j) => (amounts[j] += Math.sign(residual) * room * share));
}

/**
 * The allocation problem written for the barrier method, in the variables y ∈ [0, 1] of the free
 * channels (see variable-maps.ts):
 *
 *     minimise −F(A(y)) / scale
 *     subject to the budget (Σ A = B as a linear row when every map is affine, else Σ A(y) ≤ B),
 *                h_g(A(y)) ≤ h_target for every group of periods (when the hull is kept).
 *
 * Scaling the objective by the sum of its slopes over the box makes the barrier's gap tolerance a
 * fraction of what the plan can gain. Derivatives are the model's (outcome-model.ts), carried to y
 * by the chain rule: ∇_y = ∇_A·A′ and ∇²_y = A′∇²_A A′ + diag(∇_A·A″).
 */
import type { BarrierProblem, SmoothFunction, SmoothValue } from "./barrier";
import { type Derivatives, type OutcomeModel, horizonOutcome, leverageDerivatives, leverageValue, outcomeDerivatives } from "./outcome-model";
import type { VariableMap } from "./variable-maps";

export interface FormulationInput {
  model: OutcomeModel;
  /** Channel indices that move. */
  free: readonly number[];
  /** One map per free channel. */
  maps: readonly VariableMap[];
  /** Every channel's amount; the free ones are overwritten from y. */
  baseAmounts: Float64Array;
  /** What the free channels share: "equal" needs affine maps. Null when the budget cannot bind. */
  budget: { cents: number; rule: "equal" | "at-most" } | null;
  /** Largest leverage allowed, or null when the hull is not kept. */
  hullTarget: number | null;
}

export interface Formulation {
  problem: BarrierProblem;
  amountsAt(y: Float64Array): Float64Array;
  /** What each barrier constraint is, in order. */
  constraintKinds: ({ kind: "budget" } | { kind: "hull"; group: number })[];
}

/** Builds the problem. @throws if an equality budget meets a non-affine map. */
export function formulate(input: FormulationInput): Formulation {
  const { model, free, maps, baseAmounts } = input;
  const k = free.length;
  const amountsAt = (y: Float64Array) => {
    const amounts = Float64Array.from(baseAmounts);
    free.forEach((channel, a) => (amounts[channel] = maps[a].toCents(y[a])));
    return amounts;
  };
  const chain = (full: Derivatives, y: Float64Array, factor: number): SmoothValue => {
    const n = model.channelNames.length;
    const gradient = new Float64Array(k);
    const hessian = new Float64Array(k * k);
    for (let a = 0; a < k; a++) {
      const firstA = maps[a].first(y[a]);
      gradient[a] = factor * full.gradient[free[a]] * firstA;
      for (let b = 0; b < k; b++) hessian[a * k + b] = factor * full.hessian[free[a] * n + free[b]] * firstA * maps[b].first(y[b]);
      hessian[a * k + a] += factor * full.gradient[free[a]] * maps[a].second(y[a]);
    }
    return { value: factor * full.value, gradient, hessian };
  };

  const middle = new Float64Array(k).fill(0.5);
  const slopes = chain(outcomeDerivatives(model, amountsAt(middle)), middle, 1).gradient;
  const scale = Math.max(slopes.reduce((sum, value) => sum + Math.abs(value), 0), 1e-300);
  const objective: SmoothFunction = {
    value: (y) => -horizonOutcome(model, amountsAt(y)) / scale,
    derivatives: (y) => chain(outcomeDerivatives(model, amountsAt(y)), y, -1 / scale),
  };

  const constraints: SmoothFunction[] = [];
  const constraintKinds: Formulation["constraintKinds"] = [];
  let equality: BarrierProblem["equality"];
  if (input.budget) {
    const { cents, rule } = input.budget;
    if (rule === "equal") {
      if (maps.some((map) => map.second(0.5) !== 0)) throw new Error("formulate requires affine maps for an exact budget");
      const row = Float64Array.from(maps, (map) => map.first(0));
      equality = { row, rhs: cents - maps.reduce((sum, map) => sum + map.toCents(0), 0) };
    } else {
      const width = Math.max(1, maps.reduce((sum, map) => sum + (map.toCents(1) - map.toCents(0)), 0));
      constraints.push({
        value: (y) => (maps.reduce((sum, map, a) => sum + map.toCents(y[a]), 0) - cents) / width,
        derivatives: (y) => {
          const hessian = new Float64Array(k * k);
          maps.forEach((map, a) => (hessian[a * k + a] = map.second(y[a]) / width));
          return {
            value: (maps.reduce((sum, map, a) => sum + map.toCents(y[a]), 0) - cents) / width,
            gradient: Float64Array.from(maps, (map, a) => map.first(y[a]) / width),
            hessian,
          };
        },
      });
      constraintKinds.push({ kind: "budget" });
    }
  }
  if (input.hullTarget !== null) {
    const target = input.hullTarget;
    model.groups.forEach((_, group) => {
      constraints.push({
        value: (y) => leverageValue(model, group, amountsAt(y)) / target - 1,
        derivatives: (y) => {
          const scaled = chain(leverageDerivatives(model, group, amountsAt(y)), y, 1 / target);
          return { ...scaled, value: scaled.value - 1 };
        },
      });
      constraintKinds.push({ kind: "hull", group });
    });
  }
  const problem: BarrierProblem = {
    dimension: k,
    lower: new Float64Array(k).fill(0),
    upper: new Float64Array(k).fill(1),
    objective,
    constraints,
    equality,
  };
  return { problem, amountsAt, constraintKinds };
}

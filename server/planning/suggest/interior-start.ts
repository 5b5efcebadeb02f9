/**
 * Strictly feasible starting points for the barrier method: inside the box, on (or strictly
 * under) the budget, and — through phase I — inside the hull.
 */
import { type BarrierProblem, type SmoothFunction, barrierMethod } from "./barrier";
import type { Formulation } from "./formulation";
import type { VariableMap } from "./variable-maps";

export type Budget = { cents: number; rule: "equal" | "at-most" } | null;

/**
 * Every channel the same fraction θ of the way from its low to its high end, θ chosen to spend the
 * budget exactly ("equal") or half of the room under it ("at-most"). The caller guarantees
 * Σ low < budget (< Σ high when "equal"), so 0 < θ < 1 and the point is strictly inside.
 */
export function balancedStart(maps: readonly VariableMap[], budget: Budget): Float64Array {
  const low = maps.reduce((sum, map) => sum + map.toCents(0), 0);
  const high = maps.reduce((sum, map) => sum + map.toCents(1), 0);
  let fraction = 0.5;
  if (budget?.rule === "equal") fraction = (budget.cents - low) / (high - low);
  else if (budget) fraction = Math.min(0.5, (0.5 * (budget.cents - low)) / (high - low));
  return Float64Array.from(maps, (map) => {
    const y = map.fromCents(map.toCents(0) + fraction * (map.toCents(1) - map.toCents(0)));
    return Math.min(1 - 1e-12, Math.max(1e-12, y));
  });
}

/**
 * Moves any point of [0, 1]ⁿ strictly inside the box and onto the budget: a step of 0.1% towards
 * `centre` (a strictly feasible point) leaves the box's faces, then a move along the line to the
 * corner the budget lies towards meets an equality, or a blend towards the centre meets an at-most
 * budget. Used to seed the local method.
 */
export function pullInside(point: Float64Array, centre: Float64Array, maps: readonly VariableMap[], budget: Budget): Float64Array {
  const y = Float64Array.from(point, (value, a) => 0.999 * Math.min(1, Math.max(0, value)) + 0.001 * centre[a]);
  if (!budget) return y;
  const spend = (candidate: Float64Array) => maps.reduce((sum, map, a) => sum + map.toCents(candidate[a]), 0);
  if (budget.rule === "equal") {
    // Affine maps: spend is linear along the line, so one division lands on the budget.
    const gap = budget.cents - spend(y);
    const direction = Float64Array.from(y, (value) => (gap > 0 ? 1 - value : -value));
    const rate = maps.reduce((sum, map, a) => sum + map.first(0) * direction[a], 0);
    if (rate !== 0) y.forEach((value, a) => (y[a] = value + (gap / rate) * direction[a]));
    return y;
  }
  if (spend(y) < budget.cents) return y;
  let low = 0;
  let high = 1;
  for (let step = 0; step < 60; step++) {
    const middle = 0.5 * (low + high);
    const blended = Float64Array.from(y, (value, a) => (1 - middle) * value + middle * centre[a]);
    if (spend(blended) < budget.cents) high = middle;
    else low = middle;
  }
  return Float64Array.from(y, (value, a) => (1 - high) * value + high * centre[a]);
}

/**
 * Phase I (Boyd & Vandenberghe §11.4.1): minimise s over (y, s) with every hull constraint
 * relaxed to cᵢ(y) ≤ s, from a point that meets the box and the budget. A negative s is a
 * strictly feasible point; it stops once s ≤ −1% (comfortably inside) or at the optimum. A
 * minimum s ≥ 0 means no plan meets the hull together with the other constraints.
 */
export function phaseOne(formulation: Formulation, start: Float64Array): { point: Float64Array; slack: number; newtonSteps: number } {
  const { problem, constraintKinds } = formulation;
  const k = problem.dimension;
  const withoutSlack = (z: Float64Array) => z.subarray(0, k);
  const widen = (value: { value: number; gradient: Float64Array; hessian: Float64Array }, slackWeight: number) => {
    const gradient = new Float64Array(k + 1);
    gradient.set(value.gradient);
    gradient[k] = slackWeight;
    const hessian = new Float64Array((k + 1) * (k + 1));
    for (let a = 0; a < k; a++) for (let b = 0; b < k; b++) hessian[a * (k + 1) + b] = value.hessian[a * k + b];
    return { value: value.value, gradient, hessian };
  };
  const constraints: SmoothFunction[] = problem.constraints.map((constraint, index) => {
    const relaxed = constraintKinds[index].kind === "hull";
    return {
      value: (z) => constraint.value(withoutSlack(z)) - (relaxed ? z[k] : 0),
      derivatives: (z) => {
        const widened = widen(constraint.derivatives(withoutSlack(z)), relaxed ? -1 : 0);
        return { ...widened, value: widened.value - (relaxed ? z[k] : 0) };
      },
    };
  });
  const initialSlack = Math.max(0, ...problem.constraints.map((constraint, index) => (constraintKinds[index].kind === "hull" ? constraint.value(start) : -Infinity))) + 0.1;
  const augmented: BarrierProblem = {
    dimension: k + 1,
    lower: Float64Array.from([...problem.lower, -1]),
    upper: Float64Array.from([...problem.upper, Infinity]),
    objective: {
      value: (z) => z[k],
      derivatives: () => widen({ value: 0, gradient: new Float64Array(k), hessian: new Float64Array(k * k) }, 1),
    },
    constraints,
    equality: problem.equality ? { row: Float64Array.from([...problem.equality.row, 0]), rhs: problem.equality.rhs } : undefined,
  };
  const run = barrierMethod(augmented, {
    start: Float64Array.from([...start, initialSlack]),
    gapTolerance: 1e-9,
    stopEarly: (z) => z[k] <= -0.01,
  });
  const point = Float64Array.from(run.point.subarray(0, k));
  const slack = Math.max(...problem.constraints.map((constraint, index) => (constraintKinds[index].kind === "hull" ? constraint.value(point) : -Infinity)));
  return { point, slack, newtonSteps: run.newtonSteps };
}

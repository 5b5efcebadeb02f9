/**
 * One barrier solve of a formulation: a balanced start, phase I when that start is outside the
 * hull, then the barrier method. Used as the convex method (design coordinates) and, from many
 * starts, by the local method (spend coordinates).
 */
import { barrierMethod } from "./barrier";
import { type FormulationInput, formulate } from "./formulation";
import { balancedStart, phaseOne } from "./interior-start";

export interface BarrierSolve {
  /** Every channel's amount, cents (continuous). */
  amountsCents: Float64Array;
  newtonSteps: number;
  converged: boolean;
  /** False when no plan meets the hull with the other constraints (then amounts are meaningless). */
  hullReachable: boolean;
  /** Multiplier of the at-most budget, if it is a constraint (0 otherwise). */
  budgetMultiplier: number;
}

/** Solves from `start` (in y) or from the balanced start. Cost: see barrier.ts. */
export function barrierSolve(input: FormulationInput, start?: Float64Array): BarrierSolve {
  const formulation = formulate(input);
  let y = start ?? balancedStart(input.maps, input.budget);
  let newtonSteps = 0;
  const hullIndices = formulation.constraintKinds.flatMap((kind, index) => (kind.kind === "hull" ? [index] : []));
  if (hullIndices.some((index) => formulation.problem.constraints[index].value(y) >= 0)) {
    const first = phaseOne(formulation, y);
    newtonSteps += first.newtonSteps;
    if (!(first.slack < 0)) {
      return { amountsCents: formulation.amountsAt(y), newtonSteps, converged: false, hullReachable: false, budgetMultiplier: 0 };
    }
    y = first.point;
  }
  const run = barrierMethod(formulation.problem, { start: y });
  const budgetIndex = formulation.constraintKinds.findIndex((kind) => kind.kind === "budget");
  return {
    amountsCents: formulation.amountsAt(run.point),
    newtonSteps: newtonSteps + run.newtonSteps,
    converged: run.converged,
    hullReachable: true,
    budgetMultiplier: budgetIndex < 0 ? 0 : run.constraintMultipliers[budgetIndex],
  };
}

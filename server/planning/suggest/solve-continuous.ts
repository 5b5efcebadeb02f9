/**
 * Chooses the method for the problem's shape and solves it in continuous cents.
 *
 * | outcome in spend            | hull off / not binding          | hull binding                          |
 * |-----------------------------|---------------------------------|---------------------------------------|
 * | linear                      | linear programme (exact)        | barrier, convex in spend (exact)      |
 * | separable concave           | KKT water-filling (exact)       | barrier in design coordinates (exact*) |
 * | log1p with β < 0            | barrier in design coordinates (exact*)                                  |
 * | interactions, other curves  | multi-start local barrier (local)                                       |
 *
 * *Design coordinates (v = spend or log(1 + spend), see variable-maps.ts) make the outcome linear and
 * the hull convex, but a fixed total becomes Σ expm1(v) = B, which is not convex: it is relaxed to
 * ≤ B, and the answer is exact when the relaxed optimum spends the whole budget (it then solves the
 * original problem too). When it does not, the local method in spend coordinates takes over.
 * "Hull not binding" is checked, not assumed: the hull-free optimum is kept only if it is inside.
 */
import { barrierSolve } from "./barrier-solve";
import type { ProblemShape } from "./classify";
import type { FormulationInput } from "./formulation";
import type { Budget } from "./interior-start";
import { solveLinearProgramme } from "./linear-programme";
import { multiStartLocalSearch } from "./local-search";
import { type OutcomeModel, channelMarginal, outcomeDerivatives, planLeverage } from "./outcome-model";
import { type VariableMap, affineMap, log1pMap } from "./variable-maps";
import { waterFill } from "./water-filling";

export interface ContinuousProblem {
  model: OutcomeModel;
  shape: ProblemShape;
  /** Channels that move (low < high). */
  free: number[];
  lowCents: number[];
  highCents: number[];
  /** Every channel's amount with the free ones at their low end. */
  baseAmounts: Float64Array;
  /** Budget of the free channels ("equal" for a fixed total), null when it cannot bind. */
  budget: Budget;
  /** Largest leverage allowed, null when the hull is not kept. */
  hullTarget: number | null;
  currentCents: number[];
}

export interface ContinuousSolution {
  amountsCents: Float64Array;
  method: "exact" | "local";
  solver: "linear-programme" | "water-filling" | "barrier" | "multi-start-barrier";
  iterations: number;
  converged: boolean;
  hullStatus: "kept" | "off" | "unreachable";
  /** Number of local searches (local method only). */
  starts?: number;
}

type Attempt = Omit<ContinuousSolution, "hullStatus">;

/** Solves the problem. Cost: see each method's file. */
export function solveContinuous(problem: ContinuousProblem): ContinuousSolution {
  const { hullTarget } = problem;
  const free = solveWithoutHull(problem);
  if (hullTarget === null) return { ...(free ?? localSearch(problem, null) ?? fallback(problem)), hullStatus: "off" };
  if (free && planLeverage(problem.model, free.amountsCents) <= hullTarget) return { ...free, hullStatus: "kept" };
  const kept = problem.shape.designConvex ? designBarrier(problem, hullTarget) : localSearch(problem, hullTarget);
  if (kept) return { ...kept, hullStatus: "kept" };
  // No plan meets the hull with the other constraints: say so and suggest the best plan without it.
  return { ...(free ?? localSearch(problem, null) ?? fallback(problem)), hullStatus: "unreachable" };
}

/** The hull-free solve: an exact method when the shape has one, else null (the caller runs the local method). */
function solveWithoutHull(problem: ContinuousProblem): Attempt | null {
  const { model, shape, free, budget } = problem;
  if (shape.affine) {
    // F is linear: its gradient anywhere is the programme's returns.
    const gradient = outcomeDerivatives(model, problem.baseAmounts).gradient;
    const solution = solveLinearProgramme({
      returns: free.map((j) => gradient[j]),
      lowCents: free.map((j) => problem.lowCents[j]),
      highCents: free.map((j) => problem.highCents[j]),
      budgetCents: budget?.cents ?? Infinity,
      budgetRule: budget?.rule ?? "at-most",
    });
    return { amountsCents: place(problem, solution.amountsCents), method: "exact", solver: "linear-programme", iterations: solution.iterations, converged: true };
  }
  if (shape.concave) {
    const solution = waterFill({
      marginal: (a, cents) => channelMarginal(model, free[a], cents, problem.baseAmounts),
      constant: free.map((j) => shape.shapes[j] === "affine"),
      lowCents: free.map((j) => problem.lowCents[j]),
      highCents: free.map((j) => problem.highCents[j]),
      budgetCents: budget?.cents ?? Infinity,
      budgetRule: budget?.rule ?? "at-most",
    });
    return { amountsCents: place(problem, solution.amountsCents), method: "exact", solver: "water-filling", iterations: solution.iterations, converged: true };
  }
  return shape.designConvex ? designBarrier(problem, null) : null;
}

/** Free channels' amounts written into a full amounts vector. */
function place(problem: ContinuousProblem, freeAmounts: ArrayLike<number>): Float64Array {
  const amounts = Float64Array.from(problem.baseAmounts);
  problem.free.forEach((j, a) => (amounts[j] = freeAmounts[a]));
  return amounts;
}

function formulation(problem: ContinuousProblem, maps: VariableMap[], budget: Budget, hullTarget: number | null): FormulationInput {
  return { model: problem.model, free: problem.free, maps, baseAmounts: problem.baseAmounts, budget, hullTarget };
}

/** The convex barrier solve in design coordinates; null when the hull is unreachable. */
function designBarrier(problem: ContinuousProblem, hullTarget: number | null): Attempt | null {
  const { free, shape, budget, model } = problem;
  const maps = free.map((j) =>
    shape.shapes[j] === "log1p" ? log1pMap(problem.lowCents[j], problem.highCents[j], model.centsPerUnit) : affineMap(problem.lowCents[j], problem.highCents[j]),
  );
  const curved = free.some((j) => shape.shapes[j] === "log1p");
  const relaxed = curved && budget?.rule === "equal";
  const run = barrierSolve(formulation(problem, maps, relaxed && budget ? { cents: budget.cents, rule: "at-most" } : budget, hullTarget));
  if (!run.hullReachable) return null;
  if (relaxed && budget) {
    const spent = free.reduce((sum, j) => sum + run.amountsCents[j], 0);
    // Half a cent short is what rounding fills; more means the relaxation is not tight.
    if (budget.cents - spent > Math.max(0.5, 1e-9 * budget.cents)) {
      const local = localSearch(problem, hullTarget);
      return local ? { ...local, iterations: local.iterations + run.newtonSteps } : null;
    }
  }
  return { amountsCents: run.amountsCents, method: "exact", solver: "barrier", iterations: run.newtonSteps, converged: run.converged };
}

/** The multi-start local method in spend coordinates; null when the hull is unreachable. */
function localSearch(problem: ContinuousProblem, hullTarget: number | null): Attempt | null {
  const maps = problem.free.map((j) => affineMap(problem.lowCents[j], problem.highCents[j]));
  const run = multiStartLocalSearch(formulation(problem, maps, problem.budget, hullTarget), problem.currentCents);
  if (!run.hullReachable) return null;
  return { amountsCents: run.amountsCents, method: "local", solver: "multi-start-barrier", iterations: run.newtonSteps, converged: run.converged, starts: run.starts };
}

/** Last resort (never expected: without the hull every start is feasible): the balanced plan. */
function fallback(problem: ContinuousProblem): Attempt {
  return { amountsCents: Float64Array.from(problem.baseAmounts), method: "local", solver: "multi-start-barrier", iterations: 0, converged: false };
}

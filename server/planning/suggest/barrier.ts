/**
 * The log-barrier interior-point method for a small smooth problem
 *
 *     minimise f(y)  subject to  lower ≤ y ≤ upper,  gᵢ(y) ≤ 0,  aᵀy = b (at most one row)
 *
 * (Boyd & Vandenberghe, Convex Optimization, 2004, §11.3 "the barrier method", with Newton's
 * method for equality-constrained minimisation, §10.2, in the row's null space). For t = 1, 10,
 * 100, … it minimises t·f − Σ log(slacks) from the previous minimiser; when f and every gᵢ are
 * convex the minimiser at t is within m/t of the optimum (m = number of inequalities), so stopping
 * at m/t ≤ gapTolerance is a certificate, and λᵢ = 1/(t·(−gᵢ)) are dual-feasible multipliers.
 * On a non-convex problem the Hessian is shifted until positive definite (see `shiftedSolve`), each
 * step still descends, and the method ends at a local minimiser — no certificate then.
 *
 * Cost: about 12 centring rounds × a few Newton steps, each O(n³) plus the function evaluations.
 */
import { nullSpaceOfRow, shiftedSolve } from "./dense";

export interface SmoothValue {
  value: number;
  gradient: Float64Array;
  /** n × n, row-major. */
  hessian: Float64Array;
}

export interface SmoothFunction {
  value(point: Float64Array): number;
  derivatives(point: Float64Array): SmoothValue;
}

export interface BarrierProblem {
  dimension: number;
  /** Box; ±Infinity for a free side. */
  lower: Float64Array;
  upper: Float64Array;
  /** Minimised. */
  objective: SmoothFunction;
  /** Each kept ≤ 0 (strictly, inside the method). */
  constraints: readonly SmoothFunction[];
  equality?: { row: Float64Array; rhs: number };
}

export interface BarrierOptions {
  /** Strictly inside the box and the constraints, and on the equality. */
  start: Float64Array;
  /** Stop when m/t is below this (default 1e-10; the objective should be scaled to about 1). */
  gapTolerance?: number;
  /** Checked after every Newton step: true ends the run (phase I stops once it is feasible enough). */
  stopEarly?: (point: Float64Array) => boolean;
  maxNewtonSteps?: number;
}

export interface BarrierResult {
  point: Float64Array;
  newtonSteps: number;
  /** Final centring converged and m/t ≤ gapTolerance. */
  converged: boolean;
  /** m/t at the end: the optimality gap bound on a convex problem. */
  gap: number;
  /** λᵢ = 1/(t·(−gᵢ)) for each constraint. */
  constraintMultipliers: Float64Array;
  stoppedEarly: boolean;
}

const armijoFraction = 0.25;
const centringTolerance = 1e-10;

/** Runs the method. @throws if the start is not strictly feasible. */
export function barrierMethod(problem: BarrierProblem, options: BarrierOptions): BarrierResult {
  const n = problem.dimension;
  const gapTolerance = options.gapTolerance ?? 1e-10;
  const maxSteps = options.maxNewtonSteps ?? 3000;
  let point = Float64Array.from(options.start);
  const constraintCount =
    problem.constraints.length +
    Array.from(problem.lower).filter(Number.isFinite).length +
    Array.from(problem.upper).filter(Number.isFinite).length;
  if (!Number.isFinite(barrierValue(problem, point, 1))) throw new Error("barrierMethod requires a strictly feasible start");
  const basis = problem.equality ? nullSpaceOfRow(problem.equality.row) : null;
  let t = 1;
  let steps = 0;
  for (;;) {
    let centred = false;
    for (let inner = 0; inner < 200 && steps < maxSteps; inner++) {
      const { gradient, hessian } = barrierDerivatives(problem, point, t);
      const direction = newtonDirection(gradient, hessian, basis, n);
      let decrement = 0;
      for (let j = 0; j < n; j++) decrement -= gradient[j] * direction[j];
      if (!(decrement > 2 * centringTolerance)) {
        centred = true;
        break;
      }
      const step = lineSearch(problem, point, direction, t, decrement);
      if (step === 0) {
        // Rounding noise: no decrease is measurable any more, which is as centred as doubles allow.
        centred = true;
        break;
      }
      for (let j = 0; j < n; j++) point[j] += step * direction[j];
      steps += 1;
      if (options.stopEarly?.(point)) return result(problem, point, t, steps, false, constraintCount, true);
    }
    if (constraintCount / t <= gapTolerance || steps >= maxSteps) {
      return result(problem, point, t, steps, centred && constraintCount / t <= gapTolerance, constraintCount, false);
    }
    t *= 10;
  }
}

function result(problem: BarrierProblem, point: Float64Array, t: number, steps: number, converged: boolean, count: number, early: boolean): BarrierResult {
  const constraintMultipliers = Float64Array.from(problem.constraints, (constraint) => 1 / (t * -constraint.value(point)));
  return { point, newtonSteps: steps, converged, gap: count / t, constraintMultipliers, stoppedEarly: early };
}

/** t·f − Σ log(slack); Infinity outside the strict interior. */
function barrierValue(problem: BarrierProblem, point: Float64Array, t: number): number {
  let value = t * problem.objective.value(point);
  for (let j = 0; j < problem.dimension; j++) {
    const below = point[j] - problem.lower[j];
    const above = problem.upper[j] - point[j];
    if (!(below > 0) || !(above > 0)) return Infinity;
    if (Number.isFinite(below)) value -= Math.log(below);
    if (Number.isFinite(above)) value -= Math.log(above);
  }
  for (const constraint of problem.constraints) {
    const slack = -constraint.value(point);
    if (!(slack > 0)) return Infinity;
    value -= Math.log(slack);
  }
  return Number.isNaN(value) ? Infinity : value;
}

function barrierDerivatives(problem: BarrierProblem, point: Float64Array, t: number) {
  const n = problem.dimension;
  const objective = problem.objective.derivatives(point);
  const gradient = Float64Array.from(objective.gradient, (value) => t * value);
  const hessian = Float64Array.from(objective.hessian, (value) => t * value);
  for (let j = 0; j < n; j++) {
    const below = point[j] - problem.lower[j];
    const above = problem.upper[j] - point[j];
    if (Number.isFinite(below)) {
      gradient[j] -= 1 / below;
      hessian[j * n + j] += 1 / (below * below);
    }
    if (Number.isFinite(above)) {
      gradient[j] += 1 / above;
      hessian[j * n + j] += 1 / (above * above);
    }
  }
  for (const constraint of problem.constraints) {
    const { value, gradient: g, hessian: h } = constraint.derivatives(point);
    const slack = -value;
    for (let j = 0; j < n; j++) {
      gradient[j] += g[j] / slack;
      for (let k = 0; k < n; k++) hessian[j * n + k] += (g[j] * g[k]) / (slack * slack) + h[j * n + k] / slack;
    }
  }
  return { gradient, hessian };
}

/** Newton direction, in the equality row's null space when there is one. */
function newtonDirection(gradient: Float64Array, hessian: Float64Array, basis: Float64Array[] | null, n: number): Float64Array {
  if (!basis) return shiftedSolve(hessian, Float64Array.from(gradient, (value) => -value)).solution;
  const r = basis.length;
  if (r === 0) return new Float64Array(n);
  const reducedGradient = new Float64Array(r);
  const reducedHessian = new Float64Array(r * r);
  const hz = basis.map((column) => {
    const product = new Float64Array(n);
    for (let j = 0; j < n; j++) for (let k = 0; k < n; k++) product[j] += hessian[j * n + k] * column[k];
    return product;
  });
  for (let a = 0; a < r; a++) {
    for (let j = 0; j < n; j++) reducedGradient[a] -= basis[a][j] * gradient[j];
    for (let b = 0; b < r; b++) {
      let sum = 0;
      for (let j = 0; j < n; j++) sum += basis[a][j] * hz[b][j];
      reducedHessian[a * r + b] = sum;
    }
  }
  const reduced = shiftedSolve(reducedHessian, reducedGradient).solution;
  const direction = new Float64Array(n);
  for (let a = 0; a < r; a++) for (let j = 0; j < n; j++) direction[j] += reduced[a] * basis[a][j];
  return direction;
}

/** Backtracking (Armijo) from the longest step that stays 1% inside the box; 0 when none helps. */
function lineSearch(problem: BarrierProblem, point: Float64Array, direction: Float64Array, t: number, decrement: number): number {
  let step = 1;
  for (let j = 0; j < problem.dimension; j++) {
    if (direction[j] < 0) step = Math.min(step, (0.99 * (point[j] - problem.lower[j])) / -direction[j]);
    if (direction[j] > 0) step = Math.min(step, (0.99 * (problem.upper[j] - point[j])) / direction[j]);
  }
  const current = barrierValue(problem, point, t);
  const trial = new Float64Array(problem.dimension);
  // Inside the region of quadratic convergence the full step is taken as long as it stays
  // feasible: the decrease it makes is below what t·f (up to 1e11) can show in a double.
  if (decrement < 1e-6) {
    for (let j = 0; j < problem.dimension; j++) trial[j] = point[j] + step * direction[j];
    if (Number.isFinite(barrierValue(problem, trial, t))) return step;
  }
  for (let attempt = 0; attempt < 60; attempt++, step *= 0.5) {
    for (let j = 0; j < problem.dimension; j++) trial[j] = point[j] + step * direction[j];
    const value = barrierValue(problem, trial, t);
    // Strictly lower: a "decrease" smaller than the value's last bit is no progress, and accepting
    // it would let the method creep forever at the limit of double precision.
    if (value < current && value <= current - armijoFraction * step * decrement) return step;
  }
  return 0;
}

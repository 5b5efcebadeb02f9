/**
 * `suggestAllocation`: the "Suggested split" — the allocation that maximises the predicted horizon
 * outcome of an approved fit under the plan's constraints, in whole cents, with its predicted gain
 * over the current plan and the constraints it stands against, in plain words.
 *
 * Objective: the expected horizon total F(A) = Σ over the horizon's periods of the fit's mean
 * prediction, spend spread evenly (A / H per period), controls as given (see outcome-model.ts).
 * Constraints:
 * - the total: fixed mode spends exactly the total; growing mode spends any total up to the
 *   ceiling — less when more spend is not predicted to pay (the rules of the allocation module,
 *   where lowering a channel lowers a growing total too);
 * - locked channels keep their amounts; floors and ceilings hold; spend is never negative;
 * - (default on) each channel within the spend per period it was seen at, × H;
 * - (default on) every period inside the data's hull: leverage x₀ᵀ(XᵀX)⁻¹x₀ at most the largest
 *   training leverage, so the plan is not an unseen combination of spend.
 * The method follows the shape of the problem (solve-continuous.ts); the result is rounded to whole
 * cents by largest remainder inside every bound and exactly on a fixed total (round-cents.ts).
 *
 * Cost: microseconds (linear programme) to tens of milliseconds (multi-start local method) for a
 * dozen channels.
 */
import { plainCentsFormatter } from "@/server/planning/allocation";
import { predictDifference, predictTotal } from "@/server/stats";
import { channelBounds } from "./channel-bounds";
import { classifyProblem } from "./classify";
import { bindingConstraints, headroomNote, suggestionCaution } from "./explain";
import { createOutcomeModel, horizonOutcome, planLeverage } from "./outcome-model";
import { enginePlan, periodGroupProblems, wholeHorizon } from "./period-groups";
import { roundToCents } from "./round-cents";
import { type ContinuousSolution, solveContinuous } from "./solve-continuous";
import type { OutcomeEstimate, SuggestionInput, SuggestionProblem, SuggestionResult } from "./types";

/**
 * How far inside the hull's edge the optimiser aims (fractions of the largest leverage): the first
 * margin that survives rounding to cents is used.
 */
const hullMargins = [1e-9, 1e-7, 1e-5, 1e-3];
/** Leverage within a millionth (beyond the margin aimed at) of the largest seen counts as "at the edge". */
const hullBindingTolerance = 1e-6;

/**
 * Suggests an allocation. Never changes the input; the caller shows the result as an unsaved draft.
 *
 * @example suggestAllocation({ record, allocation }).ok // => true, with .suggestion.allocation
 * @returns the suggestion, or `problems` (path + sentence) when the constraints leave no plan
 */
export function suggestAllocation(input: SuggestionInput): SuggestionResult {
  const { record, allocation: state } = input;
  const format = input.format ?? plainCentsFormatter;
  const periodNoun = input.periodNoun ?? "week";
  const H = state.horizonPeriods;
  const names = state.channels.map((channel) => channel.name);
  const groups = input.controlPeriods ?? wholeHorizon(H);
  const groupProblems = periodGroupProblems(record, names, groups, H);
  if (groupProblems.length > 0) return { ok: false, problems: groupProblems };
  const budgetCents = state.mode === "fixed" ? state.totalCents : state.ceilingCents;
  const { bounds, problems } = channelBounds(state, record, input.keepInsideObservedRange ?? true, budgetCents);
  const lowSum = bounds.reduce((sum, bound) => sum + bound.lowCents, 0);
  const highSum = bounds.reduce((sum, bound) => sum + bound.highCents, 0);
  problems.push(...budgetProblems(state.mode, budgetCents, lowSum, highSum, format));
  if (problems.length > 0) return { ok: false, problems };

  const model = createOutcomeModel(record, names, groups, H);
  const labelOf = (name: string) => state.channels.find((channel) => channel.name === name)?.label ?? name;
  const lowCents = bounds.map((bound) => bound.lowCents);
  const highCents = bounds.map((bound) => bound.highCents);
  const free = bounds.flatMap((bound, index) => (bound.lowCents < bound.highCents ? [index] : []));
  const shape = classifyProblem(model, labelOf, bounds.map((bound) => bound.lowCents < bound.highCents));
  const freeBudget = budgetCents - bounds.reduce((sum, bound, index) => sum + (free.includes(index) ? 0 : bound.lowCents), 0);
  const freeLow = free.reduce((sum, j) => sum + lowCents[j], 0);
  const freeHigh = free.reduce((sum, j) => sum + highCents[j], 0);
  const keepHull = input.keepInsideHull ?? true;
  const currentCents = state.channels.map((channel) => channel.amountCents);
  const determined = free.length === 0 || freeBudget <= freeLow || (state.mode === "fixed" && freeBudget >= freeHigh);
  const budget =
    state.mode === "fixed" ? { cents: freeBudget, rule: "equal" as const } : freeBudget >= freeHigh ? null : { cents: freeBudget, rule: "at-most" as const };

  const solveAndRound = (margin: number) => {
    const hullTarget = keepHull ? record.maxTrainingLeverage * (1 - margin) : null;
    let solution: ContinuousSolution;
    if (determined) {
      // Nothing to choose: every free channel at its low end (or, for a fixed total, all at the high end).
      const atHigh = state.mode === "fixed" && free.length > 0 && freeBudget >= freeHigh;
      const amounts = Float64Array.from(bounds, (bound) => (atHigh ? bound.highCents : bound.lowCents));
      const inside = planLeverage(model, amounts) <= record.maxTrainingLeverage;
      solution = { amountsCents: amounts, method: "exact", solver: "linear-programme", iterations: 0, converged: true, hullStatus: keepHull ? (inside ? "kept" : "unreachable") : "off" };
    } else {
      solution = solveContinuous({ model, shape, free, lowCents, highCents, baseAmounts: Float64Array.from(lowCents), budget, hullTarget, currentCents });
    }
    const rawTotal = solution.amountsCents.reduce((sum, value) => sum + value, 0);
    const target = state.mode === "fixed" ? budgetCents : Math.min(budgetCents, highSum, Math.max(lowSum, Math.round(rawTotal)));
    return { solution, amounts: roundToCents(solution.amountsCents, lowCents, highCents, target), margin };
  };
  // Rounding to cents can push a plan on the hull's edge a hair outside it when the hull is narrow
  // along the budget line; aiming further inside and solving again keeps it in.
  let attempt = solveAndRound(hullMargins[0]);
  for (const margin of hullMargins.slice(1)) {
    if (attempt.solution.hullStatus !== "kept" || planLeverage(model, attempt.amounts) <= record.maxTrainingLeverage) break;
    attempt = solveAndRound(margin);
  }
  const { solution } = attempt;
  let amounts = attempt.amounts;
  const notes: string[] = [];

  // Rounding (or a local optimum) must never leave the planner worse off than a plan that already
  // meets every constraint: then the current plan is the suggestion.
  const currentAllowed =
    currentCents.every((amount, j) => amount >= lowCents[j] && amount <= highCents[j]) &&
    (state.mode === "fixed" ? currentCents.reduce((s, v) => s + v, 0) === budgetCents : currentCents.reduce((s, v) => s + v, 0) <= budgetCents) &&
    (solution.hullStatus !== "kept" || planLeverage(model, currentCents) <= record.maxTrainingLeverage);
  if (currentAllowed && horizonOutcome(model, currentCents) > horizonOutcome(model, amounts)) {
    amounts = currentCents;
    notes.push("No plan was found that is predicted to do better than the current one under these constraints.");
  }

  const leverage = planLeverage(model, amounts);
  const hullBinding =
    solution.hullStatus === "kept" && leverage >= record.maxTrainingLeverage * (1 - 2 * attempt.margin - hullBindingTolerance);
  const binding = bindingConstraints({
    state,
    bounds,
    amountsCents: amounts,
    hull: { binding: hullBinding, leverage, maxTrainingLeverage: record.maxTrainingLeverage },
    format,
    periodNoun,
  });
  notes.push(...methodNotes(solution, shape.nonConcaveReasons, leverage, record.maxTrainingLeverage));
  if (solution.hullStatus === "kept" && leverage > record.maxTrainingLeverage) {
    notes.push("Rounded to whole cents, the plan sits a hair beyond the combinations seen in the history.");
  }
  const totalCents = amounts.reduce((sum, value) => sum + value, 0);
  const headroom = headroomNote(state, totalCents, amounts.every((amount, j) => amount >= highCents[j]), format);
  if (headroom) notes.push(headroom);

  const level = input.confidenceLevel ?? record.confidenceLevel;
  const suggestedPlan = enginePlan(groups, names, amounts, H);
  const currentPlan = enginePlan(groups, names, currentCents, H);
  const difference = predictDifference(record, suggestedPlan, currentPlan, { confidenceLevel: level });
  if (difference.difference < 0 && !currentAllowed) {
    notes.push("The current plan breaks some of these constraints, and the best plan that keeps them is predicted to do less.");
  }
  return {
    ok: true,
    suggestion: {
      channels: state.channels.map((channel, j) => ({
        name: channel.name,
        label: channel.label,
        amountCents: amounts[j],
        currentCents: channel.amountCents,
        changeCents: amounts[j] - channel.amountCents,
        locked: channel.locked,
      })),
      allocation: Object.fromEntries(names.map((name, j) => [name, amounts[j]])),
      totalCents,
      predicted: estimate(record, suggestedPlan, level),
      current: estimate(record, currentPlan, level),
      gain: { mean: difference.difference, confidence: [difference.confidenceInterval.lower, difference.confidenceInterval.upper] },
      confidenceLevel: level,
      binding,
      method: solution.method,
      solver: determined ? "none" : solution.solver,
      iterations: solution.iterations,
      converged: solution.converged,
      hull: { status: solution.hullStatus, binding: hullBinding, leverage, maxTrainingLeverage: record.maxTrainingLeverage },
      notes,
      caution: suggestionCaution,
    },
  };
}

function estimate(record: SuggestionInput["record"], plan: ReturnType<typeof enginePlan>, level: number): OutcomeEstimate {
  const total = predictTotal(record, plan, { confidenceLevel: level });
  return {
    mean: total.total,
    confidence: [total.confidenceInterval.lower, total.confidenceInterval.upper],
    prediction: [total.predictionInterval.lower, total.predictionInterval.upper],
  };
}

function budgetProblems(mode: "fixed" | "growing", budget: number, lowSum: number, highSum: number, format: (cents: number) => string): SuggestionProblem[] {
  if (!Number.isInteger(budget) || budget < 0) return [{ path: "total", message: "The total must be a whole, non-negative number of cents." }];
  if (lowSum > budget) {
    const what = mode === "fixed" ? `the fixed total (${format(budget)})` : `the ceiling (${format(budget)})`;
    return [{ path: "total", message: `The channels need at least ${format(lowSum)} (locks, floors and observed ranges), more than ${what}.` }];
  }
  if (mode === "fixed" && highSum < budget) {
    return [{ path: "total", message: `The channels can take at most ${format(highSum)} (locks, ceilings and observed ranges), less than the fixed total (${format(budget)}).` }];
  }
  return [];
}

function methodNotes(solution: ContinuousSolution, reasons: readonly string[], leverage: number, maxLeverage: number): string[] {
  const notes: string[] = [];
  if (solution.method === "local") {
    notes.push(
      `The predicted outcome is not concave in spend here (${reasons.join("; ") || "the fit's curvature"}), so this is the best of ` +
        `${solution.starts ?? 1} local searches, not a guaranteed best plan.`,
    );
  }
  if (!solution.converged) notes.push("The search stopped before it could prove it had converged; the plan meets every constraint but may be slightly improvable.");
  if (solution.hullStatus === "unreachable") {
    notes.push(
      `No plan meets these constraints inside the combinations of spend seen in the history, so this one is outside them ` +
        `(leverage ${leverage.toPrecision(3)}, largest seen ${maxLeverage.toPrecision(3)}): treat its prediction as a guess.`,
    );
  }
  return notes;
}

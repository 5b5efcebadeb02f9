/** Input and output of `suggestAllocation` (the "Suggested split"). */
import type { AllocationState, CentsFormatter } from "@/server/planning/allocation";
import type { FitRecord } from "@/server/stats";
import type { PeriodGroup } from "./period-groups";

export interface SuggestionInput {
  /** The approved fit's record (parsed and verified by the caller). */
  record: FitRecord;
  /**
   * The plan to improve: mode, total (fixed) or ceiling (growing), horizon, and per channel its
   * amount, lock, floor and ceiling. Channel names are the fit's spend columns.
   */
  allocation: AllocationState;
  /**
   * Control values over the horizon, as groups of periods (default: one group, no controls —
   * enough for a fit without controls). Spend values inside the points are ignored.
   */
  controlPeriods?: readonly PeriodGroup[];
  /** Keep each channel within the spend per period the fit saw, × H (default true). */
  keepInsideObservedRange?: boolean;
  /** Keep every period's leverage at most the largest in the history (default true). */
  keepInsideHull?: boolean;
  /** Of the intervals (default: the fit's, usually 0.95). */
  confidenceLevel?: number;
  /** Money in sentences (default "1,200.00"); pass `centsFormatter(money)` for the workspace currency. */
  format?: CentsFormatter;
  /** Word for one period, in sentences (default "week"). */
  periodNoun?: string;
}

/** Mean with its confidence interval (expected value) and prediction interval (realised value). */
export interface OutcomeEstimate {
  mean: number;
  confidence: [number, number];
  prediction: [number, number];
}

export type BindingKind =
  | "locked"
  | "floor"
  | "ceiling"
  | "observed-min"
  | "observed-max"
  | "zero"
  | "total-fixed"
  | "total-ceiling"
  | "hull";

/** A constraint the suggestion stands against, and the sentence that says so. */
export interface BindingConstraint {
  kind: BindingKind;
  /** The channel, for per-channel constraints. */
  channel?: string;
  message: string;
}

export interface SuggestedChannel {
  name: string;
  label: string;
  /** Suggested amount for the horizon, whole cents. */
  amountCents: number;
  currentCents: number;
  changeCents: number;
  locked: boolean;
}

/**
 * - `exact`: the best plan under the constraints, proven by the method (LP, KKT water-filling, or a
 *   convex barrier solve with its duality-gap bound).
 * - `local`: the best of several local searches on a problem that is not concave; a better plan may exist.
 */
export type SuggestionMethod = "exact" | "local";

export type SuggestionSolver = "linear-programme" | "water-filling" | "barrier" | "multi-start-barrier" | "none";

export interface Suggestion {
  channels: SuggestedChannel[];
  /** Channel name → suggested whole cents for the horizon. */
  allocation: Record<string, number>;
  totalCents: number;
  /** Predicted horizon total of the suggestion, and of the current plan. */
  predicted: OutcomeEstimate;
  current: OutcomeEstimate;
  /**
   * Suggestion minus current plan, with the confidence interval of the difference (from the fit's
   * covariance of the two plans' sum, not from the two intervals).
   */
  gain: { mean: number; confidence: [number, number] };
  confidenceLevel: number;
  binding: BindingConstraint[];
  method: SuggestionMethod;
  solver: SuggestionSolver;
  /** Solver steps: channels filled (LP), bisection steps (water-filling) or Newton steps (barrier). */
  iterations: number;
  converged: boolean;
  hull: {
    /** "kept": the plan is inside; "off": not asked; "unreachable": no plan meets it with the other constraints. */
    status: "kept" | "off" | "unreachable";
    binding: boolean;
    /** Largest leverage over the plan's periods, and the largest in the history. */
    leverage: number;
    maxTrainingLeverage: number;
  };
  /** Plain sentences on how to read the suggestion (method, unreachable hull, …). */
  notes: string[];
  caution: string;
}

export interface SuggestionProblem {
  path: string;
  message: string;
}

/** A suggestion, or why none can be made (as the API's error `details`). */
export type SuggestionResult = { ok: true; suggestion: Suggestion } | { ok: false; problems: SuggestionProblem[] };

/**
 * The "Suggested split" (`suggestion`): the allocation an approved fit predicts does best, under
 * the plan's constraints and inside the data it has seen. Pure and isomorphic: no I/O, no
 * `server-only`. See README.md.
 */
export { suggestAllocation } from "./suggest-allocation";
export { applySuggestion } from "./apply-suggestion";
export { suggestionCaution } from "./explain";
export { type PeriodGroup, enginePlan, wholeHorizon } from "./period-groups";
export type {
  BindingConstraint,
  BindingKind,
  OutcomeEstimate,
  SuggestedChannel,
  Suggestion,
  SuggestionInput,
  SuggestionMethod,
  SuggestionProblem,
  SuggestionResult,
  SuggestionSolver,
} from "./types";

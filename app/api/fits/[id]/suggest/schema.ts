import { z } from "zod";
import type { BindingKind, SuggestionMethod, SuggestionSolver } from "@/server/planning/suggest";
import type { OutcomeInterval, ScenarioOutcome } from "@/server/predict/scenario-outcome";

const amount = z.number({ error: "Give each amount as a number." });
const amounts = z.record(z.string().min(1), amount);
const nonNegative = z.record(z.string().min(1), amount.min(0, "Bounds can't be negative."));

/**
 * POST /api/fits/{id}/suggest — the predict request (a plan: amounts per channel for the whole
 * horizon in the workspace currency, controls, horizon, level) plus the rules the suggestion keeps.
 */
export const suggestRequestSchema = z
  .object({
    /** The current plan: spend per channel for the whole horizon, in the workspace currency. */
    allocation: amounts,
    /** Controls over the horizon: a count of periods for on/off controls, a per-period value otherwise. */
    controls: amounts.default({}),
    /** Number of periods (e.g. weeks) the amounts cover. */
    horizon: z.number().int("The horizon is a whole number of periods.").min(1).max(520),
    /** Confidence level of every interval; default the fit's own (usually 0.95). */
    level: z.number().gt(0.5, "Use a level above 0.5.").lt(1, "Use a level below 1.").optional(),
    /** fixed: spend exactly the total; growing: any total up to the ceiling. */
    mode: z.enum(["fixed", "growing"], { error: 'The mode is "fixed" or "growing".' }).default("fixed"),
    /** Fixed mode: the total to spend (default the sum of `allocation`; when given it must equal that sum). */
    total: amount.min(0, "The total can't be negative.").optional(),
    /** Growing mode: the most the plan may spend (required there; at least the sum of `allocation`). */
    ceiling: amount.min(0, "The ceiling can't be negative.").optional(),
    /** Channels held at their current amount. */
    locks: z.array(z.string().min(1)).max(200).default([]),
    /** Per channel: the least it may get over the horizon (currency). */
    floors: nonNegative.default({}),
    /** Per channel: the most it may get over the horizon (currency). */
    ceilings: nonNegative.default({}),
    /** Keep each channel within the spend per period the fit saw (× horizon). Default true. */
    keepInsideObservedRange: z.boolean().default(true),
    /** Keep every period of the plan inside the data's hull (leverage at most the largest seen). Default true. */
    keepInsideHull: z.boolean().default(true),
  })
  .superRefine((body, context) => {
    if (body.mode === "growing" && body.ceiling === undefined) {
      context.addIssue({ code: "custom", path: ["ceiling"], message: "A growing total needs a ceiling: the most the plan may spend." });
    }
    if (body.mode === "fixed" && body.ceiling !== undefined) {
      context.addIssue({ code: "custom", path: ["ceiling"], message: 'A ceiling belongs to mode "growing"; a fixed plan spends exactly its total.' });
    }
  });
export type SuggestRequest = z.input<typeof suggestRequestSchema>;

/** One channel of the suggestion (currency amounts for the whole horizon). */
export interface SuggestedChannelDto {
  name: string;
  label: string;
  amount: number;
  current: number;
  change: number;
  locked: boolean;
}

/** 200 of POST /api/fits/{id}/suggest. Nothing is saved: the planner saves a version. */
export interface SuggestResponse {
  fitId: string;
  /** Channel → suggested amount for the horizon (currency, whole cents). */
  allocation: Record<string, number>;
  total: number;
  channels: SuggestedChannelDto[];
  /** The suggested plan predicted exactly as POST /predict would, compared with the current plan (`difference`). */
  prediction: ScenarioOutcome;
  /** The current plan's horizon total. */
  current: OutcomeInterval;
  /**
   * Suggested minus current expected horizon total, with the confidence interval of the difference
   * (from the fit's covariance of both plans, not from the two intervals). No prediction interval:
   * only one of the two plans will ever be run.
   */
  gain: { mean: number; confidence: [number, number]; prediction?: [number, number] };
  level: number;
  binding: { kind: BindingKind; channel?: string; message: string }[];
  method: SuggestionMethod;
  /** For method "local": how many starts the search took the best of. */
  starts: number | null;
  solver: SuggestionSolver;
  converged: boolean;
  hull: { status: "kept" | "off" | "unreachable"; binding: boolean; leverage: number; maxTrainingLeverage: number };
  notes: string[];
  caution: string;
}

import "server-only";
import type { Actor } from "@/server/authz/actor";
import { assertInWorkspace } from "@/server/authz/scope";
import { AppError } from "@/server/errors";
import type { MoneyLocale } from "@/server/planning/allocation";
import { type CachedFit, getCachedFit } from "./fit-cache";
import { type ScenarioOutcome, type ScenarioPlan, checkScenarioPlan, scenarioOutcome } from "./scenario-outcome";

const statusWords: Record<string, string> = {
  draft: "a draft",
  in_review: "in review",
  changes_requested: "waiting for changes",
  retired: "retired",
};

/**
 * The fit, if the actor's workspace has it (404 otherwise) and it is approved (409 otherwise:
 * drafts never predict, retired fits stop predicting).
 */
export async function requirePredictableFit(actor: Pick<Actor, "workspaceId">, fitId: string, options: { fresh?: boolean } = {}): Promise<CachedFit> {
  const fit = await getCachedFit(fitId, options);
  assertInWorkspace(actor, fit, "fit");
  if (fit.status !== "approved") {
    const word = statusWords[fit.status] ?? fit.status;
    throw new AppError(
      "conflict:fit_not_approved",
      fit.status === "retired"
        ? `The fit "${fit.name}" is retired: it no longer predicts. Plans need an approved fit.`
        : `The fit "${fit.name}" is ${word}, not approved: only approved fits predict.`,
      { details: [{ path: "fitId", message: `status is ${fit.status}`, status: fit.status }] },
    );
  }
  return fit;
}

/** The actor's workspace currency and locale. */
export function moneyOf(actor: Pick<Actor, "currency" | "locale">): MoneyLocale {
  return { currency: actor.currency, locale: actor.locale };
}

/** 422 with one detail per problem when the plan does not fit the fit's channels and controls. */
export function assertPlanFits(fit: CachedFit, plan: ScenarioPlan, prefix = ""): void {
  const problems = checkScenarioPlan(fit.shape, plan);
  if (problems.length > 0) {
    throw new AppError("invalid:plan", problems[0].message, {
      details: problems.map((problem) => ({ ...problem, path: prefix ? `${prefix}.${problem.path}` : problem.path })),
    });
  }
}

/**
 * Predicts a plan on a fit the actor may use: checks the plan (422), then computes with the cached
 * record — no database round trip once the fit is warm.
 */
export function predictPlan(
  fit: CachedFit,
  plan: ScenarioPlan,
  options: { level?: number; money: MoneyLocale; compareTo?: ScenarioPlan },
): ScenarioOutcome {
  assertPlanFits(fit, plan);
  if (options.compareTo) assertPlanFits(fit, options.compareTo, "compareTo");
  return scenarioOutcome(fit.record, fit.shape, plan, options);
}

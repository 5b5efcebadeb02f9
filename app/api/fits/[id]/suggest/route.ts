import { z } from "zod";
import { apiRoute } from "@/server/http/route";
import { moneyOf, requirePredictableFit } from "@/server/predict/service";
import { suggestRequestSchema } from "./schema";
import { suggestForPlan } from "./suggest-plan";

/**
 * The "Suggested split": the allocation an approved fit predicts does best for this plan's total (fixed)
 * or up to its ceiling (growing), keeping locks, floors, ceilings, each channel's observed range and
 * (by default) the data's hull; with the prediction of the suggested plan (as POST /predict), the gain
 * over the current plan with the interval of the difference, the binding constraints in plain words,
 * the method (exact / local) and the caution. Nothing is saved: the planner saves a version.
 * Infeasible or invalid input → 422, fit not approved → 409, another workspace's → 404.
 */
export const POST = apiRoute(
  { permission: "fit:predict", params: z.object({ id: z.uuid() }), body: suggestRequestSchema, maxBodyBytes: 64_000 },
  async ({ actor, params, body }) => {
    const fit = await requirePredictableFit(actor, params.id);
    return suggestForPlan(fit, body, moneyOf(actor));
  },
);

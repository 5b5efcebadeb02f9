import { z } from "zod";
import { apiRoute } from "@/server/http/route";
import { moneyOf, predictPlan, requirePredictableFit } from "@/server/predict/service";
import { predictRequestSchema } from "./schema";

/**
 * Predicted outcome of a plan on an approved fit: per period and horizon total with confidence and
 * prediction intervals, leverage, extrapolation warnings, contributions and (with `compareTo`) the
 * difference from another plan. Unknown channel → 422, fit not approved → 409, another workspace's → 404.
 * Warm requests touch no database (fit record and token identity are cached in memory).
 */
export const POST = apiRoute(
  { permission: "fit:predict", params: z.object({ id: z.uuid() }), body: predictRequestSchema, maxBodyBytes: 64_000 },
  async ({ actor, params, body }) => {
    const fit = await requirePredictableFit(actor, params.id);
    const outcome = predictPlan(fit, body, { level: body.level, money: moneyOf(actor), compareTo: body.compareTo });
    return { fitId: fit.id, ...outcome };
  },
);

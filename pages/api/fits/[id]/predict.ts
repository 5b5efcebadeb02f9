import { idParams } from "@/server/http/route";
import { pagesApiRoute } from "@/server/http/pages-route";
import { moneyOf, predictPlan, requirePredictableFit } from "@/server/predict/service";
import { predictRequestSchema } from "@/server/predict/request-schema";

// The one API route in the Pages Router (why: server/http/pages-route.ts); same checks as apiRoute.
// Next's body parser off (a literal: Next reads it at build time): pagesApiRoute reads and limits the body.
export const config = { api: { bodyParser: false } };

/**
 * Predicted outcome of a plan on an approved fit: per period and horizon total with confidence and
 * prediction intervals, leverage, extrapolation warnings, contributions and (with `compareTo`) the
 * difference from another plan. Unknown channel → 422, fit not approved → 409, another workspace's → 404.
 * Warm requests touch no database (fit record and token identity are cached in memory).
 */
export default pagesApiRoute(
  "POST",
  { permission: "fit:predict", params: idParams, body: predictRequestSchema, maxBodyBytes: 64_000 },
  async ({ actor, params, body }) => {
    const fit = await requirePredictableFit(actor, params.id);
    const outcome = predictPlan(fit, body, { level: body.level, money: moneyOf(actor), compareTo: body.compareTo });
    return { fitId: fit.id, ...outcome };
  },
);

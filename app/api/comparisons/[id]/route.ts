import { z } from "zod";
import { getComparisonView } from "@/server/comparisons/compute";
import { apiRoute, idParams } from "@/server/http/route";

const query = z.object({ baseline: z.coerce.number().int().min(0).max(3).optional() });

/**
 * A saved comparison computed now: per version spend, the saved prediction with CI and PI, warnings,
 * fit and approval, sign-off, and the difference from the baseline (`?baseline=` overrides the saved
 * position) with its own interval when both are on one fit. 404 for another workspace's.
 */
export const GET = apiRoute({ permission: "comparison:read", params: idParams, query }, async ({ actor, params, query }) =>
  getComparisonView(actor, params.id, query.baseline),
);

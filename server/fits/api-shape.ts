import "server-only";
import type { FitDto, FitSummaryDto, FitTrailEntry } from "./types";

/**
 * The fit as the API sends it: identity and state, then every field of the report at the top
 * level (coefficients, rSquared, adjRSquared, sigma, dfResidual, fStatistic, fPValue, n,
 * durbinWatson, …), as issue 4 item 8 lists them.
 */
export function fitResponse(fit: FitDto, trail?: FitTrailEntry[]) {
  const { report, input, ...meta } = fit;
  return {
    id: meta.id,
    name: meta.name,
    status: meta.status,
    datasetId: meta.datasetId,
    datasetName: meta.datasetName,
    authorId: meta.authorId,
    authorName: meta.authorName,
    approvedBy: meta.approvedBy,
    approvedByName: meta.approvedByName,
    createdAt: meta.createdAt,
    updatedAt: meta.updatedAt,
    submittedAt: meta.submittedAt,
    approvedAt: meta.approvedAt,
    retiredAt: meta.retiredAt,
    request: input,
    specification: meta.specification,
    ...report,
    ...(trail ? { trail } : {}),
    links: { self: `/api/fits/${meta.id}`, page: `/fits/${meta.id}` },
  };
}

export function fitSummaryResponse(fit: FitSummaryDto) {
  return { ...fit, links: { self: `/api/fits/${fit.id}`, page: `/fits/${fit.id}` } };
}

/** A fit.run job as the API sends it (the same shape as every job). */
export { jobResponse } from "@/server/jobs/api-shape";

import "server-only";
import { AppError } from "@/server/errors";
import { type FitRecord, type NamedColumns, buildDesign, createFitRecord, fitLeastSquares } from "@/server/stats";
import type { ModelSpecification } from "@/server/stats";
import { holdoutCheck } from "./holdout";
import { buildFitReport } from "./report";
import { engineMessage, isEngineRefusal } from "./specification";
import type { CovarianceInput, FitReport } from "./types";

export type ComputedFit = { record: FitRecord; report: FitReport };

function refusal(error: unknown): AppError {
  return new AppError("invalid:fit", "The engine refused this fit.", { details: [{ path: "terms", message: engineMessage(error) }] });
}

/**
 * Builds the design, fits it and writes the report. Refuses (422) what the engine refuses —
 * n ≤ number of terms, a constant outcome, non-finite values, log(1 + x) of values ≤ −1 — and,
 * unlike the engine (which leaves them out), aliased terms, naming them: an approved fit must
 * estimate every term the analyst asked for.
 *
 * @throws AppError "invalid:fit" (422)
 */
export type FitComputeInput = {
  specification: ModelSpecification;
  columns: NamedColumns;
  level: number;
  covariance: CovarianceInput;
  periodColumn: string | null;
  periodLabels: readonly string[] | null;
  rowNumbers?: ArrayLike<number> | null;
  units: Record<string, string | null>;
};

export function computeFit(input: FitComputeInput): ComputedFit {
  return describeFit(input, solveFit(input));
}

export type SolvedFit = { design: ReturnType<typeof buildDesign>; fit: ReturnType<typeof fitLeastSquares> };

/** The first stage of computeFit: the design and the least-squares solution (refusals as computeFit). */
export function solveFit(input: FitComputeInput): SolvedFit {
  let design;
  let fit;
  try {
    design = buildDesign(input.specification, input.columns);
    fit = fitLeastSquares(design, { confidenceLevel: input.level, covariance: input.covariance });
  } catch (error) {
    if (isEngineRefusal(error)) throw refusal(error);
    throw error;
  }
  if (fit.aliasedTerms.length > 0) {
    const names = fit.aliasedTerms.map((term) => `'${term}'`).join(", ");
    throw new AppError("invalid:fit", `The terms ${names} are linear combinations of other terms (aliased), so their effects cannot be told apart.`, {
      details: fit.aliasedTerms.map((term) => ({
        path: "terms",
        term,
        message: `'${term}' is a linear combination of earlier terms (aliased); remove it or another term it duplicates.`,
      })),
    });
  }
  return { design, fit };
}

/** The second stage of computeFit: the fit record and the report with its diagnostics. */
export function describeFit(input: FitComputeInput, { design, fit }: SolvedFit): ComputedFit {
  let record: FitRecord;
  try {
    record = createFitRecord(fit);
  } catch (error) {
    if (isEngineRefusal(error)) throw refusal(error);
    throw error;
  }
  const report = buildFitReport({
    fit,
    record,
    holdout: holdoutCheck(input, fit),
    periodColumn: input.periodColumn,
    periodLabels: input.periodLabels,
    rowNumbers: input.rowNumbers ?? null,
    outcomeValues: design.outcome,
    units: input.units,
  });
  return { record, report };
}

import "server-only";
import type { Actor } from "@/server/authz/actor";
import { assertInWorkspace } from "@/server/authz/scope";
import { getFitById } from "./store";
import type { CoefficientRow, FitDto, FitReport, FitSummaryDto } from "./types";

/** Fits shown side by side at most (columns stay readable). */
export const MAX_COMPARED_FITS = 4;

export type ComparedFit = Pick<FitSummaryDto, "id" | "name" | "status" | "datasetId" | "datasetName" | "outcome" | "n"> & {
  outcomeUnit: string | null;
  covariance: FitReport["covariance"];
  level: number;
};

/** One whole-model figure across the fits; `better` says which way is better when that is meaningful. */
export type SummaryRow = {
  key: string;
  label: string;
  values: (number | null)[];
  better: "lower" | "higher" | null;
  /** Index of the best value when `better` applies and the fits can be ranked on it. */
  best: number | null;
  format: "number" | "unit" | "p-value" | "count";
};

export type TermRow = { term: string; cells: (Pick<CoefficientRow, "estimate" | "ciLow" | "ciHigh" | "pValue" | "vif"> | null)[] };

export type FitComparison = {
  fits: ComparedFit[];
  /** Same outcome on the same rows of the same history: information criteria and errors compare directly. */
  sameRows: boolean;
  summary: SummaryRow[];
  terms: TermRow[];
  /** Terms whose estimate changes sign, or moves by more than its own interval's half-width, between fits that both have it. */
  shiftingTerms: string[];
};

function bestIndex(values: (number | null)[], better: "lower" | "higher"): number | null {
  let best: number | null = null;
  values.forEach((value, index) => {
    if (value === null || !Number.isFinite(value)) return;
    if (best === null || (better === "lower" ? value < (values[best] as number) : value > (values[best] as number))) best = index;
  });
  return best;
}

/**
 * Puts 2–4 fits side by side: whole-model figures (R², adjusted R², σ, AIC, BIC, residual checks, the
 * held-out check) and every term's estimate with its interval, terms in order of first appearance. AIC,
 * BIC and held-out errors are ranked only when the fits share outcome and rows; otherwise they are
 * shown without a "best". Terms that shift a lot between fits are named: they share credit with terms
 * another fit leaves out.
 */
export function compareFits(fits: FitDto[]): FitComparison {
  const first = fits[0];
  const sameRows = fits.every((fit) => fit.datasetId === first.datasetId && fit.report.outcome === first.report.outcome && fit.report.n === first.report.n);
  const row = (
    key: string,
    label: string,
    pick: (report: FitReport) => number | null | undefined,
    better: SummaryRow["better"],
    format: SummaryRow["format"],
    rankable = true,
  ): SummaryRow => {
    const values = fits.map((fit) => {
      const value = pick(fit.report);
      return value === undefined || value === null || !Number.isFinite(value) ? null : value;
    });
    return { key, label, values, better, best: better && rankable ? bestIndex(values, better) : null, format };
  };
  const holdout = (report: FitReport) => (report.holdout?.status === "done" ? report.holdout : null);
  const summary: SummaryRow[] = [
    row("n", "Observations", (report) => report.n, null, "count"),
    row("terms", "Coefficients", (report) => report.parameterCount, null, "count"),
    row("rSquared", "R²", (report) => report.rSquared, null, "number"),
    row("adjRSquared", "Adjusted R²", (report) => report.adjRSquared, "higher", "number", sameRows),
    row("sigma", "Residual std. error", (report) => report.sigma, "lower", "unit", sameRows),
    row("aic", "AIC", (report) => report.aic, "lower", "number", sameRows),
    row("bic", "BIC", (report) => report.bic, "lower", "number", sameRows),
    row("holdoutMae", "Held-out mean absolute error", (report) => holdout(report)?.meanAbsoluteError, "lower", "unit", sameRows),
    row("holdoutInside", "Held-out periods inside the prediction interval", (report) => holdout(report)?.inside, null, "count"),
    row("durbinWatson", "Durbin–Watson", (report) => report.durbinWatson, null, "number"),
    row("breuschPagan", "Breusch–Pagan p-value", (report) => report.residualTests?.heteroskedasticity?.pValue, null, "p-value"),
    row("jarqueBera", "Jarque–Bera p-value", (report) => report.residualTests?.normality?.pValue, null, "p-value"),
    row("maxVif", "Largest VIF", (report) => (report.collinearity.vif.length > 0 ? Math.max(...report.collinearity.vif) : null), null, "number"),
    row("conditionNumber", "Condition number", (report) => report.conditionNumber, null, "number"),
  ];

  const order: string[] = [];
  for (const fit of fits) for (const coefficient of fit.report.coefficients) if (!order.includes(coefficient.term)) order.push(coefficient.term);
  const terms: TermRow[] = order.map((term) => ({
    term,
    cells: fits.map((fit) => {
      const coefficient = fit.report.coefficients.find((candidate) => candidate.term === term);
      return coefficient ? { estimate: coefficient.estimate, ciLow: coefficient.ciLow, ciHigh: coefficient.ciHigh, pValue: coefficient.pValue, vif: coefficient.vif } : null;
    }),
  }));

  const shiftingTerms = terms
    .filter(({ term, cells }) => {
      if (term === "(Intercept)") return false;
      const present = cells.filter((cell): cell is NonNullable<typeof cell> => cell !== null && cell.estimate !== null && cell.ciLow !== null && cell.ciHigh !== null);
      return present.some((a) =>
        present.some((b) => a !== b && (Math.sign(a.estimate!) !== Math.sign(b.estimate!) || Math.abs(a.estimate! - b.estimate!) > (a.ciHigh! - a.ciLow!) / 2)),
      );
    })
    .map(({ term }) => term);

  return {
    fits: fits.map((fit) => ({
      id: fit.id,
      name: fit.name,
      status: fit.status,
      datasetId: fit.datasetId,
      datasetName: fit.datasetName,
      outcome: fit.report.outcome,
      outcomeUnit: fit.report.units[fit.report.outcome] ?? null,
      n: fit.report.n,
      covariance: fit.report.covariance,
      level: fit.report.level,
    })),
    sameRows,
    summary,
    terms,
    shiftingTerms,
  };
}

/** The fits to compare, in the order asked; another workspace's fit, or a missing one, is 404 for the whole request. */
export async function loadFitsToCompare(actor: Pick<Actor, "workspaceId">, ids: readonly string[]): Promise<FitDto[]> {
  const fits = await Promise.all(ids.map((id) => getFitById(id)));
  return fits.map((fit) => {
    assertInWorkspace(actor, fit, "fit");
    return fit;
  });
}

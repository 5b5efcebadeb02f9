import "server-only";
import { AppError, type ErrorDetail } from "@/server/errors";
import { type ModelSpecification, type TermSpecification, parseModelSpecification } from "@/server/stats";
import type { FitInput } from "./types";

/** The columns of a dataset a fit may use, with their roles and units (from the dataset's column roles). */
export type DatasetColumnInfo = { name: string; role: string; unit: string | null };

/**
 * Turns the analyst's request into the engine's model specification, checking every column
 * against the dataset: the outcome must be the dataset's numeric outcome (or any numeric column),
 * each term a numeric column, no column twice, and log(1 + x) only on spend.
 *
 * @throws AppError "invalid" (422) with one detail per problem
 */
export function specificationFromInput(input: FitInput, columns: readonly DatasetColumnInfo[]): ModelSpecification {
  const details: ErrorDetail[] = [];
  const numeric = new Map(columns.filter((c) => ["outcome", "spend", "control"].includes(c.role)).map((c) => [c.name, c]));
  const known = new Set(columns.map((c) => c.name));
  const describe = (column: string) =>
    known.has(column)
      ? `Column '${column}' is not numeric in this dataset (its role is ${columns.find((c) => c.name === column)?.role}).`
      : `The dataset has no column '${column}'.`;

  if (!numeric.has(input.outcome)) details.push({ path: "outcome", message: describe(input.outcome) });
  const seen = new Set<string>();
  input.terms.forEach((term, index) => {
    if (!numeric.has(term.column)) details.push({ path: `terms.${index}.column`, message: describe(term.column) });
    if (term.column === input.outcome) {
      details.push({ path: `terms.${index}.column`, message: `'${term.column}' is the outcome; it cannot also be a term.` });
    }
    if (seen.has(term.column)) details.push({ path: `terms.${index}.column`, message: `'${term.column}' appears twice.` });
    if (term.role === "control" && term.transform !== "none") {
      details.push({ path: `terms.${index}.transform`, message: `Controls enter the model as they are; '${term.column}' cannot take log(1 + x).` });
    }
    seen.add(term.column);
  });
  const pairs = new Set<string>();
  input.interactions.forEach(([a, b], index) => {
    for (const column of [a, b]) {
      if (!seen.has(column)) {
        details.push({ path: `interactions.${index}`, message: `An interaction may only combine terms of the model; '${column}' is not one.` });
      }
    }
    if (a === b) details.push({ path: `interactions.${index}`, message: `An interaction needs two different columns ('${a}' twice).` });
    const key = [a, b].sort().join("\u0000");
    if (pairs.has(key)) details.push({ path: `interactions.${index}`, message: `The interaction of '${a}' and '${b}' appears twice.` });
    pairs.add(key);
  });
  if (input.terms.length === 0 && !input.intercept) details.push({ path: "terms", message: "Choose at least one term, or keep the intercept." });
  if (details.length > 0) throw new AppError("invalid:fit", "The fit cannot be built as asked.", { details });

  const terms: TermSpecification[] = input.terms.map((term) =>
    term.role === "control"
      ? { kind: "control", column: term.column }
      : term.transform === "log1p"
        ? { kind: "log1p", column: term.column }
        : { kind: "linear", column: term.column },
  );
  for (const [a, b] of input.interactions) terms.push({ kind: "interaction", columns: [a, b] });
  try {
    return parseModelSpecification({ outcome: input.outcome, intercept: input.intercept, terms });
  } catch (error) {
    throw new AppError("invalid:fit", "The fit cannot be built as asked.", {
      details: [{ path: "terms", message: engineMessage(error) }],
    });
  }
}

/** Number of design columns (the intercept counts as one), as the builder shows it before fitting. */
export function designColumnCount(input: Pick<FitInput, "terms" | "interactions" | "intercept">): number {
  return input.terms.length + input.interactions.length + (input.intercept ? 1 : 0);
}

/** Engine input errors read "fitLeastSquares requires …"; anything else is a bug and is rethrown. */
export const isEngineRefusal = (error: unknown) => error instanceof Error && / requires /.test(error.message);

/** The engine's messages say "fitLeastSquares requires …"; users read the requirement without the function name. */
export function engineMessage(error: unknown): string {
  const message = error instanceof Error ? error.message : String(error);
  const stripped = message.replace(/^[a-zA-Z]+ requires /, "The fit requires ");
  return stripped.endsWith(".") ? stripped : `${stripped}.`;
}

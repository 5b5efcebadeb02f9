/**
 * Model specification: which columns enter the regression and how. One specification builds the
 * design matrix from the data (see `buildDesign`) and evaluates a scenario point for prediction
 * (see `evaluateScenarioPoint`), so training and prediction can never disagree about a term.
 *
 * It is plain, JSON-serialisable data: it is stored inside fit records and sent to the browser.
 */

/** Name given to the intercept column of the design matrix (as R's `lm` prints it). */
export const interceptTermName = "(Intercept)";

/**
 * One term of the model.
 * - `linear`: the column as it is (a spend channel the planner moves).
 * - `control`: the column as it is, but a control variable (price, season, weather) that plans hold fixed.
 * - `log1p`: log(1 + x), a diminishing-returns response to spend; requires x > −1.
 * - `power`: x^exponent (integer 2 to 12), for polynomial response curves; computed in double-double.
 * - `interaction`: the product of two columns (synergy between two channels); computed in double-double.
 */
export type TermSpecification =
  | { kind: "linear"; column: string; name?: string }
  | { kind: "control"; column: string; name?: string }
  | { kind: "log1p"; column: string; name?: string }
  | { kind: "power"; column: string; exponent: number; name?: string }
  | { kind: "interaction"; columns: readonly [string, string]; name?: string };

/** The kinds of term, in the order the documentation lists them. */
export const termKinds = ["linear", "control", "log1p", "power", "interaction"] as const;

export type TermKind = (typeof termKinds)[number];

/** A regression of `outcome` on `terms`, with or without an intercept. */
export interface ModelSpecification {
  outcome: string;
  intercept: boolean;
  terms: readonly TermSpecification[];
}

/** Largest exponent a `power` term accepts: beyond it polynomial columns overflow or say nothing useful. */
export const largestPowerExponent = 12;

/**
 * The display name of a term: its `name` if given, else `tv`, `log1p(tv)`, `tv^2` or `tv:radio`
 * (R's notation for an interaction).
 */
export function termName(term: TermSpecification): string {
  if (term.name !== undefined) return term.name;
  switch (term.kind) {
    case "linear":
    case "control":
      return term.column;
    case "log1p":
      return `log1p(${term.column})`;
    case "power":
      return `${term.column}^${term.exponent}`;
    case "interaction":
      return `${term.columns[0]}:${term.columns[1]}`;
  }
}

/** The raw data columns a term reads. */
export function termColumns(term: TermSpecification): readonly string[] {
  return term.kind === "interaction" ? term.columns : [term.column];
}

/** Names of the design matrix columns: the intercept first (if any), then each term in order. */
export function designTermNames(specification: ModelSpecification): string[] {
  const names = specification.terms.map(termName);
  return specification.intercept ? [interceptTermName, ...names] : names;
}

/** Every raw predictor column the specification reads, each once, in first-use order. */
export function predictorColumns(specification: ModelSpecification): string[] {
  const seen = new Set<string>();
  for (const term of specification.terms) for (const column of termColumns(term)) seen.add(column);
  return [...seen];
}

function isNonEmptyString(value: unknown): value is string {
  return typeof value === "string" && value.length > 0;
}

function parseTerm(value: unknown, position: number): TermSpecification {
  const where = `term ${position}`;
  if (typeof value !== "object" || value === null) {
    throw new Error(`parseModelSpecification requires ${where} to be an object`);
  }
  const candidate = value as Record<string, unknown>;
  const name = candidate.name;
  if (name !== undefined && !isNonEmptyString(name)) {
    throw new Error(`parseModelSpecification requires ${where} name to be a non-empty string`);
  }
  const named = name === undefined ? {} : { name };
  const kind = candidate.kind;
  if (kind === "interaction") {
    const columns = candidate.columns;
    if (!Array.isArray(columns) || columns.length !== 2 || !columns.every(isNonEmptyString)) {
      throw new Error(`parseModelSpecification requires ${where} (interaction) to name exactly two columns`);
    }
    return { kind, columns: [columns[0], columns[1]], ...named };
  }
  if (kind !== "linear" && kind !== "control" && kind !== "log1p" && kind !== "power") {
    throw new Error(`parseModelSpecification requires ${where} kind to be one of ${termKinds.join(", ")} (got ${String(kind)})`);
  }
  const column = candidate.column;
  if (!isNonEmptyString(column)) {
    throw new Error(`parseModelSpecification requires ${where} (${kind}) to name a column`);
  }
  if (kind === "power") {
    const exponent = candidate.exponent;
    if (typeof exponent !== "number" || !Number.isInteger(exponent) || exponent < 2 || exponent > largestPowerExponent) {
      throw new Error(`parseModelSpecification requires ${where} (power) exponent to be an integer from 2 to ${largestPowerExponent} (got ${String(exponent)})`);
    }
    return { kind, column, exponent, ...named };
  }
  return { kind, column, ...named };
}

/**
 * Checks untrusted input (a request body, a stored record) and returns it as a specification.
 *
 * @throws if the shape is wrong, a term kind is unknown, two terms share a name, a term reuses the
 *   outcome column, or there are no terms and no intercept.
 */
export function parseModelSpecification(value: unknown): ModelSpecification {
  if (typeof value !== "object" || value === null) {
    throw new Error("parseModelSpecification requires an object");
  }
  const candidate = value as Record<string, unknown>;
  const { outcome, intercept, terms } = candidate;
  if (!isNonEmptyString(outcome)) throw new Error("parseModelSpecification requires an outcome column name");
  if (typeof intercept !== "boolean") throw new Error("parseModelSpecification requires intercept to be true or false");
  if (!Array.isArray(terms)) throw new Error("parseModelSpecification requires a terms array");
  const parsedTerms = terms.map((term, position) => parseTerm(term, position));
  const specification: ModelSpecification = { outcome, intercept, terms: parsedTerms };
  if (parsedTerms.length === 0 && !intercept) {
    throw new Error("parseModelSpecification requires at least one term or an intercept");
  }
  const names = designTermNames(specification);
  const duplicate = names.find((name, position) => names.indexOf(name) !== position);
  if (duplicate !== undefined) {
    throw new Error(`parseModelSpecification requires distinct term names ('${duplicate}' appears twice)`);
  }
  if (predictorColumns(specification).includes(outcome)) {
    throw new Error(`parseModelSpecification requires the outcome '${outcome}' not to be a predictor as well`);
  }
  return specification;
}

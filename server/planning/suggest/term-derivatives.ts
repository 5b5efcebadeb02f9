/**
 * Model terms compiled to column indices, with their values and first and second derivatives with
 * respect to raw columns. The optimiser evaluates them thousands of times per suggestion, so they
 * read a Float64Array of column values instead of named points (building a named point per
 * evaluation cost more than everything else together). Closed forms, exact:
 * - linear, control x: x; 1; 0
 * - log1p(x): log(1 + x); 1/(1 + x); −1/(1 + x)²
 * - x^k: x^k; k·x^(k−1); k(k−1)·x^(k−2)
 * - a·b: a·b; b for a and a for b (2a when both are a); mixed second derivative 1 (2 when a = b)
 * Values match the engine's `evaluateScenarioPoint` to rounding (the engine's final predictions
 * are what the planner sees; these only steer the search).
 */
import type { TermSpecification } from "@/server/stats";

export interface CompiledTerm {
  kind: "linear" | "log1p" | "power" | "product";
  first: number;
  /** Second column of a product, else −1. */
  second: number;
  exponent: number;
}

/** Compiles a term against a column index. */
export function compileTerm(term: TermSpecification, indexOf: (column: string) => number): CompiledTerm {
  switch (term.kind) {
    case "linear":
    case "control":
      return { kind: "linear", first: indexOf(term.column), second: -1, exponent: 1 };
    case "log1p":
      return { kind: "log1p", first: indexOf(term.column), second: -1, exponent: 1 };
    case "power":
      return { kind: "power", first: indexOf(term.column), second: -1, exponent: term.exponent };
    case "interaction":
      return { kind: "product", first: indexOf(term.columns[0]), second: indexOf(term.columns[1]), exponent: 2 };
  }
}

/** The term's value at the column values x. */
export function termValue(term: CompiledTerm, x: Float64Array): number {
  switch (term.kind) {
    case "linear":
      return x[term.first];
    case "log1p":
      return Math.log1p(x[term.first]);
    case "power":
      return x[term.first] ** term.exponent;
    case "product":
      return x[term.first] * x[term.second];
  }
}

/** ∂term/∂x[column] (0 when the term does not read the column). */
export function termFirstDerivative(term: CompiledTerm, x: Float64Array, column: number): number {
  switch (term.kind) {
    case "linear":
      return term.first === column ? 1 : 0;
    case "log1p":
      return term.first === column ? 1 / (1 + x[column]) : 0;
    case "power":
      return term.first === column ? term.exponent * x[column] ** (term.exponent - 1) : 0;
    case "product":
      return (term.first === column ? x[term.second] : 0) + (term.second === column ? x[term.first] : 0);
  }
}

/** ∂²term/∂x[a]∂x[b]. */
export function termSecondDerivative(term: CompiledTerm, x: Float64Array, a: number, b: number): number {
  switch (term.kind) {
    case "linear":
      return 0;
    case "log1p":
      return term.first === a && a === b ? -1 / (1 + x[a]) ** 2 : 0;
    case "power":
      return term.first === a && a === b ? term.exponent * (term.exponent - 1) * x[a] ** (term.exponent - 2) : 0;
    case "product":
      return (term.first === a && term.second === b ? 1 : 0) + (term.second === a && term.first === b ? 1 : 0);
  }
}

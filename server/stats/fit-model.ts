/**
 * The one-call path from named columns to a fit: `buildDesign` then `fitLeastSquares`.
 */

import { type NamedColumns, buildDesign } from "./build-design";
import { type FitOptions, type LeastSquaresFit, fitLeastSquares } from "./fit-least-squares";
import type { ModelSpecification } from "./model-specification";

/**
 * @example fitModel({ outcome: "sales", intercept: true, terms: [{ kind: "linear", column: "tv" }] },
 *   { sales: [3, 5, 7, 10], tv: [1, 2, 3, 4] }).rSquared // => 0.98…
 * @throws see `buildDesign` and `fitLeastSquares`
 */
export function fitModel(specification: ModelSpecification, columns: NamedColumns, options: FitOptions = {}): LeastSquaresFit {
  return fitLeastSquares(buildDesign(specification, columns), options);
}

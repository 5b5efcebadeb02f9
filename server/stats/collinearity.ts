/**
 * Collinearity diagnostics: the correlation matrix of the predictors and the variance inflation
 * factor (VIF) of each.
 *
 * VIFⱼ = 1 / (1 − R²ⱼ), where R²ⱼ is from regressing predictor j on the others; equivalently the
 * j-th diagonal entry of the inverse correlation matrix. Reference: D. W. Marquardt,
 * "Generalized inverses, ridge regression, biased linear estimation, and nonlinear estimation",
 * Technometrics 12 (1970); Montgomery, Peck & Vining, Introduction to Linear Regression Analysis,
 * §9.4.2 (VIF above 5–10 signals trouble).
 *
 * With an intercept in the first column, Householder QR has already centred the other columns:
 * the trailing block R₂₂ of R satisfies R₂₂ᵀR₂₂ = Σ (xᵢ − x̄)(xᵢ − x̄)ᵀ. So correlations and VIFs
 * come from R in O(p³), without forming cross-product sums that cancel (the "raw sums" trap).
 * Without an intercept VIFs are uncentred (regressions through the origin) and flagged as such;
 * the correlations are then computed by a centred two-pass sweep over the data.
 */

/** Correlations and VIFs for the estimable predictors (the intercept excluded). */
export interface Collinearity {
  terms: string[];
  /** Pearson correlations, terms × terms row-major. */
  correlations: Float64Array;
  /** VIF of each term, in `terms` order. */
  varianceInflationFactors: Float64Array;
  /** False for models without intercept, whose VIFs are uncentred. */
  varianceInflationCentred: boolean;
}

/**
 * @param terms names of the estimable design columns (the intercept first if `hasIntercept`)
 * @param columns the same columns' data (used only without intercept, for the correlations)
 * @param scaledUpper, scaledInverseUpper R̃ and R̃⁻¹ of the column-scaled design (rank × rank)
 * Cost: O(rank³), plus n·rank² without intercept.
 */
export function collinearityDiagnostics(
  terms: readonly string[],
  columns: readonly Float64Array[],
  scaledUpper: Float64Array,
  scaledInverseUpper: Float64Array,
  hasIntercept: boolean,
): Collinearity {
  const rank = terms.length;
  const first = hasIntercept ? 1 : 0;
  const size = rank - first;
  const varianceInflationFactors = new Float64Array(size);
  for (let index = 0; index < size; index++) {
    const column = first + index;
    // ‖column j of R₂₂‖² × ‖row j of R₂₂⁻¹‖² (R₂₂⁻¹ is the trailing block of R⁻¹).
    let columnNormSquared = 0;
    for (let row = first; row <= column; row++) columnNormSquared += scaledUpper[row * rank + column] ** 2;
    let inverseRowNormSquared = 0;
    for (let inner = column; inner < rank; inner++) inverseRowNormSquared += scaledInverseUpper[column * rank + inner] ** 2;
    varianceInflationFactors[index] = columnNormSquared * inverseRowNormSquared;
  }
  const correlations = hasIntercept
    ? correlationsFromTrailingBlock(scaledUpper, rank)
    : centredCorrelations(columns);
  return {
    terms: terms.slice(first),
    correlations,
    varianceInflationFactors,
    varianceInflationCentred: hasIntercept,
  };
}

/** Correlations from C = R₂₂ᵀR₂₂ (centred cross products, up to the common column scaling). */
function correlationsFromTrailingBlock(scaledUpper: Float64Array, rank: number): Float64Array {
  const size = rank - 1;
  const crossProducts = new Float64Array(size * size);
  for (let a = 0; a < size; a++) {
    for (let b = a; b < size; b++) {
      let sum = 0;
      for (let row = 1; row <= a + 1; row++) sum += scaledUpper[row * rank + a + 1] * scaledUpper[row * rank + b + 1];
      crossProducts[a * size + b] = sum;
      crossProducts[b * size + a] = sum;
    }
  }
  return normaliseToCorrelations(crossProducts, size);
}

/** Centred cross products by the two-pass algorithm, then normalised. Cost: n·p²/2 flops. */
function centredCorrelations(columns: readonly Float64Array[]): Float64Array {
  const size = columns.length;
  const means = columns.map((values) => {
    let sum = 0;
    for (let row = 0; row < values.length; row++) sum += values[row];
    const mean = sum / values.length;
    // One correction pass (Chan, Golub & LeVeque): the mean of the deviations from the first mean.
    let deviationSum = 0;
    for (let row = 0; row < values.length; row++) deviationSum += values[row] - mean;
    return mean + deviationSum / values.length;
  });
  const crossProducts = new Float64Array(size * size);
  for (let a = 0; a < size; a++) {
    for (let b = a; b < size; b++) {
      const first = columns[a];
      const second = columns[b];
      let sum = 0;
      for (let row = 0; row < first.length; row++) sum += (first[row] - means[a]) * (second[row] - means[b]);
      crossProducts[a * size + b] = sum;
      crossProducts[b * size + a] = sum;
    }
  }
  return normaliseToCorrelations(crossProducts, size);
}

function normaliseToCorrelations(crossProducts: Float64Array, size: number): Float64Array {
  const correlations = new Float64Array(size * size);
  for (let a = 0; a < size; a++) {
    for (let b = 0; b < size; b++) {
      correlations[a * size + b] =
        a === b ? 1 : crossProducts[a * size + b] / Math.sqrt(crossProducts[a * size + a] * crossProducts[b * size + b]);
    }
  }
  return correlations;
}

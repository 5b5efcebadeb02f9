/**
 * Per-observation regression diagnostics from residuals rᵢ and leverages hᵢ.
 * Reference: Montgomery, Peck & Vining, Introduction to Linear Regression Analysis (5th ed.),
 * §4.2 (studentized residuals) and §6.3 (Cook's distance); R. D. Cook, "Detection of influential
 * observation in linear regression", Technometrics 19 (1977); J. Durbin & G. S. Watson, "Testing
 * for serial correlation in least squares regression", Biometrika 37–38 (1950–51).
 * Observations with leverage 1 get NaN: their residual is zero by construction and carries no
 * information.
 */

/** Internally studentized residuals rᵢ / (s √(1 − hᵢ)). Cost: O(n). */
export function studentizedResiduals(residuals: Float64Array, leverages: Float64Array, residualStandardError: number): Float64Array {
  return Float64Array.from(residuals, (residual, row) =>
    leverages[row] < 1 ? residual / (residualStandardError * Math.sqrt(1 - leverages[row])) : NaN,
  );
}

/**
 * Externally studentized residuals tᵢ = rᵢ / (s₍ᵢ₎ √(1 − hᵢ)), with s₍ᵢ₎ the residual standard
 * error without observation i, via the identity tᵢ = eᵢ √((n − p − 1)/(n − p − eᵢ²)) for the
 * internally studentized eᵢ. Cost: O(n).
 */
export function externallyStudentizedResiduals(internal: Float64Array, residualDegreesOfFreedom: number): Float64Array {
  return Float64Array.from(internal, (value) => {
    const remaining = residualDegreesOfFreedom - value * value;
    return remaining > 0 ? value * Math.sqrt((residualDegreesOfFreedom - 1) / remaining) : NaN;
  });
}

/** Cook's distance Dᵢ = eᵢ² hᵢ / (p (1 − hᵢ)), eᵢ internally studentized, p the rank. Cost: O(n). */
export function cooksDistances(internal: Float64Array, leverages: Float64Array, rank: number): Float64Array {
  return Float64Array.from(internal, (value, row) => (value * value * leverages[row]) / (rank * (1 - leverages[row])));
}

/**
 * Durbin–Watson statistic Σ(rᵢ − rᵢ₋₁)² / Σrᵢ², rows in time order: near 2 without first-order
 * autocorrelation, towards 0 with positive autocorrelation. Cost: O(n).
 */
export function durbinWatson(residuals: Float64Array): number {
  let differenceSum = 0;
  let squareSum = residuals[0] * residuals[0];
  for (let row = 1; row < residuals.length; row++) {
    const difference = residuals[row] - residuals[row - 1];
    differenceSum += difference * difference;
    squareSum += residuals[row] * residuals[row];
  }
  return differenceSum / squareSum;
}

/** Fitted values ŷ = y − r. Cost: O(n). */
export function fittedValues(outcome: Float64Array, residuals: Float64Array): Float64Array {
  return Float64Array.from(outcome, (value, row) => value - residuals[row]);
}

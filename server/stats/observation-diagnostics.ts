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
  // Indexed loops, not Float64Array.from(array, map): that goes through the iterator protocol and
  // a temporary list, several times slower and larger on a million rows.
  const result = new Float64Array(residuals.length);
  for (let row = 0; row < residuals.length; row++) {
    const leverage = leverages[row];
    result[row] = leverage < 1 ? residuals[row] / (residualStandardError * Math.sqrt(1 - leverage)) : NaN;
  }
  return result;
}

/**
 * Externally studentized residuals tᵢ = rᵢ / (s₍ᵢ₎ √(1 − hᵢ)), with s₍ᵢ₎ the residual standard
 * error without observation i, via the identity tᵢ = eᵢ √((n − p − 1)/(n − p − eᵢ²)) for the
 * internally studentized eᵢ. Cost: O(n).
 */
export function externallyStudentizedResiduals(internal: Float64Array, residualDegreesOfFreedom: number): Float64Array {
  const result = new Float64Array(internal.length);
  for (let row = 0; row < internal.length; row++) {
    const value = internal[row];
    const remaining = residualDegreesOfFreedom - value * value;
    result[row] = remaining > 0 ? value * Math.sqrt((residualDegreesOfFreedom - 1) / remaining) : NaN;
  }
  return result;
}

/** Cook's distance Dᵢ = eᵢ² hᵢ / (p (1 − hᵢ)), eᵢ internally studentized, p the rank. Cost: O(n). */
export function cooksDistances(internal: Float64Array, leverages: Float64Array, rank: number): Float64Array {
  const result = new Float64Array(internal.length);
  for (let row = 0; row < internal.length; row++) {
    const value = internal[row];
    result[row] = (value * value * leverages[row]) / (rank * (1 - leverages[row]));
  }
  return result;
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
  const result = new Float64Array(outcome.length);
  for (let row = 0; row < outcome.length; row++) result[row] = outcome[row] - residuals[row];
  return result;
}

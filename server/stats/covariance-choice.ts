/**
 * Which covariance matrix of β̂ the standard errors, t statistics, p-values and confidence
 * intervals use.
 * - `classical`: s²(XᵀX)⁻¹, valid when errors are independent with constant variance.
 * - `hc3`: heteroskedasticity-consistent, MacKinnon & White (1985); robust to unequal variances
 *   and the best of the HC family in small samples (Long & Ervin, 2000).
 * - `newey-west`: heteroskedasticity- and autocorrelation-consistent (HAC) with Bartlett weights,
 *   Newey & West (1987), for weekly series whose residuals are autocorrelated. Rows must be in
 *   time order. `lag` is the number of autocorrelation lags included; when omitted it is
 *   ⌊4 (n/100)^(2/9)⌋ (Newey & West, 1994), and the fit reports the lag it used.
 */
export type CovarianceChoice =
  | { type: "classical" }
  | { type: "hc3" }
  | { type: "newey-west"; lag?: number };

export type CovarianceType = CovarianceChoice["type"];

/** The Newey–West (1994) rule-of-thumb lag for n observations. */
export function defaultNeweyWestLag(observationCount: number): number {
  return Math.floor(4 * (observationCount / 100) ** (2 / 9));
}

/**
 * Checks a covariance choice and fills in the Newey–West lag.
 *
 * @throws for an unknown type or a lag that is negative, fractional or not below n
 */
export function resolveCovarianceChoice(
  choice: CovarianceChoice | undefined,
  observationCount: number,
  caller: string,
): { type: CovarianceType; lag: number | null } {
  const resolved = choice ?? { type: "classical" };
  switch (resolved.type) {
    case "classical":
    case "hc3":
      return { type: resolved.type, lag: null };
    case "newey-west": {
      const lag = resolved.lag ?? defaultNeweyWestLag(observationCount);
      if (!Number.isInteger(lag) || lag < 0 || lag >= observationCount) {
        throw new Error(`${caller} requires a Newey-West lag that is an integer from 0 to n - 1 (got ${lag})`);
      }
      return { type: "newey-west", lag };
    }
    default:
      throw new Error(`${caller} requires covariance type classical, hc3 or newey-west (got ${String((resolved as { type: unknown }).type)})`);
  }
}

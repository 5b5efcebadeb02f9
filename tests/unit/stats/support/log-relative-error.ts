/**
 * Log relative error (LRE): the number of significant digits two numbers share,
 * −log₁₀(|computed − certified| / |certified|), capped at 15 (NIST certifies 15 digits).
 * Reference: B. D. McCullough, "Assessing the reliability of statistical software: Part I",
 * The American Statistician 52 (1998), which introduced LRE for the NIST StRD.
 * When the certified value is exactly 0 (Wampler1–2's standard deviations) a relative error is
 * undefined; the absolute error is measured against `scale` (the root mean square of y) instead.
 */
export const maximumLogRelativeError = 15;

export function logRelativeError(computed: number, certified: number, scale: number): number {
  if (Number.isNaN(computed)) return 0;
  const error = certified === 0 ? Math.abs(computed) / scale : Math.abs(computed - certified) / Math.abs(certified);
  if (error === 0) return maximumLogRelativeError;
  return Math.max(0, Math.min(maximumLogRelativeError, -Math.log10(error)));
}

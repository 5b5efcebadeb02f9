/**
 * Double-double arithmetic: a value is carried as an unevaluated sum `high + low` of two doubles,
 * which gives about 106 bits (32 decimal digits) of significand.
 *
 * Reference: T. J. Dekker, "A floating-point technique for extending the available precision",
 * Numerische Mathematik 18 (1971); D. E. Knuth, The Art of Computer Programming vol. 2, §4.2.2
 * (the error-free sum). The error-free product below uses Veltkamp's splitting because JavaScript
 * has no fused multiply-add.
 *
 * The hot loops (term values, refinement residuals, the Gram matrix) inline these two steps for
 * speed — a call per element costs more than the arithmetic; the functions here are the readable
 * statement of the same algebra, and the tests check them exactly.
 */

/** 2^27 + 1: multiplying by it and subtracting splits a double into two 26-bit halves. */
export const veltkampSplitFactor = 134217729;

/** A double-double value `high + low` with |low| ≤ ulp(high) / 2. */
export interface DoubleDouble {
  high: number;
  low: number;
}

/**
 * Error-free sum (Knuth's TwoSum): returns `s` and `e` with `s = fl(a + b)` and `a + b = s + e` exactly.
 * Cost: 6 flops.
 */
export function twoSum(a: number, b: number): DoubleDouble {
  const sum = a + b;
  const bVirtual = sum - a;
  const error = a - (sum - bVirtual) + (b - bVirtual);
  return { high: sum, low: error };
}

/**
 * Error-free product (Dekker's TwoProduct with Veltkamp splitting): returns `p` and `e` with
 * `p = fl(a × b)` and `a × b = p + e` exactly, barring overflow. Cost: 17 flops.
 */
export function twoProduct(a: number, b: number): DoubleDouble {
  const product = a * b;
  const aScaled = veltkampSplitFactor * a;
  const aHigh = aScaled - (aScaled - a);
  const aLow = a - aHigh;
  const bScaled = veltkampSplitFactor * b;
  const bHigh = bScaled - (bScaled - b);
  const bLow = b - bHigh;
  const error = aHigh * bHigh - product + aHigh * bLow + aLow * bHigh + aLow * bLow;
  return { high: product, low: error };
}

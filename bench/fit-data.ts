// Benchmark data: a design matrix generated in place (column-major, intercept first) so that no
// temporary copy inflates the process's peak memory before the measurement starts.
import type { Design } from "../server/stats";

/** mulberry32: a small seeded generator (public domain), uniform in [0, 1). */
function createUniform(seed: number) {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let mixed = state;
    mixed = Math.imul(mixed ^ (mixed >>> 15), mixed | 1);
    mixed ^= mixed + Math.imul(mixed ^ (mixed >>> 7), mixed | 61);
    return ((mixed ^ (mixed >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * n weeks × p terms of spend-like data: an intercept and p − 1 positive, mildly correlated
 * channels; sales = Σ β x + noise.
 */
export function generateDesign(rowCount: number, columnCount: number, seed = 20240601): Design {
  const uniform = createUniform(seed);
  const values = new Float64Array(rowCount * columnCount);
  values.fill(1, 0, rowCount);
  for (let column = 1; column < columnCount; column++) {
    const offset = column * rowCount;
    const level = 20 + 10 * column;
    for (let row = 0; row < rowCount; row++) {
      // Each channel leans a little on the previous one (budgets move together).
      const previous = column > 1 ? values[offset - rowCount + row] : level;
      values[offset + row] = level * (0.5 + uniform()) + 0.2 * previous;
    }
  }
  const outcome = new Float64Array(rowCount);
  for (let row = 0; row < rowCount; row++) {
    let sales = 1000;
    for (let column = 1; column < columnCount; column++) sales += (1 + column / 4) * values[column * rowCount + row];
    // Noise: a sum of uniforms (roughly normal), standard deviation about 100.
    outcome[row] = sales + 100 * (uniform() + uniform() + uniform() - 1.5) * 2;
  }
  const termNames = ["(Intercept)", ...Array.from({ length: columnCount - 1 }, (_, index) => `channel${index + 1}`)];
  const ranges = Object.fromEntries(termNames.map((name) => [name, { minimum: 0, maximum: 1 }]));
  return {
    specification: {
      outcome: "sales",
      intercept: true,
      terms: termNames.slice(1).map((column) => ({ kind: "linear" as const, column })),
    },
    termNames,
    rowCount,
    columnCount,
    values,
    lowOrderParts: termNames.map(() => null),
    outcome,
    hasIntercept: true,
    columnRanges: ranges,
    termRanges: ranges,
  };
}

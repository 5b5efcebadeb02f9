// Seeded pseudo-random numbers for reproducible test data: mulberry32 (Tommy Ettinger's public
// domain 32-bit generator) for uniforms and the Box–Muller transform for normals.
export function createRandom(seed: number) {
  let state = seed >>> 0;
  const uniform = () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let mixed = state;
    mixed = Math.imul(mixed ^ (mixed >>> 15), mixed | 1);
    mixed ^= mixed + Math.imul(mixed ^ (mixed >>> 7), mixed | 61);
    return ((mixed ^ (mixed >>> 14)) >>> 0) / 4294967296;
  };
  const normal = () => {
    const radius = Math.sqrt(-2 * Math.log(1 - uniform()));
    return radius * Math.cos(2 * Math.PI * uniform());
  };
  return { uniform, normal };
}

/** Weekly marketing-like data: spend columns, a control, and sales = linear signal + noise. */
export function marketingData(rowCount: number, seed: number, noise = 50) {
  const random = createRandom(seed);
  const tv = Float64Array.from({ length: rowCount }, () => 50 + 150 * random.uniform());
  const radio = Float64Array.from({ length: rowCount }, (_, row) => 10 + 40 * random.uniform() + 0.1 * tv[row]);
  const search = Float64Array.from({ length: rowCount }, () => 20 + 60 * random.uniform());
  const price = Float64Array.from({ length: rowCount }, () => 9 + 2 * random.uniform());
  const sales = Float64Array.from(
    { length: rowCount },
    (_, row) =>
      1000 + 2.5 * tv[row] + 4 * radio[row] + 80 * Math.log1p(search[row]) - 30 * price[row] + noise * random.normal(),
  );
  return { sales, tv, radio, search, price };
}

/**
 * A small seeded pseudo-random generator (mulberry32) so the demo history is the same on every machine.
 * Not for cryptography; only for reproducible demo numbers.
 */
export function createRandom(seed: number) {
  let state = seed >>> 0;
  const uniform = (): number => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  // Box–Muller: two uniforms give one standard normal draw.
  const normal = (mean = 0, sd = 1): number => {
    const u1 = Math.max(uniform(), Number.EPSILON);
    const u2 = uniform();
    return mean + sd * Math.sqrt(-2 * Math.log(u1)) * Math.cos(2 * Math.PI * u2);
  };
  return { uniform, normal };
}

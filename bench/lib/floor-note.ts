// The predict route's p99 target (25 ms) assumes the framework's own floor the issue describes: a
// constant route at about 1,000 requests/s with p99 ≈ 22 ms on these 2-core machines. When the
// constant route itself is slower than the target, no route can meet it; the reader should know.

export const PREDICT_P99_TARGET_MS = 25;

/** A sentence when the constant route's own p99 is above the target, else undefined. */
export function slowFloorNote(floor: { requestsPerSecond: number; p99: number }, targetMs = PREDICT_P99_TARGET_MS): string | undefined {
  if (floor.p99 <= targetMs) return undefined;
  return (
    `GET /api/ping, a constant answer, itself has p99 ${floor.p99.toFixed(0)} ms at ${floor.requestsPerSecond.toFixed(0)} req/s: ` +
    `this machine is slower now than the floor the ${targetMs} ms target assumes (about 1,000 req/s, p99 ≈ 22 ms); ` +
    `compare the predict route with ping (ratio column) and run again when the machine is quieter.`
  );
}

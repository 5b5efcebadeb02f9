// The predict benchmark says so when the framework's own constant route is already slower than the
// p99 target, instead of leaving a reader to blame the route.
import { describe, expect, it } from "vitest";
import { PREDICT_P99_TARGET_MS, slowFloorNote } from "../../../bench/lib/floor-note";

describe("slowFloorNote", () => {
  it("is silent while the constant route meets the target itself", () => {
    expect(slowFloorNote({ requestsPerSecond: 1_100, p99: 18 })).toBeUndefined();
    expect(slowFloorNote({ requestsPerSecond: 1_000, p99: PREDICT_P99_TARGET_MS })).toBeUndefined();
  });

  it("names the constant route's own figures when its p99 is above the target", () => {
    const note = slowFloorNote({ requestsPerSecond: 507.4, p99: 62 });
    expect(note).toMatch(/^GET \/api\/ping, a constant answer, itself has p99 62 ms at 507 req\/s: /);
    expect(note).toContain(`the ${PREDICT_P99_TARGET_MS} ms target`);
  });

  it("follows a target set by the caller", () => {
    expect(slowFloorNote({ requestsPerSecond: 900, p99: 30 }, 40)).toBeUndefined();
    expect(slowFloorNote({ requestsPerSecond: 900, p99: 30 }, 20)).toContain("the 20 ms target");
  });
});

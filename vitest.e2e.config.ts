import { defineConfig } from "vitest/config";
import { BaseSequencer, type TestSpecification } from "vitest/node";

/** tests/e2e/security-logs.test.ts reads the servers' logs of the whole run: it goes last. */
class LogScanLast extends BaseSequencer {
  override async sort(files: TestSpecification[]): Promise<TestSpecification[]> {
    const sorted = await super.sort(files);
    const last = (file: TestSpecification) => file.moduleId.endsWith("/security-logs.test.ts");
    return [...sorted.filter((file) => !last(file)), ...sorted.filter(last)];
  }
}

// Browser tests: run by `npm test` (scripts/test.ts) after it has built the app and started it on
// http://localhost:3100 with its mail sink; see tests/e2e/support for the harness.
export default defineConfig({
  resolve: {
    tsconfigPaths: true,
    alias: { "server-only": new URL("./tests/support/server-only-stub.ts", import.meta.url).pathname },
  },
  test: {
    include: ["tests/e2e/**/*.test.ts"],
    environment: "node",
    testTimeout: 60_000,
    hookTimeout: 120_000,
    pool: "forks",
    // One browser at a time: the app, its database and chromium share two cores.
    fileParallelism: false,
    sequence: { sequencer: LogScanLast },
  },
});

import { defineConfig } from "vitest/config";

export default defineConfig({
  resolve: { tsconfigPaths: true, alias: { "server-only": new URL("./tests/support/server-only-stub.ts", import.meta.url).pathname } },
  test: {
    include: ["tests/unit/**/*.test.ts", "tests/integration/**/*.test.ts"],
    environment: "node",
    testTimeout: 60_000,
    hookTimeout: 120_000,
    pool: "forks",
    fileParallelism: false,
    // next-auth imports "next/server" without an extension, which Node's ESM resolver refuses; let Vite resolve it.
    server: { deps: { inline: ["next-auth"] } },
  },
});

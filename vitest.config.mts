import { defineConfig } from "vitest/config";
import path from "node:path";
import { fileURLToPath } from "node:url";

const root = path.dirname(fileURLToPath(import.meta.url));

export default defineConfig({
  resolve: { alias: { "@": root } },
  test: {
    environment: "node",
    include: ["tests/**/*.test.ts", "tests/**/*.test.tsx"],
    exclude: ["tests/e2e/**", "node_modules/**"],
    testTimeout: 30_000,
    globalSetup: ["tests/support/build-workers.ts"],
    // Analyses run in-process from the sources under test; tests/app/worker.test.ts exercises the worker.
    env: { SLIPFIELD_INLINE_ANALYSIS: "1" },
    hookTimeout: 60_000,
    server: { deps: { inline: ["server-only"] } },
    alias: { "server-only": path.resolve(root, "tests/support/server-only-stub.ts") },
  },
});

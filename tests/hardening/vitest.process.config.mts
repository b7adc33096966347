import { defineConfig } from "vitest/config";
import path from "node:path";
import { fileURLToPath } from "node:url";

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../..");

/**
 * Real-process hardening tests: they start the production server (`next start`) and so need a build. scripts/test.sh
 * runs them after `npm run build`; by hand: `npm run build && npx vitest run --config tests/hardening/vitest.process.config.mts`.
 * The file suffix `.process.ts` keeps them out of the first vitest run, which comes before the build.
 */
export default defineConfig({
  root,
  resolve: { alias: { "@": root } },
  test: {
    environment: "node",
    include: ["tests/hardening/**/*.process.ts"],
    testTimeout: 600_000,
    hookTimeout: 300_000,
    fileParallelism: false,
  },
});

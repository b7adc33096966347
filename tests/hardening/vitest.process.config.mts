import { defineConfig } from "vitest/config";
import path from "node:path";
import { fileURLToPath } from "node:url";

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../..");

/**
 * Real-process hardening tests: they start the production server (`next start`) and so need a build. scripts/test.sh
 * runs them after `npm run build`; by hand: `npm run build && npx vitest run --config tests/hardening/vitest.process.config.mts`.
 * The file suffix `.process.ts` keeps them out of the first vitest run, which comes before the build. Files ending in
 * `.pg-process.ts` run several processes on one PostgreSQL server: they are included when TEST_DATABASE_URL names one
 * (`.ci/run` starts one), like the database suite in scripts/test.sh.
 */
const postgres = Boolean(process.env.TEST_DATABASE_URL);
if (!postgres) console.log("process tests: TEST_DATABASE_URL is not set, so the several-process tests on PostgreSQL (*.pg-process.ts) are not run");
export default defineConfig({
  root,
  resolve: { alias: { "@": root } },
  test: {
    environment: "node",
    include: ["tests/hardening/**/*.process.ts", ...(postgres ? ["tests/hardening/**/*.pg-process.ts"] : [])],
    testTimeout: 600_000,
    hookTimeout: 300_000,
    fileParallelism: false,
  },
});

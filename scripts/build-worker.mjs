// Bundles the two worker-thread entries: the analysis engine (dist/analysis-worker.mjs), so analyses run off the web
// server's event loop, and the database thread (dist/database-worker.mjs), which runs PGlite.
import { build } from "esbuild";
import path from "node:path";

const root = path.resolve(path.dirname(new URL(import.meta.url).pathname), "..");
await build({
  entryPoints: [path.join(root, "lib/analysis/worker-entry.ts")],
  outfile: path.join(root, "dist/analysis-worker.mjs"),
  bundle: true,
  platform: "node",
  format: "esm",
  target: "node20",
  alias: { "@": root },
  banner: { js: "import { createRequire } from 'node:module'; const require = createRequire(import.meta.url);" },
  logLevel: "warning",
});
await build({
  entryPoints: [path.join(root, "db/pglite-thread-entry.ts")],
  outfile: path.join(root, "dist/database-worker.mjs"),
  bundle: true,
  platform: "node",
  format: "esm",
  target: "node20",
  // PGlite finds its .wasm and .data files next to its own module: load it from node_modules, not from the bundle
  external: ["@electric-sql/pglite"],
  logLevel: "warning",
});
console.log("slipfield: built dist/analysis-worker.mjs and dist/database-worker.mjs");

// Bundles the two worker-thread entries: the analysis engine (dist/analysis-worker.mjs), so analyses run off the web
// server's event loop, and the database thread (dist/database-worker.mjs), which runs PGlite.
import { build } from "esbuild";
import path from "node:path";

const root = path.resolve(path.dirname(new URL(import.meta.url).pathname), "..");
const workers = [
  {
    entry: "lib/analysis/worker-entry.ts",
    outfile: "dist/analysis-worker.mjs",
    alias: { "@": root },
    banner: { js: "import { createRequire } from 'node:module'; const require = createRequire(import.meta.url);" },
  },
  // PGlite finds its .wasm and .data files next to its own module: load it from node_modules, not from the bundle
  { entry: "db/pglite-thread-entry.ts", outfile: "dist/database-worker.mjs", external: ["@electric-sql/pglite"] },
];
for (const { entry, outfile, ...options } of workers) {
  await build({ entryPoints: [path.join(root, entry)], outfile: path.join(root, outfile), bundle: true, platform: "node", format: "esm", target: "node20", logLevel: "warning", ...options });
}
console.log(`slipfield: built ${workers.map((worker) => worker.outfile).join(" and ")}`);

// Bundles the analysis engine into a standalone worker file, so analyses run off the web server's event loop.
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
console.log("slipfield: built dist/analysis-worker.mjs");

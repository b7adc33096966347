// Bundles the two worker-thread entries: the analysis engine (dist/analysis-worker.mjs), so analyses run off the web
// server's event loop, and the database thread (dist/database-worker.mjs), which runs PGlite; and the job worker
// process (dist/job-worker.mjs, the bundled `npm run worker`: `node dist/job-worker.mjs` from the project folder).
import { build, context as esbuildContext } from "esbuild";
import path from "node:path";

const root = path.resolve(path.dirname(new URL(import.meta.url).pathname), "..");
const workers = [
  {
    entry: "lib/analysis/worker-entry.ts",
    outfile: "dist/analysis-worker.mjs",
    alias: { "@": root },
    banner: { js: "import { createRequire as bannerCreateRequire } from 'node:module'; const require = bannerCreateRequire(import.meta.url);" },
  },
  // PGlite finds its .wasm and .data files next to its own module: load it from node_modules, not from the bundle
  { entry: "db/pglite-thread-entry.ts", outfile: "dist/database-worker.mjs", external: ["@electric-sql/pglite"] },
  {
    entry: "scripts/worker.ts",
    outfile: "dist/job-worker.mjs",
    alias: { "@": root },
    // server-only modules are allowed here (this is a server process); pg's optional native binding is not used
    conditions: ["react-server"],
    external: ["@electric-sql/pglite", "pg-native"],
    banner: { js: "import { createRequire as bannerCreateRequire } from 'node:module'; const require = bannerCreateRequire(import.meta.url);" },
  },
];
const buildOptions = ({ entry, outfile, ...options }) => ({
  entryPoints: [path.join(root, entry)],
  outfile: path.join(root, outfile),
  bundle: true,
  platform: "node",
  format: "esm",
  target: "node20",
  logLevel: "warning",
  ...options,
});

/**
 * Development: every bundle built now and rebuilt when a source it includes changes (esbuild's watch mode); the pool
 * starts new threads from the rebuilt file. Returns the esbuild contexts (dispose them to stop watching).
 */
export async function watchWorkers() {
  const contexts = [];
  for (const worker of workers) {
    let builds = 0;
    let firstBuilt;
    const built = new Promise((resolve) => (firstBuilt = resolve));
    const reported = {
      name: "slipfield-report",
      setup(buildApi) {
        buildApi.onEnd((result) => {
          builds += 1;
          if (result.errors.length === 0) console.log(`slipfield: ${builds === 1 ? "built" : "rebuilt"} ${worker.outfile}`);
          firstBuilt();
        });
      },
    };
    const context = await esbuildContext(buildOptions({ ...worker, plugins: [reported] }));
    // watch mode builds once at the start, then after every change to a file the bundle includes
    await context.watch();
    await built;
    contexts.push(context);
  }
  return contexts;
}

if (process.argv[1] && path.resolve(process.argv[1]) === path.resolve(new URL(import.meta.url).pathname)) {
  for (const worker of workers) await build(buildOptions(worker));
  console.log(`slipfield: built ${workers.map((worker) => worker.outfile).join(", ")}`);
}

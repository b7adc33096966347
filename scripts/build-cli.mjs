// Bundles the command line (scripts/analyze.ts and the engine it runs) into one file, dist/slipfield-cli.mjs, so it
// starts in plain Node without compiling TypeScript. Also records the bundle's source files, so bin/slipfield.mjs can
// tell when they changed and rebuild. Run by `npm install` (prepare), `npm run build`, and bin/slipfield.mjs when needed.
import { build } from "esbuild";
import { writeFileSync } from "node:fs";
import path from "node:path";

const root = path.resolve(path.dirname(new URL(import.meta.url).pathname), "..");
export const CLI_BUNDLE = path.join(root, "dist/slipfield-cli.mjs");
export const CLI_INPUTS = path.join(root, "dist/slipfield-cli.inputs.json");

export async function buildCli() {
  const result = await build({
    entryPoints: [path.join(root, "scripts/analyze.ts")],
    outfile: CLI_BUNDLE,
    bundle: true,
    platform: "node",
    format: "esm",
    target: "node20",
    minify: true,
    legalComments: "none",
    metafile: true,
    logLevel: "warning",
    alias: { "@": root },
    banner: { js: "import { createRequire } from 'node:module'; const require = createRequire(import.meta.url);" },
  });
  const inputs = Object.keys(result.metafile.inputs).filter((file) => !file.startsWith("node_modules/"));
  writeFileSync(CLI_INPUTS, JSON.stringify({ inputs: [...inputs, "package-lock.json"] }));
  return CLI_BUNDLE;
}

if (process.argv[1] && path.resolve(process.argv[1]) === path.resolve(new URL(import.meta.url).pathname)) {
  await buildCli();
  if (!process.argv.includes("--quiet")) console.log("slipfield: built dist/slipfield-cli.mjs (the command line)");
}

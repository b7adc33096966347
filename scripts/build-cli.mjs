// Bundles the command line (scripts/analyze.ts and the engine it runs) into one file, dist/slipfield-cli.cjs, so it
// starts in plain Node without compiling TypeScript. Also records the bundle's source files, so bin/slipfield.cjs can
// tell when they changed and rebuild. Run by `npm install` (prepare), `npm run build`, and bin/slipfield.cjs when needed.
import { build } from "esbuild";
import { writeFileSync } from "node:fs";
import path from "node:path";

const root = path.resolve(path.dirname(new URL(import.meta.url).pathname), "..");
// CommonJS: Node starts a CommonJS file about 10 ms sooner than an ES module, a good part of a small file's run
export const CLI_BUNDLE = path.join(root, "dist/slipfield-cli.cjs");
export const CLI_INPUTS = path.join(root, "dist/slipfield-cli.inputs.json");

export async function buildCli() {
  const result = await build({
    entryPoints: [path.join(root, "scripts/analyze.ts")],
    outfile: CLI_BUNDLE,
    bundle: true,
    platform: "node",
    format: "cjs",
    target: "node20",
    minify: true,
    legalComments: "none",
    metafile: true,
    logLevel: "warning",
    alias: { "@": root },
    // loaded from node_modules only when --crs or --format gltf asks for them, so they cost nothing on other runs
    external: ["proj4", "d3-scale-chromatic"],
  });
  const inputs = Object.keys(result.metafile.inputs).filter((file) => !file.startsWith("node_modules/"));
  writeFileSync(CLI_INPUTS, JSON.stringify({ inputs: [...inputs, "package-lock.json"] }));
  return CLI_BUNDLE;
}

if (process.argv[1] && path.resolve(process.argv[1]) === path.resolve(new URL(import.meta.url).pathname)) {
  await buildCli();
  if (!process.argv.includes("--quiet")) console.log("slipfield: built dist/slipfield-cli.cjs (the command line)");
}

#!/usr/bin/env node
// `slipfield analyze …`: runs the bundled command line (dist/slipfield-cli.mjs), building it first when it is missing or
// older than one of its sources (a fresh clone, a pull), so the command always runs the code in this checkout.
import { existsSync, readFileSync, statSync } from "node:fs";
import path from "node:path";
import { pathToFileURL } from "node:url";

const root = path.resolve(path.dirname(new URL(import.meta.url).pathname), "..");
const bundle = path.join(root, "dist/slipfield-cli.mjs");
const inputsFile = path.join(root, "dist/slipfield-cli.inputs.json");

function bundleIsCurrent() {
  if (!existsSync(bundle) || !existsSync(inputsFile)) return false;
  const builtMs = statSync(bundle).mtimeMs;
  try {
    const { inputs } = JSON.parse(readFileSync(inputsFile, "utf8"));
    return inputs.every((file) => {
      const full = path.join(root, file);
      return !existsSync(full) || statSync(full).mtimeMs <= builtMs;
    });
  } catch {
    return false;
  }
}

const [command] = process.argv.slice(2);
if (command !== "analyze" && command !== "-h" && command !== "--help") {
  process.stderr.write(`slipfield: unknown command ${command ? `"${command}"` : "(none)"}\nusage: slipfield analyze <file.csv | - | 'folder/*.csv'>... [--json | --format text|json|csv|geojson] (slipfield analyze --help for the options)\n`);
  process.exit(2);
}
if (!bundleIsCurrent()) {
  const { buildCli } = await import(pathToFileURL(path.join(root, "scripts/build-cli.mjs")).href);
  await buildCli();
}
await import(pathToFileURL(bundle).href);

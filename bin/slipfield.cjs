#!/usr/bin/env node
"use strict";
// `slipfield analyze …`: runs the bundled command line (dist/slipfield-cli.cjs), building it first when it is missing or
// older than one of its sources (a fresh clone, a pull), so the command always runs the code in this checkout.
// CommonJS, like the bundle: it starts sooner than an ES module.
const { existsSync, readFileSync, statSync } = require("node:fs");
const path = require("node:path");
const { pathToFileURL } = require("node:url");

const root = path.resolve(__dirname, "..");
const bundle = path.join(root, "dist/slipfield-cli.cjs");
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
  process.stderr.write(
    `slipfield: unknown command ${command ? `"${command}"` : "(none)"}\nusage: slipfield analyze <file.csv | - | 'folder/*.csv'>... [--json | --format text|json|csv|geojson] (slipfield analyze --help for the options)\n`,
  );
  process.exit(2);
}
if (bundleIsCurrent()) require(bundle);
else {
  import(pathToFileURL(path.join(root, "scripts/build-cli.mjs")).href).then(({ buildCli }) => buildCli()).then(() => require(bundle));
}

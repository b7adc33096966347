// Command-line benchmark: the whole `slipfield analyze file.csv --json` command (a fresh Node process: start-up, the
// bundle, reading, the analysis, writing the JSON) on about 10⁵ and 2,000 synthetic picks, side by side with scipy's
// griddata(method="linear") alone on the same (s, t, displacement) points and a 500 × 250 grid. The two alternate, so
// both see the same load on a shared machine. Also: bare `node` start-up and `slipfield analyze --help` (launcher and
// bundle loaded, no analysis), to show what start-up costs. `npm run bench:cli [-- --runs N]`.
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { generateSyntheticPicks, toCsv } from "../lib/engine/synthetic";
import { parsePickCsv } from "../lib/engine/csv";
import { fitPlane } from "../lib/engine/plane";
import { projectToPlane } from "../lib/display/frame";
import { displacementColumn } from "../lib/engine/displacement";

const PYTHON = ["python3", "/usr/bin/python3"].find((python) => spawnSync(python, ["-c", "import scipy"], { stdio: "ignore" }).status === 0) ?? "python3";
const BIN = path.join(__dirname, "../bin/slipfield.cjs");
const runsArg = process.argv.indexOf("--runs");
const RUNS = runsArg > 0 ? Number(process.argv[runsArg + 1]) : 7;

const median = (values: number[]) => [...values].sort((a, b) => a - b)[Math.floor(values.length / 2)];
const best = (values: number[]) => Math.min(...values);

/** Wall time of one whole command, ms (stdout to a file, as in a pipeline). */
function timeCommand(args: string[], outFile: string): number {
  const started = process.hrtime.bigint();
  const result = spawnSync(process.execPath, args, { stdio: ["ignore", "pipe", "pipe"], maxBuffer: 1 << 30 });
  const ms = Number(process.hrtime.bigint() - started) / 1e6;
  if (result.status !== 0) throw new Error(`${args.join(" ")} exited ${result.status}: ${result.stderr}`);
  writeFileSync(outFile, result.stdout);
  return ms;
}

function syntheticFile(dir: string, target: number) {
  const { picks } = generateSyntheticPicks({ seed: 1, pickCount: Math.round(target / 0.72), halfLengthM: 4000, dmaxM: 120, throwCutoffM: 12, noiseM: 2 });
  const csv = toCsv(picks);
  const file = path.join(dir, `picks-${target}.csv`);
  writeFileSync(file, csv);
  // scipy interpolates the same points the engine does: plane coordinates (s, t) and displacement
  const parsed = parsePickCsv(csv).picks;
  const plane = fitPlane(parsed.x, parsed.y, parsed.z);
  const { s, t } = projectToPlane(parsed.x, parsed.y, parsed.z, plane);
  const d = displacementColumn(parsed.throwM, parsed.heaveM, plane.dipDeg);
  const prefix = path.join(dir, `points-${target}`);
  for (const [suffix, column] of [
    [".s", s],
    [".t", t],
    [".v", d],
  ] as const)
    writeFileSync(prefix + suffix, Buffer.from(column.buffer, column.byteOffset, column.byteLength));
  let [sMin, sMax, tMin, tMax] = [Infinity, -Infinity, Infinity, -Infinity];
  for (let i = 0; i < s.length; i++) {
    sMin = Math.min(sMin, s[i]);
    sMax = Math.max(sMax, s[i]);
    tMin = Math.min(tMin, t[i]);
    tMax = Math.max(tMax, t[i]);
  }
  // 500 × 250 nodes of square cells over the points (the ellipse is about 2 : 1)
  const cell = Math.max((sMax - sMin) / 499, (tMax - tMin) / 249);
  return { file, prefix, picks: parsed.x.length, mb: csv.length / 1e6, grid: { s0: sMin, t0: tMin, cell, columns: 500, rows: 250 } };
}

/** scipy's griddata alone: the first call of a fresh Python process and the best of three in it, ms. */
function timeScipy(input: ReturnType<typeof syntheticFile>) {
  const { s0, t0, cell, columns, rows } = input.grid;
  const r = spawnSync(
    PYTHON,
    [path.join(__dirname, "griddata_time.py"), input.prefix, String(s0), String(t0), String(cell), String(columns), String(rows), "3"],
    { encoding: "utf8" },
  );
  if (r.status !== 0) throw new Error(`scipy: ${r.stderr}`);
  const out = JSON.parse(r.stdout) as { seconds: number; runs: number[] };
  return { first: out.runs[0] * 1000, best: out.seconds * 1000 };
}

function main() {
  const dir = mkdtempSync(path.join(os.tmpdir(), "slipfield-bench-cli-"));
  try {
    const large = syntheticFile(dir, 1e5);
    const small = syntheticFile(dir, 2000);
    const out = path.join(dir, "out.json");
    // once before timing, so the bundle is built and the files are in the page cache
    timeCommand([BIN, "analyze", small.file, "--json"], out);
    const bare: number[] = [],
      help: number[] = [],
      smallRuns: number[] = [],
      largeRuns: number[] = [],
      scipyFirst: number[] = [],
      scipyBest: number[] = [];
    for (let run = 0; run < RUNS; run++) {
      bare.push(timeCommand(["-e", "0"], out));
      help.push(timeCommand([BIN, "analyze", "--help"], out));
      smallRuns.push(timeCommand([BIN, "analyze", small.file, "--json"], out));
      largeRuns.push(timeCommand([BIN, "analyze", large.file, "--json"], out));
      const scipy = timeScipy(large);
      scipyFirst.push(scipy.first);
      scipyBest.push(scipy.best);
    }
    const f = (ms: number) => ms.toFixed(0);
    console.log(
      `machine: ${os.cpus().length} cores, Node ${process.version}, load average ${os
        .loadavg()
        .map((v) => v.toFixed(2))
        .join(" ")}; ${RUNS} alternating runs; scipy via ${PYTHON}`,
    );
    console.log("| what | picks | CSV MB | median ms | best ms |");
    console.log("|---|---:|---:|---:|---:|");
    console.log(`| node -e 0 (bare start-up) | — | — | ${f(median(bare))} | ${f(best(bare))} |`);
    console.log(`| slipfield analyze --help (launcher + bundle loaded) | — | — | ${f(median(help))} | ${f(best(help))} |`);
    console.log(`| slipfield analyze --json, whole command | ${small.picks} | ${small.mb.toFixed(2)} | ${f(median(smallRuns))} | ${f(best(smallRuns))} |`);
    console.log(`| slipfield analyze --json, whole command | ${large.picks} | ${large.mb.toFixed(1)} | ${f(median(largeRuns))} | ${f(best(largeRuns))} |`);
    console.log(
      `| scipy griddata(linear) alone, 500 × 250 nodes, first call in its process | ${large.picks} | — | ${f(median(scipyFirst))} | ${f(best(scipyFirst))} |`,
    );
    console.log(
      `| scipy griddata(linear) alone, 500 × 250 nodes, best of 3 calls in its process | ${large.picks} | — | ${f(median(scipyBest))} | ${f(best(scipyBest))} |`,
    );
    console.log(
      `whole command ÷ scipy best (medians): ${(median(largeRuns) / median(scipyBest)).toFixed(2)} (target under 0.5); 2,000 picks: ${f(median(smallRuns))} ms (target under 300 ms)`,
    );
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

main();

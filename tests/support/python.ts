// The Python 3 every numpy/scipy oracle runs: one interpreter, resolved once by scripts/python.ts — the same
// resolution scripts/test.sh (which exports SLIPFIELD_PYTHON) and the benchmarks use.
import { spawnSync } from "node:child_process";
import { resolvePython } from "../../scripts/python";

let resolved: ReturnType<typeof resolvePython> | null = null;

/** The interpreter to run, or a clear failure: these oracles are required, never skipped. */
export function requirePython(): string {
  resolved ??= resolvePython(["numpy", "scipy"]);
  if ("error" in resolved) throw new Error(`this test needs Python 3 with numpy and scipy: ${resolved.error}`);
  return resolved.python;
}

/** Runs an oracle script with JSON on stdin and returns its parsed JSON stdout; fails loudly on any error. */
export function runPythonOracle<T>(script: string, input: unknown): T {
  const python = requirePython();
  const run = spawnSync(python, [script], { input: JSON.stringify(input), encoding: "utf8", maxBuffer: 64 * 1024 * 1024 });
  if (run.error || run.status !== 0) throw new Error(`the oracle ${script} failed under ${python}: ${run.error?.message ?? run.stderr}`);
  return JSON.parse(run.stdout) as T;
}

// The one Python 3 that every numpy/scipy oracle (tests) and reference timing (benchmarks) runs. Resolution order:
// $SLIPFIELD_PYTHON when set (it must import the modules, otherwise that is an error, never a silent fallback), else
// the python3 on PATH, else Debian's /usr/bin/python3 (where apt's python3-scipy lands). scripts/test.sh resolves it
// once with this file (`tsx scripts/python.ts numpy scipy` prints the path) and exports SLIPFIELD_PYTHON, so the
// tests it starts use the same interpreter.
import { spawnSync } from "node:child_process";

export const PYTHON_CANDIDATES = ["python3", "/usr/bin/python3"] as const;

/** The interpreter's own absolute path when it can import the modules (so a PATH shim resolves to one binary), else null. */
function executableWith(python: string, modules: readonly string[]): string | null {
  const run = spawnSync(python, ["-c", `import sys, ${modules.join(", ")}; print(sys.executable)`], { encoding: "utf8" });
  const path = run.status === 0 ? run.stdout.trim() : "";
  return path || null;
}

/** The interpreter to use for `modules`, or an explanation of why there is none. */
export function resolvePython(modules: readonly string[] = ["numpy", "scipy"]): { python: string } | { error: string } {
  const chosen = process.env.SLIPFIELD_PYTHON?.trim();
  if (chosen) {
    const python = executableWith(chosen, modules);
    return python ? { python } : { error: `SLIPFIELD_PYTHON=${chosen} cannot import ${modules.join(" and ")}` };
  }
  for (const candidate of PYTHON_CANDIDATES) {
    const python = executableWith(candidate, modules);
    if (python) return { python };
  }
  return { error: `no Python 3 that can import ${modules.join(" and ")} (tried ${PYTHON_CANDIDATES.join(", ")}; apt-get install python3-scipy)` };
}

if (process.argv[1]?.endsWith("scripts/python.ts")) {
  const result = resolvePython(process.argv.slice(2).length ? process.argv.slice(2) : undefined);
  if ("python" in result) process.stdout.write(`${result.python}\n`);
  else {
    process.stderr.write(`python: ${result.error}\n`);
    process.exitCode = 1;
  }
}

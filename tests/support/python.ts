// Finds a Python 3 that can import the given modules, for the tests that use numpy/scipy as independent
// oracles: the python3 on PATH first, then Debian's /usr/bin/python3 (where apt's python3-scipy lands).
import { spawnSync } from "node:child_process";

const found = new Map<string, string | null>();

export function pythonWith(...modules: string[]): string | null {
  const key = modules.join(",");
  if (!found.has(key)) {
    const probe = `import ${modules.join(", ")}`;
    const candidate = ["python3", "/usr/bin/python3"].find((python) => spawnSync(python, ["-c", probe], { stdio: "ignore" }).status === 0);
    found.set(key, candidate ?? null);
  }
  return found.get(key)!;
}

/** The interpreter to run, or a clear failure: these oracles are required, never skipped. */
export function requirePython(...modules: string[]): string {
  const python = pythonWith(...modules);
  if (!python) throw new Error(`this test needs Python 3 with ${modules.join(" and ")} (apt-get install python3-scipy)`);
  return python;
}

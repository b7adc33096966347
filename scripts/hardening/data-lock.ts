// The PGlite data folder may be open in one process only. The server records its pid in <data>/server.pid
// (lib/startup.ts); backup and restore refuse to touch the folder while that process is alive.
import { existsSync, readFileSync } from "node:fs";
import path from "node:path";

export function livingServerPid(dataDir: string): number | null {
  const file = path.join(dataDir, "server.pid");
  if (!existsSync(file)) return null;
  const pid = Number(readFileSync(file, "utf8").trim());
  if (!Number.isInteger(pid) || pid <= 0 || pid === process.pid) return null;
  try {
    process.kill(pid, 0);
    return pid;
  } catch (error) {
    return (error as NodeJS.ErrnoException).code === "EPERM" ? pid : null;
  }
}

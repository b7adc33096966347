import { readdirSync, readFileSync, statSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { APP_VARIABLES, ConfigError, TOOLING_VARIABLES, readConfig } from "@/lib/config";

const ROOT = path.resolve(__dirname, "../..");
const SOURCE_FOLDERS = ["app", "bench", "bin", "components", "db", "lib", "scene", "scripts", "tests"];
const ROOT_FILES = ["instrumentation.ts", "proxy.ts", "next.config.ts", "playwright.config.ts", "drizzle.config.ts", "vitest.config.mts"];

function sourceFiles(folder: string): string[] {
  return readdirSync(folder).flatMap((name) => {
    const full = path.join(folder, name);
    if (statSync(full).isDirectory()) return sourceFiles(full);
    return /\.(ts|tsx|mts|mjs|cjs|sh)$/.test(name) ? [full] : [];
  });
}

describe("configuration (lib/config.ts)", () => {
  it("gives every default when nothing is set, and reads set values as their types", () => {
    const defaults = readConfig({});
    expect(defaults).toMatchObject({
      PORT: 3000,
      SLIPFIELD_DB_THREAD: "on",
      SLIPFIELD_ANALYSIS_WORKERS: 1,
      SLIPFIELD_ANALYSIS_TIMEOUT_MS: 600_000,
      SLIPFIELD_JOB_LEASE_SECONDS: 30,
      SLIPFIELD_JOB_ATTEMPTS: 3,
      SLIPFIELD_DRAIN_SECONDS: 8,
    });
    expect(defaults.DATABASE_URL).toBeUndefined();
    expect(readConfig({ PORT: "8080", SLIPFIELD_ANALYSIS_WORKERS: "0", DATABASE_URL: "postgres://h/db", SLIPFIELD_JOB_LEASE_SECONDS: "2.5" })).toMatchObject({
      PORT: 8080,
      SLIPFIELD_ANALYSIS_WORKERS: 0,
      DATABASE_URL: "postgres://h/db",
      SLIPFIELD_JOB_LEASE_SECONDS: 2.5,
    });
    // an empty value counts as unset
    expect(readConfig({ PORT: "" }).PORT).toBe(3000);
  });

  it("names every unusable variable and what it must be", () => {
    const attempt = () => readConfig({ PORT: "http", SLIPFIELD_DB_THREAD: "yes", SLIPFIELD_URL: "not a url", SLIPFIELD_ANALYSIS_WORKERS: "1.5" });
    expect(attempt).toThrow(ConfigError);
    expect(attempt).toThrow(/PORT="http": must be a whole number from 1 to 65535/);
    expect(attempt).toThrow(/SLIPFIELD_DB_THREAD="yes": must be on or off/);
    expect(attempt).toThrow(/SLIPFIELD_URL="not a url": must be an absolute http\(s\) address/);
    expect(attempt).toThrow(/SLIPFIELD_ANALYSIS_WORKERS="1.5": must be a whole number/);
  });

  it("every variable read anywhere in the source tree is documented here, and .env.example lists them all", () => {
    const documented = new Set([...Object.keys(APP_VARIABLES), ...Object.keys(TOOLING_VARIABLES)]);
    const files = [...SOURCE_FOLDERS.flatMap((folder) => sourceFiles(path.join(ROOT, folder))), ...ROOT_FILES.map((name) => path.join(ROOT, name))];
    const read = new Map<string, string>();
    for (const file of files) {
      for (const match of readFileSync(file, "utf8").matchAll(
        /process\.env\.([A-Za-z_][A-Za-z0-9_]*)|process\.env\[["']([A-Za-z_][A-Za-z0-9_]*)["']\]|vi\.stubEnv\(["']([A-Z_][A-Z0-9_]*)["']/g,
      )) {
        const name = match[1] ?? match[2] ?? match[3];
        if (!read.has(name)) read.set(name, path.relative(ROOT, file));
      }
    }
    expect(read.size).toBeGreaterThan(20);
    const undocumented = [...read].filter(([name]) => !documented.has(name)).map(([name, file]) => `${name} (${file})`);
    expect(undocumented).toEqual([]);
    const example = readFileSync(path.join(ROOT, ".env.example"), "utf8");
    const missing = [...documented].filter((name) => !new RegExp(`^# ${name}[=:]`, "m").test(example));
    expect(missing).toEqual([]);
  });

  it("the app's modules read settings through config(), not process.env", () => {
    // the launcher (plain JavaScript, before any build), Next's own variables and the config module itself excepted
    const allowed = new Set(["NEXT_RUNTIME", "NEXT_MANUAL_SIG_HANDLE", "__NEXT_PRIVATE_ORIGIN", "PORT"]);
    const offenders: string[] = [];
    for (const folder of ["app", "components", "db", "lib", "scene"]) {
      for (const file of sourceFiles(path.join(ROOT, folder))) {
        if (file.endsWith(path.join("lib", "config.ts"))) continue;
        for (const match of readFileSync(file, "utf8").matchAll(/process\.env\.([A-Za-z_][A-Za-z0-9_]*)/g)) {
          if (!allowed.has(match[1])) offenders.push(`${match[1]} in ${path.relative(ROOT, file)}`);
        }
      }
    }
    expect(offenders).toEqual([]);
  });
});

import { defineConfig } from "@playwright/test";
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";

const port = Number(process.env.E2E_PORT ?? 3217);
const dataDir = process.env.E2E_DATA_DIR ?? mkdtempSync(path.join(tmpdir(), "slipfield-e2e-"));
process.env.E2E_DATA_DIR = dataDir;

export default defineConfig({
  testDir: "tests/e2e",
  timeout: 90_000,
  expect: { timeout: 20_000 },
  workers: 1,
  retries: 0,
  reporter: [["list"]],
  use: {
    baseURL: `http://localhost:${port}`,
    // the one flag that installs the 3D scene's test hooks (scene/test-hooks.ts); every context, also browser.newContext()
    storageState: { cookies: [], origins: [{ origin: `http://localhost:${port}`, localStorage: [{ name: "slipfield-test-hooks", value: "on" }] }] },
    viewport: { width: 1440, height: 900 },
    launchOptions: {
      executablePath: "/usr/bin/chromium",
      args: [
        "--headless",
        "--no-sandbox",
        "--disable-gpu",
        "--disable-quic",
        "--no-first-run",
        "--disable-background-networking",
        "--disable-component-update",
        "--disable-sync",
        "--use-angle=swiftshader",
        "--enable-unsafe-swiftshader",
      ],
    },
  },
  webServer: {
    command: `node node_modules/next/dist/bin/next start -p ${port}`,
    url: `http://localhost:${port}/api/health`,
    timeout: 120_000,
    reuseExistingServer: false,
    stdout: "pipe",
    env: {
      SLIPFIELD_DATA_DIR: dataDir,
      AUTH_SECRET: "e2e-secret-not-for-production-0123456789",
      NEXT_TELEMETRY_DISABLED: "1",
      PORT: String(port),
    },
  },
});

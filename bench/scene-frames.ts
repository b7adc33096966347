// 3D view cost in headless Debian chromium with software WebGL (SwiftShader): time to first frame and
// frame times while orbiting, for the demo faults and a 10⁵-pick synthetic fault. Needs a running server
// (`npm start`, or BENCH_URL) with the demo seeded; prints a table. A benchmark, not a test.
import { TEST_HOOKS_KEY } from "../scene/test-hooks";
import { chromium, type Page } from "@playwright/test";
import { generateSyntheticPicks, toCsv } from "../lib/engine/synthetic";

const BASE = process.env.BENCH_URL ?? "http://localhost:3000";
const CHROMIUM_ARGS = [
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
];
const ORBIT_STEPS = 90;

async function signIn(page: Page) {
  await page.goto(`${BASE}/sign-in`);
  await page.getByLabel("E-mail").fill("interpreter@quillon.test");
  await page.getByLabel("Password").fill("quillon-demo-1");
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL(/\/studies$/);
}

async function demoFaults(page: Page): Promise<{ studyId: string; faults: { id: string; name: string }[] }> {
  const { studies } = await (await page.request.get(`${BASE}/api/studies`)).json();
  const study = studies.find((candidate: { name: string }) => /Quillon/.test(candidate.name));
  const { faults } = await (await page.request.get(`${BASE}/api/studies/${study.id}/faults`)).json();
  return { studyId: study.id, faults };
}

async function syntheticFault(page: Page, studyId: string, pickCount: number) {
  const name = `Bench ${pickCount} picks ${Date.now()}`;
  const created = await page.request.post(`${BASE}/api/studies/${studyId}/faults`, { data: { name }, headers: { origin: BASE } });
  const { fault } = await created.json();
  const { picks } = generateSyntheticPicks({ seed: 7, pickCount: Math.round(pickCount / 0.72), halfLengthM: 4000, dmaxM: 120, throwCutoffM: 12, noiseM: 2 });
  const csv = toCsv(picks);
  const confirm = await page.request.post(`${BASE}/api/faults/${fault.id}/pick-sets?step=confirm`, {
    headers: { origin: BASE },
    multipart: { file: { name: "bench.csv", mimeType: "text/csv", buffer: Buffer.from(csv) }, units: "m", dropBadRows: "true" },
  });
  if (!confirm.ok()) throw new Error(`upload failed: ${confirm.status()} ${await confirm.text()}`);
  for (;;) {
    const { analysis } = await (await page.request.get(`${BASE}/api/faults/${fault.id}/analysis`)).json();
    if (analysis?.status === "done") break;
    if (analysis?.status === "failed") throw new Error(`analysis failed: ${analysis.errorMessage}`);
    await page.waitForTimeout(500);
  }
  return { id: fault.id as string, name: `synthetic, ${pickCount.toLocaleString("en")} picks` };
}

function median(values: number[]) {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)];
}

async function measure(page: Page, studyId: string, fault: { id: string; name: string }) {
  await page.goto(`${BASE}/studies/${studyId}/faults/${fault.id}`);
  await page.waitForFunction(() => window.__slipfieldSceneReady === true, null, { timeout: 120_000 });
  const firstFrameMs = await page.evaluate(() => window.__slipfieldFirstFrameMs ?? NaN);
  const box = (await page.locator('[data-testid="fault-scene"] canvas').first().boundingBox())!;
  const x0 = box.x + box.width * 0.3;
  const y0 = box.y + box.height * 0.5;
  await page.mouse.move(x0, y0);
  await page.mouse.down();
  const frameIntervals: number[] = [];
  for (let step = 1; step <= ORBIT_STEPS; step++) {
    const before = await page.evaluate(() => window.__slipfieldFrameCount ?? 0);
    const started = await page.evaluate(() => performance.now());
    await page.mouse.move(x0 + step * 4, y0 + Math.sin(step / 10) * 20);
    await page.waitForFunction((count) => (window.__slipfieldFrameCount ?? 0) > count, before);
    // the next animation frame starts only after the scene's frame has been rendered and composited
    const drawn = await page.evaluate(() => new Promise<number>((resolve) => requestAnimationFrame(() => resolve(performance.now()))));
    frameIntervals.push(drawn - started);
  }
  await page.mouse.up();
  const sorted = [...frameIntervals].sort((a, b) => a - b);
  return { name: fault.name, firstFrameMs, medianFrameMs: median(frameIntervals), p90FrameMs: sorted[Math.floor(sorted.length * 0.9)] };
}

async function main() {
  const browser = await chromium.launch({ executablePath: "/usr/bin/chromium", args: CHROMIUM_ARGS });
  const page = await browser.newPage({ viewport: { width: 1440, height: 900 } });
  // the scene's frame timing is published only behind the test-hook flag (scene/test-hooks.ts)
  await page.addInitScript((key) => window.localStorage.setItem(key, "on"), TEST_HOOKS_KEY);
  await signIn(page);
  const { studyId, faults } = await demoFaults(page);
  const targets = faults.map((fault) => ({ id: fault.id, name: `demo ${fault.name}` }));
  targets.push(await syntheticFault(page, studyId, 100_000));
  const rows = [];
  for (const target of targets) rows.push(await measure(page, studyId, target));
  await browser.close();
  console.log(`3D view, headless chromium + SwiftShader (software WebGL), 1440×900 page, ${ORBIT_STEPS} orbit steps`);
  console.log("| fault | first frame after navigation (ms) | median input-to-next-frame while orbiting (ms) | p90 (ms) |");
  console.log("|---|---:|---:|---:|");
  for (const row of rows) console.log(`| ${row.name} | ${row.firstFrameMs.toFixed(0)} | ${row.medianFrameMs.toFixed(0)} | ${row.p90FrameMs.toFixed(0)} |`);
}

main().catch((error) => {
  console.error(error);
  process.exit(1);
});

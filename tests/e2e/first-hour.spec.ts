import { expect, test, type Locator, type Page } from "@playwright/test";
import { openDemoStudy, pictureStats, signIn } from "./helpers";

// What a new user meets in the first hour: the favicon, adding a fault and landing on it ready to upload (with the
// demo files offered), recent activity in sentences, the shared view's notes and replies, figures that stand alone in
// the printable report, and the 3D view's framing, labels and orientation marker.

const sceneReady = (page: Page) =>
  page.waitForFunction(() => (window as unknown as { __slipfieldSceneReady?: boolean }).__slipfieldSceneReady === true, null, { timeout: 60_000 });

/** Signs in, opens the demo study's fault and waits for its 3D view's first frame. */
async function openFaultScene(page: Page, who: string, fault: string) {
  await signIn(page, who);
  await openDemoStudy(page);
  await page.getByTestId("fault-table").getByRole("link", { name: fault, exact: true }).click();
  await sceneReady(page);
}

type Box = { x: number; y: number; width: number; height: number };
const overlaps = (a: Box, b: Box) => a.x < b.x + b.width && b.x < a.x + a.width && a.y < b.y + b.height && b.y < a.y + a.height;

async function boxes(locator: Locator): Promise<Box[]> {
  const found: Box[] = [];
  for (const element of await locator.all()) {
    const box = await element.boundingBox();
    if (box && box.width > 0) found.push(box);
  }
  return found;
}

function expectNoOverlap(found: Box[], what: string) {
  for (let i = 0; i < found.length; i++)
    for (let j = i + 1; j < found.length; j++) expect(overlaps(found[i], found[j]), `${what} ${i} and ${j} overlap`).toBe(false);
}

// a database id (26 lower-case letters and digits) or the start of a UUID
const RAW_ID = /\b[0-9a-z]{20,}\b|[0-9a-f]{8}-[0-9a-f]{4}-/;

test("the favicon is served on every page", async ({ page }) => {
  const ico = await page.request.get("/favicon.ico");
  expect(ico.status()).toBe(200);
  expect(ico.headers()["content-type"]).toMatch(/image\//);
  await page.goto("/");
  const icon = page.locator('link[rel="icon"]');
  expect(await icon.count()).toBeGreaterThan(0);
  for (const href of await icon.evaluateAll((links) => links.map((link) => link.getAttribute("href") ?? ""))) {
    expect((await page.request.get(href)).status(), href).toBe(200);
  }
});

test("adding a fault asks for its type, opens it ready to upload with the demo files offered; its name keeps clear of QG-4's in the scaling chart; the activity says so in words", async ({
  page,
}) => {
  const name = `QG-9 ${Date.now() % 100000}`;
  await signIn(page, "interpreter@quillon.test");
  await openDemoStudy(page);
  const studyUrl = page.url();
  await page.getByTestId("new-fault").click();
  await page.getByLabel("Name").fill(name);
  await page.getByTestId("fault-sense-reverse").check();
  await page.getByTestId("new-fault-submit").click();

  await expect(page.getByTestId("fault-title")).toHaveText(name);
  const empty = page.getByTestId("no-picks");
  await expect(empty.getByTestId("upload-panel")).toBeVisible();
  await expect(empty.getByTestId("upload-help")).toContainText("x, y");
  await expect(empty.getByTestId("example-files")).toContainText("qg-1-throw-picks.csv");
  const download = await page.request.get("/demo/qg-4-throw-picks.csv");
  expect(download.status()).toBe(200);
  expect((await download.text()).split("\n")[0]).toBe("x,y,z,throw,segment");

  // an example file goes straight into the preview and analyses like any upload
  await empty.getByTestId("use-example-qg-4-throw-picks.csv").click();
  await expect(page.getByTestId("upload-preview")).toContainText("qg-4-throw-picks.csv");
  await page.getByTestId("confirm-upload").click();
  await expect(page.getByTestId("sheet-dmax")).toHaveText(/^\d[\d,.]* m$/, { timeout: 90_000 });

  // the same picks as QG-4 put this fault on the very spot of QG-4 in the scaling chart: their names must not collide
  await page.getByTestId("view-tab-scaling").click();
  const names = page.getByTestId("scaling-chart").locator("g.fault-label text");
  await expect(names.filter({ hasText: name })).toHaveCount(1);
  const placed = await boxes(names);
  expect(placed.length).toBeGreaterThanOrEqual(3);
  expectNoOverlap(placed, "fault name");

  await page.goto(studyUrl);
  const row = page.getByTestId("fault-table").locator("tr").filter({ hasText: name });
  await expect(row).toContainText("reverse fault");
  const entries = page.getByTestId("activity-entry");
  await expect(entries.first()).toBeVisible();
  await expect(entries.filter({ hasText: `added the fault ${name}.` })).toHaveCount(1);
  await expect(entries.filter({ hasText: `uploaded pick set qg-4-throw-picks.csv (v1) to ${name}` })).toHaveCount(1);
  for (const text of await entries.allTextContents()) {
    expect(text, text).not.toMatch(RAW_ID);
    expect(text, text).not.toMatch(/\b(fault|pickset|pin|viewpoint-link|stress)\.[a-z-]+\b/);
  }
  await entries
    .filter({ hasText: `added the fault ${name}.` })
    .getByRole("link", { name })
    .click();
  await expect(page.getByTestId("fault-title")).toHaveText(name);
});

test("the shared view renders a note's bold and shows the replies when the link includes pins", async ({ page, browser }) => {
  await signIn(page, "reviewer@quillon.test");
  await openDemoStudy(page);
  await page.getByTestId("fault-table").getByRole("link", { name: "QG-4", exact: true }).click();
  await expect(page.getByTestId("fault-sheet")).toBeVisible({ timeout: 60_000 });
  const faultId = new URL(page.url()).pathname.split("/faults/")[1];
  const origin = new URL(page.url()).origin;
  const headers = { origin };
  const tag = `${Date.now()}`;
  const pin = await page.request.post(`/api/faults/${faultId}/pins`, {
    headers,
    data: { x: 467400, y: 6734600, z: -2400, s: 0, t: 0, segmentId: "main", body: `Throw **jumps here** near the tip ${tag}` },
  });
  expect(pin.status()).toBe(201);
  const pinId = (await pin.json()).pin.id;
  expect((await page.request.post(`/api/pins/${pinId}/replies`, { headers, data: { body: `A mis-pick on inline 1204, **fixed** ${tag}` } })).status()).toBe(
    201,
  );
  const camera = { position: [467400, 6734600, 3000], target: [467400, 6734600, -2400], up: [0, 0, 1], fov: 40 };
  const viewpoint = await page.request.post(`/api/faults/${faultId}/viewpoints`, {
    headers,
    data: { title: `Tip ${tag}`, note: "", camera, settings: { layers: {}, colourMode: "displacement", exaggeration: 0 } },
  });
  expect(viewpoint.status()).toBe(201);
  const link = await page.request.post(`/api/viewpoints/${(await viewpoint.json()).viewpoint.id}/links`, {
    headers,
    data: { expiresInDays: 7, includePins: true },
  });
  expect(link.status()).toBe(201);
  const { path } = (await link.json()).link as { path: string };

  const guest = await browser.newContext();
  const guestPage = await guest.newPage();
  expect((await guestPage.goto(path))?.status()).toBe(200);
  const note = guestPage.getByTestId("shared-pin").filter({ hasText: tag });
  await expect(note).toHaveCount(1);
  await expect(note.locator("strong").first()).toHaveText("jumps here");
  await expect(note).not.toContainText("**");
  const reply = note.getByTestId("shared-reply");
  await expect(reply).toContainText(`A mis-pick on inline 1204, fixed ${tag}`);
  await expect(reply.locator("strong")).toHaveText("fixed");
  await guest.close();
});

test("the printable report's figures stand alone: the contour map puts both segments side by side, the 3D picture carries its legend, labels and scale", async ({
  page,
}) => {
  await openFaultScene(page, "viewer@quillon.test", "QG-1");
  await page.getByTestId("view-tab-export").click();
  const [report] = await Promise.all([page.waitForEvent("popup"), page.getByTestId("open-report").click()]);
  await report.waitForURL(/\/report\?analysis=/);

  const map = report.getByTestId("report-contour-map");
  await expect(map.locator("figcaption")).toContainText("QG-1: displacement contours in strike projection");
  await expect(map).toContainText("Displacement (m)");
  await expect(map).toContainText(/Along strike \d{3}° \(m\)/);
  await expect(map).toContainText("Depth below datum (m)");
  await expect(report.getByTestId("report-contour-legend")).toContainText("inferred tip line");
  await expect(report.getByTestId("report-contour-legend")).toContainText(/True scale|Depth stretched/);
  // one peak label per segment, apart along strike (each segment in its own plane coordinates would stack them)
  const peaks = map.locator("text").filter({ hasText: /Dmax \d/ });
  await expect(peaks).toHaveCount(2);
  const [north, south] = await boxes(peaks);
  expect(Math.abs(north.x - south.x)).toBeGreaterThan(100);

  // the 3D picture is the composed one: a title band above and a legend band below the view
  const picture = report.getByTestId("report-picture");
  await expect(picture).toBeVisible();
  const size = await picture.evaluate(async (image: HTMLImageElement) => {
    await image.decode();
    return { width: image.naturalWidth, height: image.naturalHeight };
  });
  const canvas = await page.getByTestId("fault-scene").locator("canvas").boundingBox();
  expect(size.height / size.width).toBeCloseTo((canvas!.height + 46 + 64) / canvas!.width, 2);
});

test("3D view: along strike the fault fills the view and its labels keep apart; the orientation marker names every axis it draws", async ({ page }) => {
  await openFaultScene(page, "viewer@quillon.test", "QG-1");
  await page.getByTestId("camera-alongStrike").click();
  // the camera is fitted to the fault's outline: the coloured surface and tip lines span most of the canvas height
  await page.waitForTimeout(500);
  expect((await pictureStats(page, await page.getByTestId("fault-scene").locator("canvas").screenshot())).colouredSpan).toBeGreaterThan(0.5);
  const segmentLabels = await boxes(page.locator("[data-scene-label='segment'], [data-scene-label='peak']"));
  expect(segmentLabels).toHaveLength(4);
  expectNoOverlap(segmentLabels, "scene label");

  // switched to the plane map and back, the view keeps every label
  await page.getByTestId("view-mode-map").click();
  await page.getByTestId("view-mode-3d").click();
  await sceneReady(page);
  await expect(page.locator("[data-scene-label='segment']")).toHaveCount(2);
  await expect(page.locator("[data-scene-label='peak']")).toHaveCount(2);

  const marker = page.getByTestId("orientation-marker");
  await expect(marker).toBeVisible();
  const axisLabels = marker.locator("[data-axis-label]");
  await expect(axisLabels).toHaveCount(3);
  expectNoOverlap(await boxes(axisLabels), "axis label");
  await expect(marker).toHaveAttribute("aria-label", /E.*N.*Up/);

  // the scale bar sits on its own plate
  const plate = await page.getByTestId("scale-bar").evaluate((element) => getComputedStyle(element).backgroundColor);
  expect(plate).not.toBe("rgba(0, 0, 0, 0)");
});

test("without a mail server the owner reads the product's e-mail on the outbox page", async ({ page }) => {
  await signIn(page, "owner@quillon.test");
  await page.getByTestId("nav-outbox").click();
  await expect(page).toHaveURL(/\/outbox$/);
  await expect(page.getByTestId("outbox-intro")).toContainText("No mail server is configured (SMTP_URL is not set)");
});

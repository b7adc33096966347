import { expect, test, type Page } from "@playwright/test";
import { openDemoStudy, signIn } from "./helpers";

type Camera = { position: number[]; target: number[]; up: number[]; fov: number };

const sceneReady = (page: Page) =>
  page.waitForFunction(() => (window as unknown as { __slipfieldSceneReady?: boolean }).__slipfieldSceneReady === true, null, { timeout: 60_000 });

const cameraOf = (page: Page) => page.evaluate(() => (window as unknown as { __slipfieldCamera?: () => Camera | null }).__slipfieldCamera?.() ?? null);

function expectSameCamera(actual: Camera | null, expected: Camera) {
  expect(actual).not.toBeNull();
  for (const key of ["position", "target", "up"] as const) {
    for (let axis = 0; axis < 3; axis++) expect(Math.abs(actual![key][axis] - expected[key][axis]), `${key}[${axis}]`).toBeLessThan(1e-6);
  }
  expect(Math.abs(actual!.fov - expected.fov)).toBeLessThan(1e-6);
}

test("a presenter saves a viewpoint and shares a link; a signed-out browser sees exactly that view and nothing else; revoking ends it", async ({
  page,
  browser,
}) => {
  const title = `Face-on for the meeting ${Date.now()}`;
  await signIn(page, "interpreter@quillon.test");
  await openDemoStudy(page);
  const studyId = new URL(page.url()).pathname.split("/studies/")[1];
  await page.getByTestId("fault-table").getByRole("link", { name: "QG-1", exact: true }).click();
  await sceneReady(page);
  const faultId = new URL(page.url()).pathname.split("/faults/")[1];

  // move away from the opening view and change the settings, so restoring them is a real test
  const opening = await cameraOf(page);
  await page.getByTestId("camera-faceOn").click();
  await expect.poll(async () => JSON.stringify(await cameraOf(page))).not.toBe(JSON.stringify(opening));
  await page.getByTestId("colour-mode").selectOption("throw");

  await page.getByTestId("viewpoints-toggle").click();
  await page.getByTestId("viewpoint-save-open").click();
  await page.getByTestId("viewpoint-title").fill(title);
  await page.getByTestId("viewpoint-note").fill("Both segments and the relay, straight on.");
  await page.getByTestId("viewpoint-save").click();
  const item = page.getByTestId("viewpoint-item").filter({ hasText: title });
  await expect(item).toBeVisible();

  const stored = (await (await page.request.get(`/api/faults/${faultId}/viewpoints`)).json()) as {
    viewpoints: { title: string; camera: Camera; settings: { colourMode: string } }[];
  };
  const saved = stored.viewpoints.find((viewpoint) => viewpoint.title === title)!;
  expect(saved.settings.colourMode).toBe("throw");
  expectSameCamera(await cameraOf(page), saved.camera);

  // restoring in the workspace brings the view back after moving away
  await page.getByTestId("camera-overview").click();
  await expect.poll(async () => (await cameraOf(page))?.position[0]).not.toBe(saved.camera.position[0]);
  // a click outside closes the viewpoints panel; open it again
  if (!(await page.getByTestId("viewpoints-panel").isVisible())) await page.getByTestId("viewpoints-toggle").click();
  await item.getByTestId("viewpoint-restore").click();
  await expect.poll(async () => (await cameraOf(page))?.position[0]).toBe(saved.camera.position[0]);
  expectSameCamera(await cameraOf(page), saved.camera);

  // make a link and copy it
  await page.context().grantPermissions(["clipboard-read", "clipboard-write"]);
  await item.getByTestId("viewpoint-share").click();
  await page.getByTestId("link-expiry").selectOption("7");
  await page.getByTestId("link-create").click();
  const url = await page.getByTestId("link-url").inputValue();
  expect(url).toMatch(/\/v\/[A-Za-z0-9_-]{43}$/);
  await page.getByTestId("link-copy").click();
  await expect(page.getByTestId("link-made")).toContainText(/Copied|selected/);
  const token = url.split("/v/")[1];

  // a new, signed-out browser context opens the link
  const guest = await browser.newContext();
  const guestPage = await guest.newPage();
  expect((await guestPage.goto(url))?.status()).toBe(200);
  await expect(guestPage.getByTestId("shared-fault-name")).toHaveText("QG-1");
  await expect(guestPage.getByTestId("shared-viewpoint-title")).toHaveText(title);
  await sceneReady(guestPage);
  expectSameCamera(await cameraOf(guestPage), saved.camera);
  await expect(guestPage.getByTestId("colour-mode")).toHaveValue("throw");
  await expect(guestPage.getByTestId("legend")).toBeVisible();

  // nothing on the page leads into the study, and nothing names it
  const hrefs = await guestPage.locator("a[href]").evaluateAll((anchors) => anchors.map((anchor) => anchor.getAttribute("href") ?? ""));
  expect(hrefs.filter((href) => href.includes("/studies"))).toEqual([]);
  const html = await guestPage.content();
  expect(html).not.toContain(studyId);
  expect(html).not.toContain(faultId);
  expect(html).not.toContain("Quillon Graben");

  // every other API still wants a session
  for (const path of [
    "/api/studies",
    `/api/studies/${studyId}`,
    `/api/faults/${faultId}`,
    `/api/faults/${faultId}/analysis`,
    `/api/faults/${faultId}/viewpoints`,
  ]) {
    expect((await guest.request.get(path)).status(), path).toBe(401);
  }
  expect((await guest.request.get(`/api/v/${token}`)).status()).toBe(200);

  // the presenter revokes the link; the guest now sees the revoked page
  const linkItem = page.getByTestId("link-item").first();
  await linkItem.getByTestId("link-revoke").click();
  await expect(linkItem).toHaveAttribute("data-state", "revoked");
  // the page says why, and the answer says so too: 410 Gone
  expect((await guestPage.reload())?.status()).toBe(410);
  await expect(guestPage.getByTestId("link-revoked")).toBeVisible();
  await expect(guestPage.getByRole("heading", { name: "This link was revoked" })).toBeVisible();
  expect((await guest.request.get(`/api/v/${token}`)).status()).toBe(410);
  expect((await guest.request.get(`/api/v/${token}/display`)).status()).toBe(410);
  // an unknown token is not found: 404 with a page that says so
  const nearMiss = (token[0] === "A" ? "B" : "A") + token.slice(1);
  expect((await guestPage.goto(url.replace(token, nearMiss)))?.status()).toBe(404);
  await expect(guestPage.getByTestId("link-not-found")).toBeVisible();
  await guest.close();
});

import { expect, test, type Browser, type Page } from "@playwright/test";
import { openDemoStudy, signIn } from "./helpers";

type CameraState = { position: [number, number, number]; target: [number, number, number]; up: [number, number, number]; fov: number };

async function personAt(browser: Browser, email: string) {
  const context = await browser.newContext();
  const page = await context.newPage();
  await signIn(page, email);
  return page;
}

async function openQg1Pins(page: Page) {
  await page.goto("/studies");
  await openDemoStudy(page);
  await page.getByTestId("fault-table").getByRole("link", { name: "QG-1", exact: true }).click();
  await expect(page.getByTestId("fault-sheet")).toBeVisible({ timeout: 60_000 });
  await page.waitForFunction(() => (window as unknown as { __slipfieldSceneReady?: boolean }).__slipfieldSceneReady === true, null, { timeout: 60_000 });
  await page.getByTestId("side-tab-pins").click();
  await expect(page.getByTestId("pins-panel")).toBeVisible();
}

/** Clicks the 3D view near its centre until a click lands on the fault surface (the pin form opens). */
async function clickSurfaceNearCentre(page: Page) {
  const canvas = page.getByTestId("viewer-card").locator("canvas").first();
  const box = (await canvas.boundingBox())!;
  const offsets = [
    [0, 0],
    [0, 0.08],
    [0, -0.08],
    [0.08, 0],
    [-0.08, 0],
    [0.15, 0.1],
    [-0.15, -0.1],
    [0.15, -0.1],
    [-0.15, 0.1],
  ];
  for (const [dx, dy] of offsets) {
    await page.mouse.click(box.x + box.width * (0.5 + dx), box.y + box.height * (0.5 + dy));
    if (await page.getByTestId("pin-form").isVisible()) return;
  }
  await expect(page.getByTestId("pin-form")).toBeVisible({ timeout: 2_000 });
}

test("a reviewer pins a note on the surface, the interpreter gets the e-mail, replies, and the reviewer resolves it", async ({ browser }) => {
  const tag = `t${Date.now().toString(36)}`;
  const note = `Throw jumps here (${tag}): mis-pick? @interpreter please check **this** ramp`;

  // the reviewer pins a note mentioning the interpreter
  const reviewer = await personAt(browser, "reviewer@quillon.test");
  await openQg1Pins(reviewer);
  await reviewer.getByTestId("pin-a-note").click();
  await expect(reviewer.getByTestId("pin-placing-hint")).toBeVisible();
  await clickSurfaceNearCentre(reviewer);
  // typed as a person would: the @mention is chosen from the offered people
  const input = reviewer.getByTestId("pin-body-input");
  await input.fill(`Throw jumps here (${tag}): mis-pick? `);
  await input.pressSequentially("@inter");
  await expect(reviewer.getByTestId("mention-option").first()).toContainText("@interpreter");
  await input.press("Enter");
  await expect(reviewer.getByTestId("mention-list")).toHaveCount(0);
  await input.pressSequentially("please check **this** ramp");
  await expect(input).toHaveValue(note);
  await reviewer.getByTestId("pin-save").click();
  const reviewersPin = reviewer.getByTestId("pin-item").filter({ hasText: tag });
  await expect(reviewersPin).toHaveCount(1);
  await expect(reviewersPin.getByTestId("pin-state")).toHaveText("Open");
  await expect(reviewersPin.locator("strong")).toHaveText("this");
  await expect(reviewer.getByTestId("pin-form")).toHaveCount(0);

  // the e-mail to the interpreter is in the outbox (which only an owner may open)
  const owner = await personAt(browser, "owner@quillon.test");
  await owner.goto("/outbox");
  const mention = owner.getByTestId("outbox-message").filter({ hasText: tag }).filter({ hasText: "interpreter@quillon.test" });
  await expect(mention).toHaveCount(1);
  await expect(mention.getByTestId("outbox-subject")).toHaveText("Ada Nwosu mentioned you on QG-1");
  await reviewer.goto("/outbox");
  await expect(reviewer.getByTestId("outbox-message")).toHaveCount(0);

  // the interpreter sees it unread, flies to it, and replies
  const interpreter = await personAt(browser, "interpreter@quillon.test");
  await openQg1Pins(interpreter);
  const pinForInterpreter = interpreter.getByTestId("pin-item").filter({ hasText: tag });
  await expect(pinForInterpreter.getByTestId("pin-unread")).toBeVisible();
  const pinId = await pinForInterpreter.getAttribute("data-pin-id");
  const pins = await (await interpreter.request.get(`/api/faults/${interpreter.url().split("/faults/")[1].split("?")[0]}/pins`)).json();
  const stored = pins.pins.find((pin: { id: string }) => pin.id === pinId);
  await pinForInterpreter.getByTestId("pin-goto").click();
  await expect
    .poll(async () => {
      const camera = await interpreter.evaluate(() => (window as unknown as { __slipfieldCamera?: () => CameraState | null }).__slipfieldCamera?.() ?? null);
      return camera ? Math.hypot(camera.target[0] - stored.x, camera.target[1] - stored.y, camera.target[2] - stored.z) : Infinity;
    })
    .toBeLessThan(1);
  const camera = await interpreter.evaluate(() => (window as unknown as { __slipfieldCamera: () => CameraState }).__slipfieldCamera());
  expect(Math.hypot(camera.position[0] - stored.x, camera.position[1] - stored.y, camera.position[2] - stored.z)).toBeCloseTo(800, 0);
  await pinForInterpreter.getByTestId("reply-input").fill(`Agreed, re-picking in v2 (${tag}).`);
  await pinForInterpreter.getByTestId("reply-send").click();
  await expect(pinForInterpreter.getByTestId("reply-item")).toContainText("re-picking in v2");
  await expect(pinForInterpreter.getByTestId("pin-resolve")).toHaveCount(0);

  // the reviewer, told by e-mail, resolves the pin
  await owner.goto("/outbox");
  await expect(owner.getByTestId("outbox-message").filter({ hasText: "reviewer@quillon.test" }).filter({ hasText: tag })).toHaveCount(1);
  await openQg1Pins(reviewer);
  const thread = reviewer.getByTestId("pin-item").filter({ hasText: tag });
  await thread.getByTestId("pin-goto").click();
  await expect(thread.getByTestId("reply-item")).toContainText("re-picking in v2");
  await thread.getByTestId("pin-resolve").click();
  await expect(thread).toHaveAttribute("data-state", "resolved");
  await expect(thread.getByTestId("pin-state")).toHaveText("Resolved");
  await reviewer.getByTestId("pin-filter-open").click();
  await expect(reviewer.getByTestId("pin-item").filter({ hasText: tag })).toHaveCount(0);

  // a viewer reads but cannot pin, and the API refuses them
  const viewer = await personAt(browser, "viewer@quillon.test");
  await openQg1Pins(viewer);
  await expect(viewer.getByTestId("pin-item").filter({ hasText: tag })).toHaveCount(1);
  await expect(viewer.getByTestId("pin-a-note")).toHaveCount(0);
  const refused = await viewer.request.post(`/api/pins/${pinId}/replies`, { data: { body: "me too" } });
  expect(refused.status()).toBe(403);
});

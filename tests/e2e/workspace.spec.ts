import { readFileSync } from "node:fs";
import path from "node:path";
import { expect, test } from "@playwright/test";
import { distinctColours, openDemoStudy, signIn } from "./helpers";

function demoCsvWithPlantedBadRow() {
  const lines = readFileSync(path.join(process.cwd(), "public/demo/qg-4-throw-picks.csv"), "utf8").trimEnd().split("\n");
  // Spreadsheet row 6 (header is row 1) gets a throw that is not a number.
  const cells = lines[5].split(",");
  cells[3] = "twelve";
  lines[5] = cells.join(",");
  return Buffer.from(lines.join("\n") + "\n");
}

test("an interpreter uploads picks, sees the planted bad row, confirms, and gets the surface and fault sheet", async ({ page }) => {
  await signIn(page, "interpreter@quillon.test");
  await openDemoStudy(page);
  await page.getByTestId("new-fault").click();
  await page.getByLabel("Name").fill("QG-4 rework");
  await page.getByTestId("new-fault-submit").click();
  // adding a fault opens it, ready for its picks
  await expect(page.getByTestId("fault-title")).toHaveText("QG-4 rework");
  await expect(page.getByTestId("no-picks")).toBeVisible();
  await page.getByTestId("pick-file").setInputFiles({ name: "qg-4-rework.csv", mimeType: "text/csv", buffer: demoCsvWithPlantedBadRow() });
  await expect(page.getByTestId("upload-preview")).toBeVisible();
  const problem = page.getByTestId("problem-row");
  await expect(problem).toHaveCount(1);
  await expect(problem).toContainText("Row 6");
  await expect(problem).toContainText("throw");
  await expect(page.getByTestId("confirm-upload")).toBeDisabled();
  await page.getByTestId("drop-bad-rows").check();
  await page.getByTestId("confirm-upload").click();

  await expect(page.getByTestId("fault-sheet")).toBeVisible({ timeout: 60_000 });
  await expect(page.getByTestId("sheet-dmax")).toHaveText(/^\d[\d,.]* m$/);
  await expect(page.getByTestId("sheet-length")).toHaveText(/^\d[\d,.]* m$/);
  await expect(page.getByTestId("caution")).toContainText("Screening only");

  await page.waitForFunction(() => (window as unknown as { __slipfieldSceneReady?: boolean }).__slipfieldSceneReady === true, null, { timeout: 60_000 });
  const canvas = page.locator("canvas").first();
  const colours = await distinctColours(page, await canvas.screenshot());
  expect(colours).toBeGreaterThan(200);
});

test("a reviewer sees no upload control and the upload API refuses them", async ({ page }) => {
  await signIn(page, "reviewer@quillon.test");
  await openDemoStudy(page);
  await page.getByTestId("fault-table").getByRole("link", { name: "QG-4", exact: true }).click();
  await expect(page.getByTestId("fault-sheet")).toBeVisible();
  await expect(page.getByTestId("open-upload")).toHaveCount(0);
  const faultId = page.url().split("/faults/")[1];
  const response = await page.request.post(`/api/faults/${faultId}/pick-sets?step=preview`, {
    multipart: { file: { name: "x.csv", mimeType: "text/csv", buffer: Buffer.from("x,y,z,throw\n1,2,3,4\n") } },
  });
  expect(response.status()).toBe(403);
});

test("without WebGL the page falls back to the 2D contour map and the fault sheet", async ({ browser }) => {
  const context = await browser.newContext();
  await context.addInitScript(() => {
    const original = HTMLCanvasElement.prototype.getContext;
    HTMLCanvasElement.prototype.getContext = function (this: HTMLCanvasElement, kind: string, ...rest: unknown[]) {
      if (kind === "webgl" || kind === "webgl2" || kind === "experimental-webgl") return null;
      return (original as (...args: unknown[]) => unknown).call(this, kind, ...rest);
    } as typeof HTMLCanvasElement.prototype.getContext;
  });
  const page = await context.newPage();
  await signIn(page, "viewer@quillon.test");
  await openDemoStudy(page);
  await page.getByTestId("fault-table").getByRole("link", { name: "QG-1", exact: true }).click();
  await expect(page.getByTestId("fault-sheet")).toBeVisible();
  const map = page.getByTestId("fault-map-2d");
  await expect(map).toBeVisible();
  expect(await map.locator("path, polyline, polygon").count()).toBeGreaterThan(5);
  await expect(page.locator("canvas")).toHaveCount(0);
  await context.close();
});

import { readFileSync } from "node:fs";
import path from "node:path";
import { expect, test } from "@playwright/test";
import { distinctColours, openDemoStudy, signIn } from "./helpers";

function demoCsvWithPlantedBadRow() {
  const lines = readFileSync(path.join(process.cwd(), "public/demo/qg-4-throw-picks.csv"), "utf8").trimEnd().split("\n");
  // Spreadsheet row 6 (header is row 1) gets a throw that is not a number.
  const throwColumn = lines[0]
    .split(",")
    .map((name) => name.trim().toLowerCase())
    .indexOf("throw");
  const cells = lines[5].split(",");
  cells[throwColumn] = "twelve";
  lines[5] = cells.join(",");
  // the throws that remain once that row is dropped: the fault sheet's numbers must come from these
  const throws = lines
    .slice(1)
    .filter((_, k) => k !== 4)
    .map((line) => Number(line.split(",")[throwColumn]));
  return { file: Buffer.from(lines.join("\n") + "\n"), maxThrowM: Math.max(...throws), rows: throws.length };
}

/** The fault sheet's way of writing metres (lib/format.ts): 0 decimals from 100 m, 1 from 10 m. */
const sheetMetres = (value: number) =>
  `${value.toLocaleString("en", { minimumFractionDigits: value >= 100 ? 0 : 1, maximumFractionDigits: value >= 100 ? 0 : 1 })} m`;

test("an interpreter uploads picks, sees the planted bad row, confirms, and gets the surface and fault sheet", async ({ page }) => {
  await signIn(page, "interpreter@quillon.test");
  await openDemoStudy(page);
  await page.getByTestId("new-fault").click();
  await page.getByLabel("Name").fill("QG-4 rework");
  await page.getByTestId("new-fault-submit").click();
  // adding a fault opens it, ready for its picks
  await expect(page.getByTestId("fault-title")).toHaveText("QG-4 rework");
  await expect(page.getByTestId("no-picks")).toBeVisible();
  const planted = demoCsvWithPlantedBadRow();
  await expect(page.getByTestId("quality-use")).toContainText("weights each pick in the least-squares plane fit");
  await page.getByTestId("pick-file").setInputFiles({ name: "qg-4-rework.csv", mimeType: "text/csv", buffer: planted.file });
  await expect(page.getByTestId("upload-preview")).toBeVisible();
  const problem = page.getByTestId("problem-row");
  await expect(problem).toHaveCount(1);
  await expect(problem).toContainText("Row 6");
  await expect(problem).toContainText("throw");
  await expect(page.getByTestId("confirm-upload")).toBeDisabled();
  await page.getByTestId("drop-bad-rows").check();
  await page.getByTestId("confirm-upload").click();

  await expect(page.getByTestId("fault-sheet")).toBeVisible({ timeout: 60_000 });
  const faultId = page.url().split("/faults/")[1].split(/[?#]/)[0];
  const { analysis } = await (await page.request.get(`/api/faults/${faultId}/analysis?contours=0`)).json();
  expect(analysis.status).toBe("done");
  const segment = analysis.result.segments[0];
  expect(analysis.result.input.accepted).toBe(planted.rows);
  // Dmax: each pick's throw over the sine of the local dip there (Groshong 2006). lib/demo.ts draws QG-4 gently listric,
  // dip 60° at the top to 44° at the base: the largest displacement lies between the largest throw over sin 60° and
  // over sin 44°; the sheet shows the analysis' value to 0.1 m
  await expect(page.getByTestId("sheet-dmax")).toHaveText(sheetMetres(segment.max.displacementM));
  expect(segment.max.displacementM).toBeGreaterThan(planted.maxThrowM / Math.sin((60 * Math.PI) / 180));
  expect(segment.max.displacementM).toBeLessThan(planted.maxThrowM / Math.sin((44 * Math.PI) / 180));
  // the reference plane: the arc's mean dip, 52°, within half a degree (the picks scatter 3 m off the surface)
  expect(Math.abs(segment.plane.dipDeg - 52)).toBeLessThan(0.5);
  // length: the tip line's, as the API reports it, and longer than the picks' own extent (it lies beyond them)
  // with its 5–95 % range in brackets
  const [lengthLow, lengthHigh] = segment.tipLine.lengthRangeM;
  expect(lengthHigh).not.toBeNull();
  await expect(page.getByTestId("sheet-length")).toHaveText(
    `${sheetMetres(segment.tipLine.lengthM)} (${sheetMetres(lengthLow).replace(" m", "")}–${sheetMetres(lengthHigh as number)})`,
  );
  expect(segment.tipLine.lengthM).toBeGreaterThan(segment.mappedLimit.lengthM);
  await expect(page.getByTestId("sheet-quality")).toContainText("No pick has a quality below 1");
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

import { readFileSync } from "node:fs";
import path from "node:path";
import { expect, test, type Page } from "@playwright/test";
import { openDemoStudy, pictureStats, signIn } from "./helpers";

// An interpreter brings interpretation data rather than throw picks: the cut-off lines of four horizons in two-way
// time. The upload asks for the velocity model, pairs the walls into a derived pick set that is analysed like any
// other, and the fault then has its juxtaposition diagram and its shale gouge ratio colouring.

const sceneReady = (page: Page) =>
  page.waitForFunction(() => (window as unknown as { __slipfieldSceneReady?: boolean }).__slipfieldSceneReady === true, null, { timeout: 60_000 });

const CUTOFF_FILE = path.resolve(__dirname, "../../public/demo/qg-1-cutoff-lines.csv");

test("upload a cut-off file in two-way time, see the derived pick set analysed, open the juxtaposition view and the SGR colour mode", async ({ page }) => {
  const name = `QG-1 cut-offs ${Date.now() % 100000}`;
  await signIn(page, "interpreter@quillon.test");
  await openDemoStudy(page);
  await page.getByTestId("new-fault").click();
  await page.getByLabel("Name").fill(name);
  await page.getByTestId("new-fault-submit").click();
  await expect(page.getByTestId("fault-title")).toHaveText(name);

  // the file is in time: the server says so and the form asks for the velocity model
  const empty = page.getByTestId("no-picks");
  await expect(empty.getByTestId("cutoff-help")).toContainText("wall");
  await empty.getByTestId("pick-file").setInputFiles({ name: "qg-1-cutoff-lines.csv", mimeType: "text/csv", buffer: readFileSync(CUTOFF_FILE) });
  await expect(page.getByTestId("upload-error")).toContainText("is in two-way time (twt, ms). Give a velocity model");
  const velocity = page.getByTestId("velocity-fields");
  await expect(velocity).toBeVisible();
  await velocity.getByTestId("velocity-v0").fill("1800");
  await velocity.getByTestId("velocity-k").fill("0.6");
  await velocity.getByTestId("velocity-apply").click();

  // the preview: each horizon's stations and throws, the stations with one wall, the model and its caution
  const preview = page.getByTestId("upload-preview");
  await expect(preview.getByTestId("upload-depth-conversion")).toContainText("v0 = 1800 m/s and k = 0.6 1/s");
  await expect(preview.getByTestId("upload-depth-conversion")).toContainText("Depth conversion is a major uncertainty in throw");
  const horizons = preview.getByTestId("cutoff-horizons");
  for (const horizon of ["Top Vell Claystone", "Top Quillon Sandstone", "Top Harl Shale", "Top Brack Sandstone"]) await expect(horizons).toContainText(horizon);
  await expect(preview.getByTestId("cutoff-missing")).toContainText("6 stations with a cut-off on one wall only");
  const derived = Number((await preview.getByTestId("cutoff-derived-count").textContent())!.replace(/[^\d]/g, ""));
  expect(derived).toBeGreaterThan(300);
  await page.getByTestId("confirm-upload").click();

  // analysed like any pick set; the fault sheet says where the picks came from and how they were depth-converted
  await expect(page.getByTestId("sheet-dmax")).toHaveText(/^\d[\d,.]* m$/, { timeout: 90_000 });
  await expect(page.getByTestId("sheet-derived")).toContainText("Picks derived from cut-off lines: qg-1-cutoff-lines.csv");
  await expect(page.getByTestId("sheet-velocity")).toContainText("v0 = 1800 m/s and k = 0.6 1/s");
  await expect(page.getByTestId("sheet-depth-caution")).toContainText("major uncertainty in throw");
  // both segments of the file analysed, their picks adding up to the derived ones
  const pickCount = async (segment: string) =>
    Number((await page.getByTestId(`sheet-${segment}`).locator("h3 span").last().textContent())!.replace(/[^\d]/g, ""));
  expect((await pickCount("north")) + (await pickCount("south"))).toBe(derived);
  // the derived picks carry their horizons: the growth views fill in
  await page.getByTestId("view-tab-dip").click();
  await expect(page.getByTestId("horizon-growth")).toBeVisible();
  await expect(page.getByTestId("horizon-growth")).toContainText("Top Quillon Sandstone");

  // the juxtaposition diagram beside the strike profile, with the demo study's stratigraphy
  await page.getByTestId("view-tab-juxtaposition").click();
  const view = page.getByTestId("juxtaposition-view");
  await expect(view.getByTestId("juxtaposition-source")).toContainText("qg-1-cutoff-lines.csv");
  const diagram = view.getByTestId("juxtaposition-diagram");
  await expect(diagram).toBeVisible();
  await expect(diagram.getByTestId("juxtaposition-fw-trace").first()).toBeVisible();
  await expect(diagram.getByTestId("juxtaposition-hw-trace").first()).toBeVisible();
  // reservoir on reservoir is drawn (outlined) and named as a possible pathway, with its area
  await expect(diagram.getByTestId("juxtaposition-area-reservoir-reservoir").first()).toBeVisible();
  await expect(view.getByTestId("juxtaposition-total-reservoir-reservoir")).toContainText(
    /reservoir against reservoir: possible cross-fault pathway: [\d,]+ m²/,
  );
  await expect(view.getByTestId("juxtaposition-areas")).toContainText("Quillon Sandstone");
  await expect(view.getByTestId("seal-caution")).toContainText("licensed, professionals");
  await view.getByTestId("juxtaposition-fill-fw").click();
  await expect(diagram.getByTestId("juxtaposition-unit").first()).toBeVisible();
  // both segments of the file have their diagram
  await view.getByTestId("juxtaposition-segment").selectOption("south");
  await expect(diagram).toHaveAttribute("aria-label", /segment south/);

  // exports: the areas as CSV and the diagram as PNG
  const [csv] = await Promise.all([page.waitForEvent("download"), view.getByTestId("juxtaposition-csv").click()]);
  expect(csv.suggestedFilename()).toMatch(/juxtaposition-south-areas\.csv$/);
  const csvText = readFileSync((await csv.path())!, "utf8").split("\n");
  expect(csvText[0]).toMatch(/^segment,hanging_wall_unit,hanging_wall_kind,footwall_unit,footwall_kind,what_meets_what,area_along_strike_by_vertical_m2/);
  expect(csvText.some((line) => line.startsWith("south,Quillon Sandstone,reservoir,Quillon Sandstone,reservoir,"))).toBe(true);
  const [png] = await Promise.all([page.waitForEvent("download"), view.getByTestId("juxtaposition-png").click()]);
  expect(png.suggestedFilename()).toMatch(/juxtaposition-south\.png$/);
  const pngBytes = readFileSync((await png.path())!);
  expect(pngBytes.subarray(1, 4).toString()).toBe("PNG");
  expect((await pictureStats(page, pngBytes)).distinctColours).toBeGreaterThan(8);

  // the shale gouge ratio as a colour mode of the 3D surface, with the guide and the containment caution
  await sceneReady(page);
  await page.getByTestId("colour-mode").selectOption({ label: "shale gouge ratio" });
  await expect(page.getByTestId("legend-title")).toHaveText("Shale gouge ratio (%)");
  await expect(page.getByTestId("legend-guide")).toContainText("~20 % guide (Yielding et al. 1997)");
  await expect(page.getByTestId("field-note")).toContainText("screening guide, not a verdict");
  await expect(page.getByTestId("field-note")).toContainText("licensed professionals");
  const canvas = page.getByTestId("fault-scene").locator("canvas");
  await expect(canvas).toBeVisible();
  expect((await pictureStats(page, await canvas.screenshot())).distinctColours).toBeGreaterThan(50);
  // and of the plane map
  await page.getByTestId("view-mode-map").click();
  await expect(page.getByTestId("map-field").first()).toBeVisible();
  await expect(page.getByTestId("map-field-scale")).toContainText("shale gouge ratio (%)");
  await expect(page.getByTestId("field-note")).toContainText("Yielding, Freeman & Needham 1997");
});

test("the demo study shows QG-1's juxtaposition diagram and SGR out of the box, read-only for a viewer", async ({ page }) => {
  await signIn(page, "viewer@quillon.test");
  await openDemoStudy(page);
  await page.getByTestId("fault-table").getByRole("link", { name: "QG-1", exact: true }).click();
  await sceneReady(page);
  await page.getByTestId("view-tab-juxtaposition").click();
  const view = page.getByTestId("juxtaposition-view");
  await expect(view.getByTestId("juxtaposition-diagram")).toBeVisible();
  await expect(view.getByTestId("stratigraphy-table")).toContainText("Quillon Sandstone");
  await expect(view.getByTestId("stratigraphy-table")).toContainText("reservoir");
  await expect(view.getByTestId("stratigraphy-edit")).toHaveCount(0);
  await page.getByTestId("colour-mode").selectOption({ label: "shale gouge ratio" });
  await expect(page.getByTestId("legend-title")).toHaveText("Shale gouge ratio (%)");
});

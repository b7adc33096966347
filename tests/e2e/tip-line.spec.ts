import { expect, test } from "@playwright/test";
import { openDemoStudy, signIn } from "./helpers";

// The inferred tip line as a person reads it: a central line with its 5–95 % lines, ranges on the fault sheet, and an
// open end drawn apart when the interpreter says the data stop there.
test("the tip line's range is drawn and stated, and an open end set by the interpreter is drawn apart", async ({ page }) => {
  await signIn(page, "interpreter@quillon.test");
  await openDemoStudy(page);
  await page.getByTestId("fault-table").getByRole("link", { name: "QG-4", exact: true }).click();
  await expect(page.getByTestId("fault-sheet")).toBeVisible();

  // ranges on the fault sheet, from the report the page reads
  const faultId = page.url().split("/faults/")[1].split(/[?#]/)[0];
  const { analysis } = await (await page.request.get(`/api/faults/${faultId}/analysis?contours=0`)).json();
  const segment = analysis.result.segments[0];
  const [lengthLow, lengthHigh] = segment.tipLine.lengthRangeM as [number, number];
  expect(lengthLow).toBeLessThan(segment.tipLine.lengthM);
  expect(lengthHigh).toBeGreaterThan(segment.tipLine.lengthM);
  const whole = (value: number) => Math.round(value).toLocaleString("en");
  await expect(page.getByTestId("sheet-length")).toHaveText(`${whole(segment.tipLine.lengthM)} m (${whole(lengthLow)}–${whole(lengthHigh)} m)`);
  await expect(page.getByTestId("sheet-height")).toContainText("–");
  await expect(page.getByTestId("sheet-dmax-fitted")).toContainText("–");
  await expect(page.getByTestId("sheet-cutoff")).toContainText("displacement");
  await expect(page.getByTestId("sheet-ends")).toHaveText(/strike start inferred, strike end inferred, up dip inferred, down dip inferred/);
  await expect(page.getByTestId("legend-tip-band")).toBeVisible();

  // the plane map draws the central line and the inner and outer lines of every segment, no open edge yet
  await page.getByTestId("view-mode-map").click();
  await expect(page.getByTestId("map-tip-line")).toHaveCount(1);
  await expect(page.getByTestId("map-tip-band")).toHaveCount(2);
  await expect(page.getByTestId("map-open-edge")).toHaveCount(0);

  // the interpreter says the survey stops at the strike end: a new run, kept beside the first
  await page.getByTestId("side-tab-runs").click();
  await page.getByTestId("setting-end-strike-end").selectOption("open");
  await page.getByTestId("run-again").click();
  await expect(page.getByTestId("run-row")).toHaveCount(2);
  await expect(page.getByTestId("run-row").first()).toContainText("strike end open");
  await expect(page.getByTestId("run-row").first()).toContainText("(open end)", { timeout: 60_000 });
  // the new run's surface loads in a fresh viewer: back to the plane map
  await page.getByTestId("view-mode-map").click();
  await expect(page.getByTestId("map-open-edge")).toHaveCount(1);
  await page.getByTestId("side-tab-sheet").click();
  await expect(page.getByTestId("sheet-length")).toHaveText(/^≥ .* \(open end\)$/);
  await expect(page.getByTestId("sheet-ends")).toContainText("strike end open (set)");

  // the strike profile marks the open end apart from the inferred tip and shades the inferred tip's band
  await page.getByTestId("view-tab-strike").click();
  await expect(page.locator("[data-testid=strike-profile-chart] .open-end circle, [data-testid=strike-profile-chart] .open-end path").first()).toBeAttached();
  await expect(page.locator("[data-testid=strike-profile-chart] .tip-band rect").first()).toBeAttached();

  // the two runs side by side
  await page.getByTestId("side-tab-runs").click();
  const ticks = page.getByTestId("run-pick");
  await ticks.nth(0).check();
  await ticks.nth(1).check();
  await page.getByTestId("runs-compare").click();
  await expect(page.getByTestId("compare-map")).toHaveCount(1);
  await expect(page.getByTestId("compare-run-1")).toBeAttached();
  await expect(page.getByTestId("compare-run-2")).toBeAttached();
  await expect(page.getByTestId("compare-sheet-1")).toContainText("strike end open");
  await expect(page.getByTestId("compare-sheet-2")).toContainText("defaults");
});

test("a reviewer sees the runs but cannot start one", async ({ page }) => {
  await signIn(page, "reviewer@quillon.test");
  await openDemoStudy(page);
  await page.getByTestId("fault-table").getByRole("link", { name: "QG-1", exact: true }).click();
  await page.getByTestId("side-tab-runs").click();
  await expect(page.getByTestId("run-row").first()).toBeVisible();
  await expect(page.getByTestId("run-settings")).toHaveCount(0);
});

import { readFileSync } from "node:fs";
import { expect, test } from "@playwright/test";
import { openDemoStudy, signIn } from "./helpers";

test("an interpreter enters a stress state on QG-1, reads the screen with its caution, colours the surface by slip tendency and exports the triangles", async ({
  page,
}) => {
  await signIn(page, "interpreter@quillon.test");
  await openDemoStudy(page);
  await page.getByTestId("fault-table").getByRole("link", { name: "QG-1", exact: true }).click();
  await expect(page.getByTestId("fault-sheet")).toBeVisible({ timeout: 60_000 });
  const faultId = page.url().split("/faults/")[1].split(/[?#]/)[0];

  await page.getByTestId("side-tab-stress").click();
  const panel = page.getByTestId("stress-panel");
  await expect(panel.getByTestId("stress-caution")).toContainText("Screening only");
  if (await panel.getByTestId("stress-edit").count()) await panel.getByTestId("stress-edit").click();

  // an edited preset that breaks the normal-fault ordering (Sv 15 < SHmax 18 MPa/km, both within range) is refused,
  // naming the regime and the way out
  await panel.getByTestId("stress-regime").selectOption("normal");
  await panel.getByTestId("stress-verticalGradient").fill("15");
  await panel.getByTestId("stress-save").click();
  await expect(panel.getByTestId("stress-form")).toContainText(
    'The gradients do not follow the Normal faulting (Sv ≥ SHmax ≥ Shmin) ordering; fix them or choose "custom"',
  );
  await expect(panel.getByTestId("stress-form")).not.toContainText("must be between");
  // a value out of range is a different error, naming the field and its unit
  await panel.getByTestId("stress-verticalGradient").fill("-2");
  await panel.getByTestId("stress-save").click();
  await expect(panel.getByTestId("stress-form")).toContainText("Vertical stress gradient must be between 0.1 and 100 MPa/km");

  await panel.getByTestId("stress-regime").selectOption("strike-slip");
  await panel.getByTestId("stress-regime").selectOption("normal");
  await expect(panel.getByTestId("stress-verticalGradient")).toHaveValue("24");
  await panel.getByTestId("stress-maxHorizontalAzimuthDeg").fill("150");
  await panel.getByTestId("stress-source").fill("illustrative normal-fault preset (e2e)");
  await panel.getByTestId("stress-save").click();

  await expect(panel.getByTestId("stress-state")).toContainText("illustrative normal-fault preset (e2e)");
  await expect(panel.getByTestId("stress-summary")).toContainText(/smallest pore-pressure increase to failure is -?\d+\.\d MPa at μ = 0\.6/, {
    timeout: 60_000,
  });
  const atDefault = await (await page.request.get(`/api/faults/${faultId}/stress/result`)).json();
  // the panel states the smoothing length the server used, and the minimum ΔP it found, to the hundredth
  await expect(panel.getByTestId("stress-length-value")).toHaveText(`${atDefault.orientation.lengthScaleM} m`);
  expect(atDefault.orientation.lengthScaleM).toBe(atDefault.orientation.defaultLengthScaleM);
  await expect(panel.getByTestId("stress-min-dp")).toContainText(`${atDefault.summary.minPressureToFailureMPa.critical.toFixed(2)} MPa at the more critical μ`);
  await expect(panel.getByTestId("stress-blind-spots")).toContainText("orientation below the smoothing length");
  await expect(panel.getByTestId("stress-blind-spots")).toContainText("faults that are not mapped");

  // the user changes the length: a bad one is refused in place, a good one re-screens at that length
  await panel.getByTestId("stress-length-input").fill("5");
  await expect(panel.getByTestId("stress-length-scale")).toContainText("A length in metres between 10 and 5000");
  await expect(panel.getByTestId("stress-length-apply")).toBeDisabled();
  await panel.getByTestId("stress-length-input").fill("600");
  await panel.getByTestId("stress-length-apply").click();
  await expect(panel.getByTestId("stress-length-value")).toHaveText("600 m");
  const atSix = await (await page.request.get(`/api/faults/${faultId}/stress/result?lengthScaleM=600`)).json();
  await expect(panel.getByTestId("stress-min-dp")).toContainText(`${atSix.summary.minPressureToFailureMPa.critical.toFixed(2)} MPa at the more critical μ`);
  await expect(panel.getByTestId("stress-export-csv")).toHaveAttribute("href", `/api/faults/${faultId}/stress/export?format=csv&lengthScaleM=600`);
  await panel.getByTestId("stress-length-default").click();
  await expect(panel.getByTestId("stress-length-value")).toHaveText(`${atDefault.orientation.lengthScaleM} m`);
  await expect(panel.getByTestId("stress-caution")).toBeVisible();
  await expect(panel.getByTestId("stress-histogram").locator("svg").first()).toBeVisible();
  await expect(panel.getByTestId("stress-mohr").locator("svg").first()).toBeVisible();

  await page.waitForFunction(() => (window as unknown as { __slipfieldSceneReady?: boolean }).__slipfieldSceneReady === true, null, { timeout: 60_000 });
  await expect(page.getByTestId("legend-title")).toHaveText("Displacement (m)");
  await panel.getByTestId("stress-colour-slip").click();
  await expect(page.getByTestId("legend-title")).toHaveText(/Slip tendency/);
  await panel.getByTestId("stress-colour-dp").click();
  await expect(page.getByTestId("legend-title")).toHaveText(/ΔP to failure.*\(MPa\)/);
  // the colour list keeps the capital Δ (no text transform lower-cases it)
  const chosen = await page.getByTestId("colour-mode").evaluate((select: HTMLSelectElement) => select.selectedOptions[0].textContent ?? "");
  expect(chosen).toMatch(/^ΔP to failure/);
  // the fault sheet names the stress state's version in words
  await page.getByTestId("side-tab-sheet").click();
  await expect(page.getByTestId("sheet-stress")).toContainText(/Stress state version \d+;[^.]*; screening only/);
  await expect(page.getByTestId("sheet-stress")).not.toContainText("v—");
  await page.getByTestId("side-tab-stress").click();

  const result = await (await page.request.get(`/api/faults/${faultId}/stress/result`)).json();
  const downloading = page.waitForEvent("download");
  await panel.getByTestId("stress-export-csv").click();
  const download = await downloading;
  expect(download.suggestedFilename()).toMatch(/^reactivation-screen-v\d+\.csv$/);
  const lines = readFileSync((await download.path())!, "utf8")
    .trim()
    .split("\n");
  expect(lines[0]).toMatch(/^# Screening only/);
  expect(lines[1]).toBe(
    "segment,centroid_x_m,centroid_y_m,centroid_z_m,normal_x,normal_y,normal_z,area_m2,depth_m,sigma_n_mpa,tau_mpa,pore_pressure_mpa,sigma_n_eff_mpa,slip_tendency,dilation_tendency,dp_failure_mu_low_mpa,dp_failure_mu_high_mpa,dp_failure_critical_mpa,dp_failure_critical_min_mpa,dp_failure_critical_max_mpa,orientation_uncertainty_deg",
  );
  expect(lines.length - 2).toBe(result.summary.triangleCount);
  expect(result.summary.triangleCount).toBeGreaterThan(1000);
});

test("a viewer sees the screen and the caution but no stress form, and the API refuses their save", async ({ page }) => {
  await signIn(page, "viewer@quillon.test");
  await openDemoStudy(page);
  await page.getByTestId("fault-table").getByRole("link", { name: "QG-1", exact: true }).click();
  await expect(page.getByTestId("fault-sheet")).toBeVisible({ timeout: 60_000 });
  const faultId = page.url().split("/faults/")[1].split(/[?#]/)[0];
  await page.getByTestId("side-tab-stress").click();
  const panel = page.getByTestId("stress-panel");
  await expect(panel.getByTestId("stress-caution")).toBeVisible();
  await expect(panel.getByTestId("stress-form")).toHaveCount(0);
  await expect(panel.getByTestId("stress-edit")).toHaveCount(0);
  const response = await page.request.post(`/api/faults/${faultId}/stress`, { data: { parameters: {}, source: "" } });
  expect(response.status()).toBe(403);
});

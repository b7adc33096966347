import { readFileSync } from "node:fs";
import { expect, test, type Locator, type Page } from "@playwright/test";
import { openDemoStudy, signIn } from "./helpers";

async function openFault(page: Page, name: string, who = "viewer@quillon.test") {
  await signIn(page, who);
  await openDemoStudy(page);
  await page.getByTestId("fault-table").getByRole("link", { name, exact: true }).click();
  await expect(page.getByTestId("analysis-views-panel")).toBeVisible({ timeout: 60_000 });
}

/** The chart's plotted point count (data-points) must equal the dots drawn by the given mark class. */
async function expectPointsDrawn(chart: Locator, markClass: string) {
  await expect(chart.locator("svg").first()).toBeVisible();
  const declared = Number(await chart.getAttribute("data-points"));
  expect(declared).toBeGreaterThan(0);
  await expect(chart.locator(`g.${markClass} circle`)).toHaveCount(declared);
  return declared;
}

async function axisLabels(chart: Locator) {
  return (await chart.locator('g[aria-label$="axis label"] text').allTextContents()).join(" | ");
}

async function download(page: Page, trigger: Locator) {
  const [file] = await Promise.all([page.waitForEvent("download"), trigger.click()]);
  return { name: file.suggestedFilename(), bytes: readFileSync((await file.path())!) };
}

const isPng = (bytes: Buffer) => bytes.subarray(0, 8).equals(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]));

test("QG-1: strike profile with both segments, the overlap and an honest legend; relay view; scaling chart", async ({ page }) => {
  await openFault(page, "QG-1");
  const chart = page.getByTestId("strike-profile-chart");
  const points = await expectPointsDrawn(chart, "profile-point");
  expect(await axisLabels(chart)).toMatch(/Along strike, common mean-strike coordinate \(m\)/);
  expect(await axisLabels(chart)).toMatch(/Displacement \(m\)/);
  await expect(chart).toContainText("overlap (relay)");
  await expect(chart).toContainText("fitted model");
  // QG-1's segments both have resolvable data at some places along strike within the relay: the legend lists the sum
  // line drawn there, and no note says it is missing
  await expect(chart).toContainText("sum of segments");
  await expect(page.getByTestId("no-sum-note")).toHaveCount(0);

  await page.getByTestId("profile-mode").selectOption("column-max");
  await expect(chart).toHaveAttribute("data-points", /\d+/);
  expect(Number(await chart.getAttribute("data-points"))).toBeGreaterThanOrEqual(points);
  await page.getByTestId("profile-quantity").selectOption("throw");
  expect(await axisLabels(chart)).toMatch(/Throw \(m\)/);

  const csv = await download(page, page.getByTestId("strike-profile-chart-csv"));
  expect(csv.name).toMatch(/QG-1-strike-profile-column-max-throw\.csv$/);
  const lines = csv.bytes.toString("utf8").trim().split("\n");
  expect(lines[0]).toBe("series,along_strike_m,s_m,t_m,throw_m");
  expect(lines.some((line) => line.startsWith("sum,"))).toBe(true);
  const png = await download(page, page.getByTestId("strike-profile-chart-png"));
  expect(isPng(png.bytes)).toBe(true);
  // the PNG stands alone: taller than the plot by its title and legend (PNG header: width and height at bytes 16 and 20, at 2×)
  const plotHeight = (await chart.locator("svg").last().boundingBox())!.height;
  expect(png.bytes.readUInt32BE(20) / 2).toBeGreaterThan(plotHeight + 24 + 16);

  // a drawn line on the plan map
  await page.getByTestId("profile-mode").selectOption("line");
  // the plan's own svg (the colour legend's comes first)
  const map = page.getByTestId("profile-line-map").locator("svg").last();
  const box = (await map.boundingBox())!;
  await page.mouse.move(box.x + box.width * 0.25, box.y + box.height * 0.5);
  await page.mouse.down();
  await page.mouse.move(box.x + box.width * 0.6, box.y + box.height * 0.55, { steps: 5 });
  await page.mouse.move(box.x + box.width * 0.85, box.y + box.height * 0.6, { steps: 5 });
  await page.mouse.up();
  await expectPointsDrawn(chart, "profile-point");
  expect(await axisLabels(chart)).toMatch(/Distance along the drawn line \(m\)/);

  await page.getByTestId("view-tab-relays").click();
  const sketch = page.getByTestId("relay-sketch");
  await expect(sketch.locator("svg").first()).toBeVisible();
  expect(await axisLabels(sketch)).toMatch(/Along mean strike \(m\)/);
  expect(await axisLabels(sketch)).toMatch(/Across strike, toward dip \(m\)/);
  await expect(sketch).toContainText(/overlap O = \d+ m/);
  await expect(sketch).toContainText(/separation S = \d+ m/);
  await expect(page.getByTestId("relay-facts")).toContainText("Long & Imber 2011");
  await expect(page.getByTestId("relay-linkage")).toHaveText(/linked|breached/);
  await expect(page.getByTestId("relay-ramp")).toHaveText(/ψ ≈ \d+(\.\d)?°/);
  await expect(page.getByTestId("relay-facts")).toContainText("Fossen & Rotevatn 2016");
  await expect(page.getByTestId("relay-ramp-horizons")).toContainText("No horizon picked on both segments");

  await page.getByTestId("view-tab-scaling").click();
  const scaling = page.getByTestId("scaling-chart");
  const faults = await expectPointsDrawn(scaling, "fault-point");
  expect(faults).toBeGreaterThanOrEqual(2);
  expect(await axisLabels(scaling)).toMatch(/Fault length L, inferred tip line \(m\)/);
  expect(await axisLabels(scaling)).toMatch(/Maximum displacement Dmax \(m\)/);
  await expect(scaling).toContainText("Schlische et al. 1996");
  await expect(scaling).toContainText("Barnett et al. 1987");
  const scalingCsv = await download(page, page.getByTestId("scaling-chart-csv"));
  const scalingLines = scalingCsv.bytes.toString("utf8").trim().split("\n");
  expect(scalingLines[0]).toBe("fault,length_m,length_p05_m,length_p95_m,length_is_minimum,dmax_fitted_m,dmax_p05_m,dmax_p95_m,d_over_l,segments");
  expect(scalingLines).toHaveLength(faults + 1);
});

test("QG-4: single-segment views, down-dip profile, no relay tab, and every export", async ({ page }) => {
  await openFault(page, "QG-4");
  await expect(page.getByTestId("view-tab-relays")).toHaveCount(0);
  const chart = page.getByTestId("strike-profile-chart");
  await expectPointsDrawn(chart, "profile-point");
  expect(await axisLabels(chart)).toMatch(/Along strike, s \(m\)/);

  await page.getByTestId("view-tab-dip").click();
  const dip = page.getByTestId("dip-profile-chart");
  await expect(dip.locator("svg").first()).toBeVisible();
  expect(Number(await dip.getAttribute("data-points"))).toBeGreaterThan(5);
  expect(await axisLabels(dip)).toMatch(/Down dip, t \(m; positive downward\)/);
  await expect(page.getByTestId("no-horizons")).toBeVisible();

  await page.getByTestId("view-tab-export").click();
  const grid = await download(page, page.getByTestId("export-grid.csv"));
  // the demo study's coordinate reference heads every CSV export as comment lines
  const gridText = grid.bytes.toString("utf8").trim().split("\n");
  expect(gridText[0]).toBe("# coordinate reference: EPSG:32631 (WGS 84 / UTM zone 31N), metres; z elevation above EPSG:5714 (MSL height), metres, positive up");
  const gridLines = gridText.filter((line) => !line.startsWith("#"));
  expect(gridLines[0]).toBe("segment,s,t,x,y,z,displacement,throw,offset,local_dip,local_strike");
  expect(gridLines.length).toBeGreaterThan(1000);
  const maxDisplacement = Math.max(...gridLines.slice(1).map((line) => Number(line.split(",")[6])));
  expect(maxDisplacement).toBeGreaterThan(30);
  expect(maxDisplacement).toBeLessThan(120);

  const picks = await download(page, page.getByTestId("export-picks.csv"));
  const pickLines = picks.bytes
    .toString("utf8")
    .trim()
    .split("\n")
    .filter((line) => !line.startsWith("#"));
  expect(pickLines[0]).toBe("row,segment,horizon,x,y,z,throw,heave,s,t,displacement,surface_displacement,residual");
  expect(pickLines.length).toBeGreaterThan(2000);

  const profiles = await download(page, page.getByTestId("export-profiles.csv-mode-centre-line"));
  expect(
    profiles.bytes
      .toString("utf8")
      .split("\n")
      .find((line) => !line.startsWith("#")),
  ).toBe("segment,mode,s,t,x,y,z,displacement,throw");

  const geo = await download(page, page.getByTestId("export-contours.geojson"));
  const collection = JSON.parse(geo.bytes.toString("utf8"));
  expect(collection.type).toBe("FeatureCollection");
  const kinds = new Set(collection.features.map((feature: { properties: { kind: string } }) => feature.properties.kind));
  expect([...kinds].sort()).toEqual(["contour", "mapped-limit", "tip-line"]);
  expect(collection.features[0].geometry.coordinates[0]).toHaveLength(3);
  expect(collection.crs.properties.name).toBe("urn:ogc:def:crs:EPSG::32631");

  // the 3D model: a glTF 2.0 binary whose extras state the coordinate reference
  const model = await download(page, page.getByTestId("export-surface.glb"));
  expect(model.bytes.readUInt32LE(0)).toBe(0x46546c67);
  const gltf = JSON.parse(model.bytes.subarray(20, 20 + model.bytes.readUInt32LE(12)).toString("utf8"));
  expect(gltf.asset.extras.coordinateReference.horizontal).toBe("EPSG:32631");

  const scene = await download(page, page.getByTestId("export-3d-png"));
  expect(isPng(scene.bytes)).toBe(true);

  const [report] = await Promise.all([page.waitForEvent("popup"), page.getByTestId("open-report").click()]);
  await expect(report.getByTestId("report-title")).toHaveText("QG-4");
  await expect(report.getByTestId("report-provenance")).toContainText("qg-4-throw-picks.csv");
  await expect(report.getByTestId("report-provenance")).toContainText(/[0-9a-f]{64}/);
  await expect(report.getByTestId("report-provenance")).toContainText("Engine version");
  await expect(report.getByTestId("caution")).toContainText("Screening only");
  await expect(report.getByTestId("report-pins")).toContainText(/\d+ open, \d+ resolved/);
  await expect(report.getByTestId("report-picture")).toBeVisible();
  await expect(report.getByTestId("strike-profile-chart").locator("svg").first()).toBeVisible();
  await expect(report.getByTestId("scaling-chart").locator("svg").first()).toBeVisible();
  await expect(report.getByTestId("print-report")).toBeVisible();
});

/** An invented growth fault: plane striking north, dipping 60° E; four horizons whose throw decreases upward (10, 30, 60, 60 m at the centre). */
function growthCsv() {
  const lines = ["x,y,z,throw,horizon,hw_thickness,fw_thickness"];
  const horizons: [string, number, number, number, number][] = [
    ["H1", -1000, 10, 120, 110],
    ["H2", -1200, 30, 150, 120],
    ["H3", -1400, 60, 100, 100],
    ["H4", -1600, 60, 100, 100],
  ];
  for (let y = 0; y <= 2000; y += 40) {
    const taper = Math.sin((Math.PI * y) / 2000);
    for (const [name, z, throwM, hw, fw] of horizons) {
      const x = -z / Math.tan(Math.PI / 3) + ((y / 40) % 3) * 0.5;
      lines.push(`${x.toFixed(3)},${y},${z},${(throwM * taper).toFixed(3)},${name},${hw},${fw}`);
    }
  }
  return Buffer.from(lines.join("\n") + "\n");
}

test("horizon picks: throw per horizon, throw–depth reading with its basis, expansion index per interval", async ({ page }) => {
  await signIn(page, "interpreter@quillon.test");
  await openDemoStudy(page);
  await page.getByTestId("new-fault").click();
  await page.getByLabel("Name").fill("QG-7 growth");
  await page.getByTestId("new-fault-submit").click();
  // adding a fault opens it, ready for its picks
  await expect(page.getByTestId("fault-title")).toHaveText("QG-7 growth");
  await page.getByTestId("pick-file").setInputFiles({ name: "qg-7-growth.csv", mimeType: "text/csv", buffer: growthCsv() });
  await expect(page.getByTestId("upload-preview")).toBeVisible();
  await page.getByTestId("confirm-upload").click();
  await expect(page.getByTestId("analysis-views-panel")).toBeVisible({ timeout: 90_000 });

  await page.getByTestId("view-tab-dip").click();
  const horizonChart = page.getByTestId("horizon-throw-chart");
  await expect(horizonChart.locator("svg").first()).toBeVisible();
  expect(Number(await horizonChart.getAttribute("data-points"))).toBeGreaterThanOrEqual(4 * 20);
  expect(await axisLabels(horizonChart)).toMatch(/Along strike, s \(m\)/);
  const tz = page.getByTestId("throw-depth-chart");
  await expect(tz).toHaveAttribute("data-points", "4");
  expect(await axisLabels(tz)).toMatch(/Elevation \(m, up positive\)/);
  await expect(page.getByTestId("tz-reading")).toContainText("syn-sedimentary growth");
  await expect(page.getByTestId("tz-reading")).toContainText("Cartwright et al. (1998)");
  // the reading cites published work only
  await expect(page.getByTestId("tz-reading")).not.toContainText(/memory|domain reference|section \d/);
  // every horizon name beside the throw–depth points is inside the picture, none cut at its edge
  const tzSvg = (await tz.locator("svg").last().boundingBox())!;
  for (const horizon of ["H1", "H2", "H3", "H4"]) {
    const label = (await tz
      .locator("svg")
      .last()
      .locator("text")
      .filter({ hasText: new RegExp(`^${horizon}$`) })
      .first()
      .boundingBox())!;
    expect(label.x + label.width, horizon).toBeLessThanOrEqual(tzSvg.x + tzSvg.width);
    expect(label.x, horizon).toBeGreaterThanOrEqual(tzSvg.x);
  }
  const ei = page.getByTestId("expansion-index-chart");
  await expect(ei).toHaveAttribute("data-points", "4");
  const eiCsv = await download(page, page.getByTestId("expansion-index-chart-csv"));
  const rows = eiCsv.bytes.toString("utf8").trim().split("\n");
  expect(rows[0]).toBe("interval_below_horizon,expansion_index,accrued_throw_m");
  // H2 interval: 150 m / 120 m
  expect(rows.find((row) => row.startsWith("H2,"))).toMatch(/^H2,1\.25,30$/);
});

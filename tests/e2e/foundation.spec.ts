import { expect, test } from "@playwright/test";
import { openDemoStudy, signIn } from "./helpers";

test("a new user signs up, creates a study, sees it listed, and signs out", async ({ page }) => {
  const email = `geologist-${Date.now()}@example.test`;
  await page.goto("/");
  await page.getByRole("link", { name: "Create account" }).first().click();
  await page.getByLabel("Name").fill("Rhea Calder");
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill("short");
  await page.getByRole("button", { name: "Create account" }).click();
  await expect(page.getByTestId("field-error")).toContainText("at least 10 characters");
  await page.getByLabel("Password").fill("long-enough-pass-42");
  await page.getByRole("button", { name: "Create account" }).click();
  await expect(page).toHaveURL(/\/studies$/);
  await expect(page.getByText("No studies yet")).toBeVisible();

  await page.getByTestId("new-study").click();
  await page.getByLabel("Study name").fill("Hollin Ridge geothermal screen");
  await page.getByRole("button", { name: "Create study" }).click();
  await expect(page.getByTestId("study-list")).toContainText("Hollin Ridge geothermal screen");
  await page.getByRole("link", { name: /Hollin Ridge/ }).click();
  await expect(page.getByTestId("study-title")).toHaveText("Hollin Ridge geothermal screen");
  await expect(page.getByTestId("people")).toContainText("owner");

  await page.getByRole("button", { name: "Sign out" }).click();
  await expect(page).toHaveURL(/\/$/);
  await page.goto("/studies");
  await expect(page).toHaveURL(/\/sign-in/);

  await signIn(page, email, "long-enough-pass-42");
  await expect(page.getByTestId("study-list")).toContainText("Hollin Ridge geothermal screen");
});

test("a wrong password is refused with a message", async ({ page }) => {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill("owner@quillon.test");
  await page.getByLabel("Password").fill("not-the-password-1");
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page.getByTestId("form-message")).toHaveText("E-mail or password is not right.");
});

test("each demo role sees the demo study; only the owner has the invite control", async ({ page, context }) => {
  for (const role of ["owner", "interpreter", "reviewer", "viewer"]) {
    await context.clearCookies();
    await signIn(page, `${role}@quillon.test`);
    await openDemoStudy(page);
    await expect(page.getByTestId("fault-table")).toContainText("QG-1");
    await expect(page.getByTestId("fault-table")).toContainText("QG-4");
    if (role === "owner") await expect(page.getByTestId("invite-form")).toBeVisible();
    else await expect(page.getByTestId("invite-form")).toHaveCount(0);
  }
});

test("a viewer gets 403 from the invite API and 401 when signed out", async ({ page, context }) => {
  await signIn(page, "viewer@quillon.test");
  await openDemoStudy(page);
  const studyId = page.url().split("/studies/")[1];
  const asViewer = await page.request.post(`/api/studies/${studyId}/members`, { data: { email: "someone@example.test", role: "viewer" } });
  expect(asViewer.status()).toBe(403);
  expect((await asViewer.json()).error).toMatch(/role/);
  await context.clearCookies();
  const signedOut = await page.request.post(`/api/studies/${studyId}/members`, { data: { email: "someone@example.test", role: "viewer" } });
  expect(signedOut.status()).toBe(401);
});

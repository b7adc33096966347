import { expect, test } from "@playwright/test";
import { openDemoStudy, signIn } from "./helpers";

test("an owner invites a colleague by e-mail; they create an account from the link, join as reviewer, and the link then reads as used", async ({
  page,
  browser,
}) => {
  const email = `newcomer-${Date.now()}@example.test`;
  await signIn(page, "owner@quillon.test");
  await openDemoStudy(page);
  const form = page.getByTestId("invite-form");
  await form.getByLabel("E-mail to invite").fill(email);
  await form.getByLabel("Role for the invitation").selectOption("reviewer");
  await form.getByRole("button", { name: "Send invitation" }).click();
  await expect(form.getByText("Invitation sent.")).toBeVisible();

  // the invitation e-mail, as the local fake transport kept it
  await page.goto("/outbox");
  const message = page.getByTestId("outbox-message").filter({ hasText: email }).first();
  await expect(message).toBeVisible();
  const body = (await message.getByTestId("outbox-body").textContent()) ?? "";
  const link = /https?:\/\/\S+?\/invite\/[A-Za-z0-9_-]+/.exec(body)?.[0];
  expect(link, `no invitation link in: ${body}`).toBeTruthy();
  const invitePath = new URL(link!).pathname;

  const guestContext = await browser.newContext();
  const guest = await guestContext.newPage();
  await guest.goto(invitePath);
  await expect(guest.getByTestId("invite-open")).toBeVisible();
  await expect(guest.getByTestId("invite-study")).toContainText("Quillon Graben");
  await expect(guest.getByTestId("invite-role")).toHaveText("reviewer");
  await guest.getByTestId("invite-sign-up").click();
  await expect(guest.getByLabel("E-mail")).toHaveValue(email);
  await guest.getByLabel("Name").fill("Noor Haddad");
  await guest.getByLabel("Password").fill("newcomer-pass-42");
  await guest.getByRole("button", { name: "Create account" }).click();
  await expect(guest).toHaveURL(new RegExp(`${invitePath}$`));
  await guest.getByTestId("accept-invite").click();
  await expect(guest.getByTestId("study-title")).toHaveText(/Quillon Graben/);
  // a reviewer: no invite control, no upload control on a fault
  await expect(guest.getByTestId("invite-form")).toHaveCount(0);

  // the link worked once
  await guest.goto(invitePath);
  await expect(guest.getByTestId("invite-used")).toBeVisible();

  // the owner sees the new member with the role they chose
  await page.goto("/studies");
  await openDemoStudy(page);
  const newcomer = page.getByTestId("people").locator("li").filter({ hasText: "Noor Haddad" });
  await expect(newcomer).toBeVisible();
  await expect(newcomer.getByLabel("Role")).toHaveValue("reviewer");

  // roles are remembered by the server: a change made through the API must reach the pages (another bundle) at once
  await guest.goto("/studies");
  await openDemoStudy(guest);
  await guest.getByTestId("fault-table").getByRole("link", { name: "QG-4", exact: true }).click();
  await expect(guest.getByTestId("fault-sheet")).toBeVisible();
  const faultPath = new URL(guest.url()).pathname;
  const faultId = faultPath.split("/faults/")[1];
  await expect(guest.getByTestId("open-upload")).toHaveCount(0);
  await newcomer.getByLabel("Role").selectOption("interpreter");
  await expect(newcomer.getByLabel("Role")).toHaveValue("interpreter");
  await guest.reload();
  await expect(guest.getByTestId("open-upload")).toBeVisible();

  // removed by the owner (a second click confirms): the very next page and API request are refused
  await newcomer.getByTestId("remove-member").click();
  await expect(newcomer.getByTestId("remove-member-confirm")).toContainText("Remove Noor Haddad from this study?");
  await newcomer.getByTestId("remove-member-yes").click();
  await expect(page.getByTestId("people")).not.toContainText("Noor Haddad");
  await guest.reload();
  await expect(guest.getByRole("heading", { name: "Nothing mapped here" })).toBeVisible();
  expect((await guest.request.get(`/api/faults/${faultId}`)).status()).toBe(404);
  await guestContext.close();
});

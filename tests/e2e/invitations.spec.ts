import { expect, test } from "@playwright/test";
import { openDemoStudy, signIn } from "./helpers";

test("an owner invites a colleague by e-mail; they create an account from the link, join as reviewer, and the link then reads as used", async ({ page, browser }) => {
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
  await guestContext.close();

  // the owner sees the new member with the role they chose
  await page.goto("/studies");
  await openDemoStudy(page);
  await expect(page.getByTestId("people")).toContainText("Noor Haddad");
  await expect(page.getByTestId("people")).toContainText("reviewer");
});

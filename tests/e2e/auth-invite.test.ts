// An admin invites someone by e-mail; the message reaches the mail sink and its one-time link lets
// the invitee choose a password and join with the invited roles.
import { randomBytes } from "node:crypto";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, expect, test } from "vitest";
import { launch, openPage } from "./support/browser";
import { linksIn, waitForMail } from "./support/mail";
import { signInAs } from "./support/sign-in";

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

test("an invitation e-mail arrives in the sink and its link lets the invitee set a password and join with the invited roles", async () => {
  const email = `nadia-${randomBytes(3).toString("hex")}@larkspur.example`;
  const since = new Date(Date.now() - 1000);

  const admin = await openPage(browser);
  try {
    await signInAs(admin.page, "admin");
    await admin.page.goto("/settings");
    const invite = admin.page.locator("#invite");
    await invite.getByLabel("E-mail address").fill(email);
    await invite.getByRole("checkbox", { name: /^Reviewer/ }).check();
    await invite.getByRole("checkbox", { name: /^Finance/ }).check();
    await invite.getByRole("button", { name: "Send invitation" }).click();
    await expect.poll(() => invite.getByRole("status").textContent(), { timeout: 15_000 }).toContain(`Invitation sent to ${email}`);
    await expect.poll(() => admin.page.locator("#invitations").textContent()).toContain(email);
    await admin.screenshot("invite-sent");
  } finally {
    await admin.close();
  }

  const mail = await waitForMail({ to: email, subject: "invited to Larkspur Outfitters", since });
  expect(mail.subject).toBe("You are invited to Larkspur Outfitters on Tributary");
  const link = linksIn(mail.raw).find((href) => href.includes("/invite/"));
  expect(link).toBeDefined();

  const invitee = await openPage(browser);
  try {
    await invitee.page.goto(new URL(link!).pathname);
    await expect.poll(() => invitee.page.getByRole("heading", { level: 1 }).textContent()).toBe("Join Larkspur Outfitters");
    expect(await invitee.page.locator("main").textContent()).toMatch(/Reviewer.*Finance/);

    // A too-short password and a mismatch are explained before anything is created.
    await invitee.page.getByLabel("Your name").fill("Nadia Verhoeven");
    await invitee.page.getByLabel("Choose a password").fill("short");
    await invitee.page.getByLabel("Repeat the password").fill("short");
    await invitee.page.getByRole("button", { name: "Join the workspace" }).click();
    await expect.poll(() => invitee.page.getByText("Use at least 10 characters.").count()).toBeGreaterThan(0);

    await invitee.page.getByLabel("Your name").fill("Nadia Verhoeven");
    await invitee.page.getByLabel("Choose a password").fill("river delta 2027");
    await invitee.page.getByLabel("Repeat the password").fill("river delta 2027");
    await invitee.page.getByRole("button", { name: "Join the workspace" }).click();
    await invitee.page.waitForURL((u) => u.pathname === "/", { timeout: 15_000 });
    await expect.poll(() => invitee.page.getByRole("heading", { level: 1 }).textContent()).toBe("Welcome, Nadia");
    expect(await invitee.page.getByText("You work in Larkspur Outfitters as reviewer and finance.").count()).toBe(1);
    const nav = await invitee.page.getByRole("navigation", { name: "Main" }).getByRole("link").allTextContents();
    expect(nav).toEqual(["Home", "Spend histories", "Fits", "Scenarios", "Side by side", "Settings"]);
    await invitee.screenshot("invite-joined");

    // The link works once.
    await invitee.page.goto(new URL(link!).pathname);
    expect(await invitee.page.getByText("This invitation has already been used.").count()).toBe(1);
  } finally {
    await invitee.close();
  }

  // The new member signs in with the password they chose.
  const again = await openPage(browser);
  try {
    await signInAs(again.page, { email, password: "river delta 2027" });
    expect(await again.page.getByTestId("signed-in-user").textContent()).toBe("Nadia Verhoeven");
  } finally {
    await again.close();
  }
});

test("the admin's local outbox lists the messages the sink received", async () => {
  const tab = await openPage(browser);
  try {
    await signInAs(tab.page, "admin");
    const response = await tab.page.goto("/settings/outbox");
    expect(response?.status()).toBe(200);
    expect(await tab.page.getByText("You are invited to Larkspur Outfitters on Tributary").count()).toBeGreaterThan(0);
    await tab.screenshot("outbox");
  } finally {
    await tab.close();
  }
});

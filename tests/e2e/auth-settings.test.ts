// Account and workspace settings in the browser: API tokens shown once and revocable, the last-admin
// rule, and pages that a role may not open.
import { randomBytes } from "node:crypto";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, expect, test } from "vitest";
import { launch, openPage } from "./support/browser";
import { api, signInAs } from "./support/sign-in";

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

test("a planner creates an API token, it is shown once and works with the planner's roles, then is revoked", async () => {
  const tab = await openPage(browser);
  const { page } = tab;
  try {
    await signInAs(page, "planner");
    await page.goto("/settings/tokens");
    const name = `Finance export ${randomBytes(3).toString("hex")}`;
    await page.getByLabel("Name").fill(name);
    await page.getByRole("button", { name: "Create token" }).click();
    const secret = page.getByLabel("Your new token (shown only once)");
    await expect.poll(() => secret.count(), { timeout: 15_000 }).toBe(1);
    const token = await secret.inputValue();
    expect(token).toMatch(/^trib_[A-Za-z0-9_-]{43}$/);
    await tab.screenshot("tokens-created");

    const me = await api("/api/me", { token });
    expect(me.status).toBe(200);
    expect(await me.json()).toMatchObject({ user: { email: "planner@larkspur.example" }, roles: ["planner"], workspace: { slug: "larkspur" }, via: "token" });

    await page.reload();
    expect(await page.getByLabel("Your new token (shown only once)").count()).toBe(0);
    const row = page.getByTestId(`token-${name}`);
    expect(await row.textContent()).toContain(token.slice(0, 9));
    expect(await row.textContent()).not.toContain(token.slice(9));
    await expect.poll(async () => (await row.textContent()) ?? "").not.toContain("Not yet");

    await row.getByRole("button", { name: /Revoke/ }).click();
    await expect.poll(() => row.textContent(), { timeout: 15_000 }).toContain("Revoked");
    expect((await api("/api/me", { token })).status).toBe(401);
  } finally {
    await tab.close();
  }
});

test("the last admin can neither be removed nor lose the admin role", async () => {
  const tab = await openPage(browser);
  const { page } = tab;
  try {
    await signInAs(page, "admin");
    await page.goto("/settings");
    const self = page.getByTestId("member-admin@larkspur.example");
    await self.getByRole("button", { name: /Remove Maren Holt/ }).click();
    await expect.poll(() => self.textContent(), { timeout: 15_000 }).toContain("last admin and cannot be removed");

    await self.getByRole("checkbox", { name: "Admin" }).uncheck();
    await self.getByRole("checkbox", { name: "Finance" }).check();
    await self.getByRole("button", { name: "Save roles" }).click();
    await expect.poll(() => self.textContent(), { timeout: 15_000 }).toContain("must keep the admin role");
    await tab.screenshot("last-admin");

    await page.reload();
    expect(await page.getByTestId("member-admin@larkspur.example").getByRole("checkbox", { name: "Admin" }).isChecked()).toBe(true);
  } finally {
    await tab.close();
  }
});

test("a role without a page's permission gets the 403 page, and settings shows no admin sections", async () => {
  const tab = await openPage(browser);
  const { page } = tab;
  try {
    await signInAs(page, "analyst");
    const outbox = await page.goto("/settings/outbox");
    expect(outbox?.status()).toBe(403);
    expect(await page.getByRole("heading", { level: 1 }).textContent()).toMatch(/do not include this page/);
    await page.goto("/settings");
    expect(await page.locator("#members").count()).toBe(0);
    expect(await page.locator("#invite").count()).toBe(0);
    expect(await page.getByLabel("Currency").count()).toBe(0);
  } finally {
    await tab.close();
  }
});

// Signing in and out as each demo role, clear messages for bad input, throttling of wrong passwords.
import { randomBytes } from "node:crypto";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { hashPassword } from "@/server/auth/password";
import { launch, openPage } from "./support/browser";
import { demoAccounts, signInAs, signOut, testDatabase } from "./support/sign-in";

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

// What each seeded person should find in the main navigation (roles → pages they may use).
const navByEmail: Record<string, string[]> = {
  "admin@larkspur.example": ["Home", "Spend histories", "Fits", "Scenarios", "Side by side", "Settings"],
  "analyst@larkspur.example": ["Home", "Spend histories", "Fits", "Settings"],
  "reviewer@larkspur.example": ["Home", "Spend histories", "Fits", "Scenarios", "Settings"],
  "planner@larkspur.example": ["Home", "Fits", "Scenarios", "Side by side", "Settings"],
  "finance@larkspur.example": ["Home", "Fits", "Scenarios", "Side by side", "Settings"],
  "sam@larkspur.example": ["Home", "Spend histories", "Fits", "Scenarios", "Side by side", "Settings"],
  "owner@foreign.example": ["Home", "Spend histories", "Fits", "Scenarios", "Side by side", "Settings"],
};

describe("signing in", () => {
  test.each(demoAccounts.map((a) => [a.email, a] as const))("%s signs in, sees the home page in Work Sans with only their pages, and signs out", async (_email, account) => {
    const tab = await openPage(browser);
    try {
      await tab.page.goto("/");
      expect(new URL(tab.page.url()).pathname).toBe("/login");
      await signInAs(tab.page, account);
      const firstName = account.name.split(" ")[0];
      await expect.poll(() => tab.page.getByRole("heading", { level: 1 }).textContent()).toBe(`Welcome, ${firstName}`);
      expect(await tab.page.getByTestId("signed-in-user").textContent()).toBe(account.name);

      const nav = await tab.page.getByRole("navigation", { name: "Main" }).getByRole("link").allTextContents();
      expect(nav).toEqual(navByEmail[account.email]);

      const font = await tab.page.evaluate(async () => {
        await document.fonts.ready;
        return { body: getComputedStyle(document.body).fontFamily, check: document.fonts.check("16px 'Work Sans'") };
      });
      expect(font.body).toMatch(/^"?Work Sans"?/);
      expect(font.check).toBe(true);
      await tab.screenshot(`auth-home-${account.email.split("@")[0]}`);

      await signOut(tab.page);
      await tab.page.goto("/settings");
      expect(new URL(tab.page.url()).pathname).toBe("/login");
      expect(tab.errors.filter((e) => e.startsWith("uncaught"))).toEqual([]);
    } finally {
      await tab.close();
    }
  });

  test("bad input gets a clear message next to the field", async () => {
    const tab = await openPage(browser, "/login");
    const { page } = tab;
    const submit = () => page.getByRole("button", { name: "Sign in" }).click();
    const alert = page.locator("#sign-in-message");
    try {
      await submit();
      await expect.poll(() => alert.textContent()).toContain("Enter your e-mail address.");
      expect(await page.getByLabel("E-mail").getAttribute("aria-invalid")).toBe("true");

      await page.getByLabel("E-mail").fill("not-an-address");
      await page.getByLabel("Password").fill("whatever");
      await submit();
      await expect.poll(() => page.getByText("Enter a valid e-mail address, like name@example.com.").count()).toBeGreaterThan(0);

      await page.getByLabel("E-mail").fill("planner@larkspur.example");
      await page.getByLabel("Password").fill("");
      await submit();
      await expect.poll(() => page.getByText("Enter your password.").count()).toBeGreaterThan(0);

      await page.getByLabel("E-mail").fill("planner@larkspur.example");
      await page.getByLabel("Password").fill("not the password");
      await submit();
      await expect.poll(() => alert.textContent()).toContain("Wrong e-mail or password.");
      expect(await page.getByLabel("E-mail").inputValue()).toBe("planner@larkspur.example");
      expect(new URL(page.url()).pathname).toBe("/login");
      await tab.screenshot("auth-wrong-password");
    } finally {
      await tab.close();
    }
  });

  test("the 11th sign-in after 10 wrong passwords in a row is refused, even with the right password", async () => {
    // A person of its own, so the locked account does not disturb other tests; and its own client
    // address (Next passes x-forwarded-for through), so 127.0.0.1 is not throttled for them either.
    const sql = testDatabase();
    const email = `throttled-${randomBytes(4).toString("hex")}@larkspur.example`;
    const password = "the right password";
    await sql`insert into "user" (id, email, name, password_hash) values (${crypto.randomUUID()}, ${email}, 'Tess Throttle', ${await hashPassword(password)})`;
    await sql.end();

    const tab = await openPage(browser, "/login", { extraHTTPHeaders: { "x-forwarded-for": `2001:db8::${randomBytes(2).toString("hex")}:${randomBytes(2).toString("hex")}` } });
    const { page } = tab;
    const message = page.locator("#sign-in-message");
    const attempt = async (pw: string) => {
      await page.getByLabel("E-mail").fill(email);
      await page.getByLabel("Password").fill(pw);
      // Wait for the server action's answer, so attempts never overlap.
      await Promise.all([
        page.waitForResponse((r) => r.request().method() === "POST" && new URL(r.url()).pathname === "/login"),
        page.getByRole("button", { name: "Sign in" }).click(),
      ]);
      // React resets the form when the action's result is rendered; only then type the next attempt.
      await expect.poll(() => page.getByLabel("Password").inputValue()).toBe("");
    };
    try {
      for (let i = 1; i <= 10; i++) {
        await attempt(`wrong password ${i}`);
        await expect.poll(() => message.textContent()).toBe("Wrong e-mail or password.");
      }
      await attempt(password);
      await expect.poll(() => message.textContent()).toMatch(/Too many failed sign-ins for this account; try again in 1[45] minutes\./);
      expect(new URL(page.url()).pathname).toBe("/login");
      await tab.screenshot("auth-throttled");
    } finally {
      await tab.close();
    }
  });
});

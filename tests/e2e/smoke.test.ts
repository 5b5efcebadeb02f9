// The built app answers, its database is up, and pages render in Work Sans without console errors.
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, expect, test } from "vitest";
import { launch, openPage } from "./support/browser";
import { url } from "./support/env";

let browser: Browser;

beforeAll(async () => {
  browser = await launch();
});

afterAll(async () => {
  await browser?.close();
});

test("GET /api/health answers 200 with the database up", async () => {
  const response = await fetch(url("/api/health"));
  expect(response.status).toBe(200);
  expect(await response.json()).toEqual({ status: "ok", db: "ok" });
});

test("the home page loads in Work Sans with no console errors", async () => {
  const tab = await openPage(browser);
  try {
    const response = await tab.page.goto("/");
    expect(response?.status()).toBeLessThan(400);
    expect(await tab.page.title()).toContain("Tributary");

    const font = await tab.page.evaluate(async () => {
      await document.fonts.ready;
      return {
        check: document.fonts.check("16px 'Work Sans'"),
        loaded: [...document.fonts].some((face) => face.family.replace(/["']/g, "") === "Work Sans" && face.status === "loaded"),
        body: getComputedStyle(document.body).fontFamily,
      };
    });
    expect(font.body).toMatch(/^"?Work Sans"?/);
    expect(font.loaded).toBe(true);
    expect(font.check).toBe(true);

    await tab.screenshot("smoke-home");
    expect(tab.errors).toEqual([]);
  } finally {
    await tab.close();
  }
});

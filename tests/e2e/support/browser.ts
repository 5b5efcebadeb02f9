// Debian's chromium driven by playwright-core (no downloaded browsers).
import { mkdirSync } from "node:fs";
import path from "node:path";
import { chromium, type Browser, type BrowserContext, type BrowserContextOptions, type Page } from "playwright-core";
import { e2e } from "./env";

/** Flags that work headless, as root, in containers, without network side trips. */
export const CHROMIUM_ARGS = [
  "--no-sandbox",
  "--disable-gpu",
  "--disable-dev-shm-usage",
  "--disable-quic",
  "--no-first-run",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
];

export function launch(): Promise<Browser> {
  return chromium.launch({ executablePath: e2e.chromium, headless: true, args: CHROMIUM_ARGS });
}

export interface TestPage {
  page: Page;
  context: BrowserContext;
  /** Console errors and uncaught page errors seen so far. */
  errors: string[];
  screenshot(name: string): Promise<string>;
  close(): Promise<void>;
}

/** A fresh context (own cookies) with the app's base URL, collecting console errors; opens `path` if given. */
export async function openPage(browser: Browser, pagePath?: string, options: BrowserContextOptions = {}): Promise<TestPage> {
  const context = await browser.newContext({ baseURL: e2e.baseUrl, viewport: { width: 1280, height: 800 }, ...options });
  const page = await context.newPage();
  const errors: string[] = [];
  page.on("console", (message) => {
    if (message.type() !== "error") return;
    const where = message.location().url;
    errors.push(where ? `${message.text()} (${where})` : message.text());
  });
  page.on("pageerror", (error) => errors.push(`uncaught: ${error.message}`));
  if (pagePath) await page.goto(pagePath);
  return {
    page,
    context,
    errors,
    screenshot: (name) => screenshot(page, name),
    close: () => context.close(),
  };
}

/** Saves a full-page PNG as `<screenDir>/<name>.png` and returns its path. */
export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(e2e.screenDir, { recursive: true });
  const file = path.join(e2e.screenDir, `${name.replace(/[^A-Za-z0-9._-]+/g, "-")}.png`);
  await page.screenshot({ path: file, fullPage: true });
  return file;
}

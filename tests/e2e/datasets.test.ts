// Spend histories as an analyst meets them: upload the seeded demo history through the file chooser
// with a visible progress bar, choose the column roles, land on the history's page (rows paged on the
// server, column profile, correlation grid, outcome over time, sha256); a bad file gets its problem
// report with row and column and nothing is stored; a large file goes through the worker's
// dataset.ingest job; readers see the list without the upload button.
import { createHash } from "node:crypto";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import type { Browser, Page } from "playwright-core";
import type postgres from "postgres";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { demoHistoryCsv } from "@/seed/history";
import { launch, openPage, type TestPage } from "./support/browser";
import { signInAs, testDatabase } from "./support/sign-in";

const PREFIX = "E2E upload";
let browser: Browser;
let sql: postgres.Sql;
let dir: string;

beforeAll(async () => {
  sql = testDatabase();
  dir = mkdtempSync(path.join(tmpdir(), "tributary-e2e-upload-"));
  browser = await launch();
});

afterAll(async () => {
  // leave the shared database as the seed made it
  if (sql) {
    await sql`delete from datasets where name like ${`${PREFIX}%`}`.catch(() => {});
    await sql.end();
  }
  await browser?.close();
  if (dir) rmSync(dir, { recursive: true, force: true });
});

const datasetCount = async () => (await sql<{ n: number }[]>`select count(*)::int as n from datasets`)[0].n;

/** A fresh signed-out page with generous timeouts (the test machines are shared and busy). */
async function newTab(): Promise<TestPage> {
  const tab = await openPage(browser);
  tab.page.setDefaultTimeout(60_000);
  tab.page.setDefaultNavigationTimeout(90_000);
  return tab;
}

/** Picks `file` through the page's file chooser (as a person clicking "Choose file" would). */
async function chooseFile(page: Page, file: string) {
  const [chooser] = await Promise.all([page.waitForEvent("filechooser"), page.getByLabel("CSV file").click()]);
  await chooser.setFiles(file);
}

/** Records every label the upload progress bar shows (it may be on screen for less than a second). */
async function watchProgress(page: Page) {
  await page.evaluate(() => {
    const seen: string[] = [];
    (window as unknown as { progressSeen: string[] }).progressSeen = seen;
    new MutationObserver(() => {
      document.querySelectorAll('[role="progressbar"]').forEach((bar) => {
        const text = bar.getAttribute("aria-valuetext") ?? "";
        if (!seen.includes(text)) seen.push(text);
      });
    }).observe(document.body, { subtree: true, childList: true, attributes: true });
  });
  return () => page.evaluate(() => (window as unknown as { progressSeen: string[] }).progressSeen);
}

describe("spend histories in the browser", () => {
  let tab: TestPage;
  beforeAll(async () => {
    tab = await newTab();
    await signInAs(tab.page, "analyst");
  });
  afterAll(async () => tab?.close());

  test("the analyst uploads the seeded history with a progress bar, chooses roles and sees the history's page", async () => {
    const { page } = tab;
    const csv = demoHistoryCsv();
    const file = path.join(dir, "larkspur-weekly-history.csv");
    writeFileSync(file, csv);

    await page.getByRole("link", { name: "Spend histories" }).click();
    await page.waitForURL("**/datasets");
    await page.getByRole("link", { name: "Upload a spend history" }).click();
    await page.waitForURL("**/datasets/upload");
    await chooseFile(page, file);
    await expect.poll(() => page.getByTestId("chosen-file").textContent()).toContain("larkspur-weekly-history.csv");
    await page.getByLabel("Name").fill(`${PREFIX} demo history`);

    // a slow uplink (4 KB/s) so the 8 KB file takes about two seconds: the bar is there to see
    const cdp = await page.context().newCDPSession(page);
    await cdp.send("Network.emulateNetworkConditions", { offline: false, latency: 20, downloadThroughput: -1, uploadThroughput: 4 * 1024 });
    const progress = await watchProgress(page);
    await page.getByRole("button", { name: "Upload" }).click();
    const bar = page.getByRole("progressbar").first();
    await bar.waitFor({ state: "visible", timeout: 10_000 });
    await tab.screenshot("datasets-upload-progress");
    await page.waitForURL(/\/datasets\/[0-9a-f-]{36}\/roles$/, { timeout: 60_000 });
    await cdp.send("Network.emulateNetworkConditions", { offline: false, latency: 0, downloadThroughput: -1, uploadThroughput: -1 });
    const labels = await progress();
    expect(labels.some((l) => /^Uploading \d/.test(l) && / of 8\.0 KB$/.test(l)), labels.join(" | ")).toBe(true);
    expect(labels.some((l) => l.startsWith("Checking rows")), labels.join(" | ")).toBe(true);

    // step 2: the roles are guessed from the columns; the analyst confirms them
    await expect.poll(() => page.getByLabel("week_start", { exact: true }).inputValue()).toBe("period");
    expect(await page.getByLabel("sales_eur", { exact: true }).inputValue()).toBe("outcome");
    expect(await page.getByLabel("video_eur", { exact: true }).inputValue()).toBe("spend");
    expect(await page.getByLabel("promo_week", { exact: true }).inputValue()).toBe("control");
    await page.getByLabel("Unit of promo_week").fill("weeks");
    await tab.screenshot("datasets-roles");
    await page.getByRole("button", { name: "Check and save roles" }).click();
    await page.waitForURL(/\/datasets\/[0-9a-f-]{36}$/, { timeout: 60_000 });

    // the history's page
    await expect.poll(() => page.getByTestId("dataset-name").textContent()).toBe(`${PREFIX} demo history`);
    expect(await page.getByTestId("dataset-status").textContent()).toBe("Ready");
    expect(await page.getByTestId("dataset-sha256").textContent()).toBe(createHash("sha256").update(csv).digest("hex"));
    expect(await page.getByTestId("rows-range").first().textContent()).toBe("Rows 1–50 of 156");
    expect(await page.getByTestId("rows-table").locator("tbody tr").count()).toBe(50);
    const profile = page.getByTestId("column-profile");
    expect(await profile.locator('tr[data-column="promo_week"]').textContent()).toContain("weeks");
    expect(await profile.locator('tr[data-column="sales_eur"]').textContent()).toContain("Outcome");
    const grid = page.getByTestId("correlation-grid");
    await grid.waitFor({ timeout: 30_000 });
    expect(await grid.locator("td").count()).toBe(49); // 6 channels and the promotion control
    expect(await grid.locator('td[data-strong="true"]').count()).toBe(2); // video and display move together
    await page.getByTestId("outcome-plot").locator("svg path").first().waitFor({ timeout: 30_000 });
    expect(await page.getByTestId("period-coverage").textContent()).toBe("One row every week (7 days), no gaps.");
    expect(await page.getByTestId("dataset-history").textContent()).toContain("uploaded the spend history");
    await tab.screenshot("datasets-history-page");

    await page.getByRole("link", { name: "Next ›" }).first().click();
    await expect.poll(() => page.getByTestId("rows-range").first().textContent(), { timeout: 60_000 }).toBe("Rows 51–100 of 156");
    expect(page.url()).toContain("page=2");
    // (a development server also logs that React cannot use eval under our CSP: not an error of the page)
    expect(tab.errors.filter((e) => !e.includes("React will never use eval() in production mode"))).toEqual([]);
  }, 180_000);

  test("a bad file gets its problem report with row and column, and nothing is stored", async () => {
    const { page } = tab;
    const before = await datasetCount();
    const file = path.join(dir, "ragged.csv");
    writeFileSync(file, "week_start,search_eur,sales_eur\n2024-01-01,100,5000\n2024-01-08,120\n2024-01-15,90,4800,extra\n");
    await page.goto("/datasets/upload");
    await chooseFile(page, file);
    await page.getByRole("button", { name: "Upload" }).click();
    const report = page.getByTestId("problem-report");
    await report.waitFor({ timeout: 30_000 });
    expect(await report.textContent()).toContain("The file was not stored: 2 problems");
    const rows = report.getByTestId("problem-table").locator("tbody tr");
    expect(await rows.count()).toBe(2);
    expect(await rows.nth(0).locator("td").allTextContents()).toEqual(["2", "3", "column 3", "Row 2 (line 3) has 2 cells; the header has 3."]);
    expect(await rows.nth(1).locator("td").nth(0).textContent()).toBe("3");
    await tab.screenshot("datasets-problem-report");
    expect(await datasetCount()).toBe(before);
    expect(page.url()).toMatch(/\/datasets\/upload$/);
  });

  test("roles that do not fit the data get the same report (negative spend, row and column)", async () => {
    const { page } = tab;
    const file = path.join(dir, "negative.csv");
    const lines = ["week_start,search_eur,social_eur,sales_eur"];
    for (let i = 0; i < 12; i++) lines.push(`2024-${String(1 + Math.floor(i / 4)).padStart(2, "0")}-${String(1 + (i % 4) * 7).padStart(2, "0")},${i === 6 ? -40 : 100 + i * 7},${200 - i * 3},${5000 + i * 31}`);
    writeFileSync(file, lines.join("\n") + "\n");
    await page.goto("/datasets/upload");
    await chooseFile(page, file);
    await page.getByLabel("Name").fill(`${PREFIX} negative spend`);
    await page.getByRole("button", { name: "Upload" }).click();
    await page.waitForURL(/\/roles$/, { timeout: 60_000 });
    await page.getByRole("button", { name: "Check and save roles" }).click();
    const report = page.getByTestId("problem-report");
    await report.waitFor({ timeout: 30_000 });
    expect(await report.textContent()).toContain("The roles were not saved: 1 problem (negative spend)");
    expect(await report.locator("tbody tr td").allTextContents()).toEqual(["7", "8", "search_eur (2)", "Row 7, column 2 “search_eur”: spend is negative (-40)."]);
    const [row] = await sql<{ status: string }[]>`select status from datasets where name = ${`${PREFIX} negative spend`}`;
    expect(row.status).toBe("needs-roles");
  });

  test("a large file is checked by the worker while it uploads, with progress, and arrives", async () => {
    const { page } = tab;
    // about 5.7 MB: over the 5 MB the web server checks itself, so the dataset.ingest job does
    const lines = ["week,sales,tv,search,social,price"];
    for (let i = 0; i < 130_000; i++) {
      const day = new Date(Date.UTC(1800, 0, 1) + i * 86_400_000).toISOString().slice(0, 10);
      lines.push(`${day},${(20000 + ((i * 7919) % 5000) + i / 100).toFixed(2)},${((i * 37) % 997) + 1000.5},${((i * 53) % 499) + 200.25},${((i * 11) % 331) + 50.75},${(9 + (i % 5) / 4).toFixed(2)}`);
    }
    const file = path.join(dir, "large.csv");
    writeFileSync(file, lines.join("\n") + "\n");
    await page.goto("/datasets/upload");
    await chooseFile(page, file);
    await page.getByLabel("Name").fill(`${PREFIX} large`);
    const progress = await watchProgress(page);
    await page.getByRole("button", { name: "Upload" }).click();
    await page.waitForURL(/\/roles$/, { timeout: 120_000 });
    const labels = await progress();
    expect(labels.some((l) => l.startsWith("Uploading")), labels.join(" | ")).toBe(true);
    expect(labels.some((l) => l.startsWith("Checking rows") || l.startsWith("Stored")), labels.join(" | ")).toBe(true);
    expect(await page.locator("main").textContent()).toContain("130,000 rows and 6 columns were read from large.csv");
    const [run] = await sql<{ status: string; result: { rowCount: number } }[]>`
      select status, result from job_runs where kind = 'dataset.ingest' order by created_at desc limit 1`;
    expect(run).toMatchObject({ status: "succeeded", result: { rowCount: 130_000 } });
    // the staged bytes are gone once the job is done
    expect((await sql<{ n: number }[]>`select count(*)::int as n from dataset_uploads where original_filename = 'large.csv'`)[0].n).toBe(0);
  }, 180_000);
});

describe("who sees spend histories", () => {
  test("a reviewer reads the list and a history, without upload or role buttons", async () => {
    const tab = await newTab();
    try {
      await signInAs(tab.page, "reviewer");
      await tab.page.goto("/datasets");
      await tab.page.getByTestId("dataset-list").waitFor();
      expect(await tab.page.getByRole("link", { name: "Upload a spend history" }).count()).toBe(0);
      await tab.page.getByTestId("dataset-list").getByRole("link").first().click();
      await tab.page.waitForURL(/\/datasets\/[0-9a-f-]{36}$/);
      await tab.page.getByTestId("column-profile").waitFor();
      expect(await tab.page.getByRole("link", { name: /roles/i }).count()).toBe(0);
      const upload = await tab.page.goto("/datasets/upload");
      expect(upload?.status()).toBe(403);
    } finally {
      await tab.close();
    }
  });

  test("a planner (no dataset:read) gets the 403 page", async () => {
    const tab = await newTab();
    try {
      await signInAs(tab.page, "planner");
      const response = await tab.page.goto("/datasets");
      expect(response?.status()).toBe(403);
    } finally {
      await tab.close();
    }
  });
});

// The planner's room, as a new planner meets it after the seed: open the approved demo fit, start a
// scenario, move budget in fixed mode (total unchanged, others rebalanced, interval redrawn), push a
// channel past its observed maximum (warning), save v1, change and save v2, restore v1 as v3.
// Also measures slider-to-redraw latency over 100 keyboard moves (printed, not asserted).
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { launch, openPage, type TestPage } from "./support/browser";
import { api, createTokenFor, signInAs, testDatabase } from "./support/sign-in";

let browser: Browser;
let tab: TestPage;
let fit: { id: string; name: string };

beforeAll(async () => {
  const sql = testDatabase();
  try {
    const rows = await sql<{ id: string; name: string }[]>`
      select f.id, f.name from fits f join workspaces w on w.id = f.workspace_id
      where w.slug = 'larkspur' and f.status = 'approved' order by f.approved_at limit 1`;
    if (!rows[0]) throw new Error("The seed has no approved fit in Larkspur Outfitters (the demo fit is missing).");
    fit = rows[0];
  } finally {
    await sql.end();
  }
  browser = await launch();
  tab = await openPage(browser);
});

afterAll(async () => {
  await tab?.close();
  await browser?.close();
});

const slider = (page: Page, label: string) => page.getByRole("slider", { name: `${label} spend for the horizon` });
const amountField = (page: Page, label: string) => page.getByRole("textbox", { name: `${label} spend for the horizon` });
const channelLabels = ["Search", "Social", "Video", "Display", "Podcast", "Email"];

/** Horizon amounts in cents as the fields show them ("252,300" → 25230000). */
async function amounts(page: Page): Promise<Record<string, number>> {
  const result: Record<string, number> = {};
  for (const label of channelLabels) result[label] = Math.round(Number((await amountField(page, label).inputValue()).replace(/,/g, "")) * 100);
  return result;
}

async function totalCents(page: Page): Promise<number> {
  return Math.round(Number((await page.getByRole("textbox", { name: "Fixed total for the horizon" }).inputValue()).replace(/,/g, "")) * 100);
}

async function confirmedTotal(page: Page): Promise<number> {
  await page.locator('[data-testid="outcome-panel"][data-source="server"]').waitFor({ timeout: 15_000 });
  return Number(await page.getByTestId("horizon-total").getAttribute("data-value"));
}

const percentile = (values: number[], p: number) => {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)];
};

describe("scenario room", () => {
  test("a planner opens the demo fit and starts a scenario with the last quarter's spend", async () => {
    const { page } = tab;
    await signInAs(page, "planner");
    // The fit's report page links to a new scenario; the scenario list does too.
    const fitPage = await page.request.get(`/fits/${fit.id}`);
    if (fitPage.status() === 200) await page.goto(`/fits/${fit.id}`);
    const fromFit = page.getByRole("link", { name: /start a scenario/i });
    if (fitPage.status() === 200 && (await fromFit.count()) > 0) {
      await fromFit.first().click();
    } else {
      await page.goto("/scenarios");
      await page.getByRole("link", { name: `Start a scenario on ${fit.name}` }).first().click();
    }
    await page.waitForURL((url) => url.pathname === "/scenarios/new", { timeout: 30_000 });
    await expect.poll(() => page.getByText(/What was spent in the most recent 13 weeks/).count(), { timeout: 30_000 }).toBe(1);
    await page.getByLabel("Name").fill(`Spring plan ${Date.now()}`);
    await tab.screenshot("scenario-01-start");
    await page.getByRole("button", { name: "Start the scenario" }).click();
    await page.waitForURL(/\/scenarios\/[0-9a-f-]{36}$/, { timeout: 30_000 });
    await confirmedTotal(page);
    expect(await page.getByTestId("unit-conversion").textContent()).toMatch(/over 13 weeks = €[\d,]+ per week, the unit the model was fitted on/);
    // Beside the intervals: how this fit's intervals did on the latest weeks held out of a refit.
    expect(await page.getByTestId("held-out-note").textContent()).toMatch(/^Checked on held-out weeks: refitted without the latest 13, this fit's 95% prediction intervals held \d+ of them\./);
    await tab.screenshot("scenario-02-room");
  });

  test("moving a slider in fixed mode keeps the total, rebalances the others and redraws the interval", async () => {
    const { page } = tab;
    const total = await totalCents(page);
    const before = await amounts(page);
    const outcomeBefore = await confirmedTotal(page);
    await slider(page, "Search").focus();
    for (let step = 0; step < 5; step++) await page.keyboard.press("ArrowRight");
    await expect.poll(async () => (await amounts(page)).Search, { timeout: 30_000 }).toBeGreaterThan(before.Search);
    const after = await amounts(page);
    expect(await totalCents(page)).toBe(total);
    expect(Object.values(after).reduce((sum, cents) => sum + cents, 0)).toBe(total);
    for (const label of channelLabels.filter((name) => name !== "Search")) expect(after[label]).toBeLessThan(before[label]);
    // Others move in proportion to their amounts (each of the 5 steps exact to the cent, largest remainder).
    const moved = after.Search - before.Search;
    const othersBefore = total - before.Search;
    for (const label of channelLabels.filter((name) => name !== "Search")) {
      expect(Math.abs(before[label] - after[label] - (moved * before[label]) / othersBefore)).toBeLessThanOrEqual(5);
    }
    const outcomeAfter = await confirmedTotal(page);
    expect(outcomeAfter).not.toBe(outcomeBefore);
    expect(await page.getByTestId("difference").getAttribute("data-value")).not.toBe("0");
    await tab.screenshot("scenario-03-moved");
  });

  test("slider to redrawn interval: p95 over 100 keyboard moves (printed), and the server's value follows", async () => {
    const { page } = tab;
    await page.evaluate(() => performance.clearMarks());
    await slider(page, "Social").focus();
    for (let move = 0; move < 100; move++) await page.keyboard.press(move % 2 === 0 ? "ArrowRight" : "ArrowLeft");
    const latencies = await page.evaluate(() => {
      const inputs = performance.getEntriesByName("allocation-input").slice(0, 100).map((entry) => entry.startTime);
      const redraws = performance.getEntriesByName("interval-redrawn").map((entry) => entry.startTime);
      return inputs.map((start) => (redraws.find((time) => time >= start) ?? Number.NaN) - start);
    });
    expect(latencies.length).toBe(100);
    expect(latencies.every((value) => Number.isFinite(value))).toBe(true);
    // One more move to a plan not seen before (alternating moves revisit cached plans), then wait for the server.
    await page.keyboard.press("PageUp");
    await page.locator('[data-testid="outcome-panel"][data-source="preview"]').waitFor({ timeout: 5_000 }).catch(() => {});
    const previewTotal = Number(await page.getByTestId("horizon-total").getAttribute("data-value"));
    const confirmed = await confirmedTotal(page);
    const follow = await page.evaluate(() => {
      const lastInput = performance.getEntriesByName("allocation-input").at(-1)?.startTime ?? 0;
      const confirmation = performance.getEntriesByName("prediction-confirmed").filter((entry) => entry.startTime >= lastInput).at(0)?.startTime;
      return confirmation === undefined ? null : confirmation - lastInput;
    });
    console.log(
      `[scenario latency] input → redrawn interval over ${latencies.length} keyboard moves: p50 ${percentile(latencies, 50).toFixed(1)} ms, ` +
        `p95 ${percentile(latencies, 95).toFixed(1)} ms, max ${Math.max(...latencies).toFixed(1)} ms; ` +
        `server's confirmed value ${follow === null ? "n/a" : `${follow.toFixed(0)} ms`} after the last move (debounce 120 ms included)`,
    );
    // The server computes exactly what the browser previewed.
    expect(confirmed).toBe(previewTotal);
  });

  test("pushing a channel past its observed maximum shows the warning on the channel and beside the outcome", async () => {
    const { page } = tab;
    const field = amountField(page, "Podcast");
    await field.fill("250000");
    await field.press("Enter");
    const row = page.locator('[data-channel="podcast_eur"]');
    await expect.poll(() => row.getAttribute("data-warning"), { timeout: 30_000 }).toBe("outside-range");
    expect(await row.textContent()).toMatch(/Beyond observed range: Podcast at €250,000 over 13 weeks \(€19,231 per week\) is \d+% above the most it ever had/);
    await page.getByTestId("outcome-warnings").waitFor();
    expect(await page.getByTestId("outcome-warnings").textContent()).toMatch(/treat the number as a guess/);
    await expect.poll(() => page.getByTestId("large-shift-caution").count(), { timeout: 30_000 }).toBe(1);
    await confirmedTotal(page);
    await tab.screenshot("scenario-04-warning");
  });

  test("save → version 1; change and save → version 2; restore version 1 as version 3", async () => {
    const { page } = tab;
    await page.getByLabel("Note for this version").fill("More podcast, beyond what we ever spent");
    await page.getByRole("button", { name: "Save version 1" }).click();
    await expect.poll(() => page.getByTestId("save-message").textContent(), { timeout: 30_000 }).toMatch(/Saved as version 1\. It carries extrapolation warnings\./);
    // The page's finance status follows the save without a reload.
    await expect.poll(() => page.getByTestId("scenario-header-signoff").textContent(), { timeout: 30_000 }).toMatch(/v1 not shared with finance/);
    const v1 = await amounts(page);

    await slider(page, "Email").focus();
    for (let step = 0; step < 3; step++) await page.keyboard.press("ArrowRight");
    await expect.poll(async () => (await amounts(page)).Email, { timeout: 30_000 }).toBeGreaterThan(v1.Email);
    await page.getByLabel("Note for this version").fill("A little more e-mail");
    await page.getByRole("button", { name: "Save version 2" }).click();
    await expect.poll(() => page.getByTestId("save-message").textContent(), { timeout: 30_000 }).toMatch(/Saved as version 2\./);

    await page.getByRole("button", { name: /Version history \(2\)/ }).click();
    const drawer = page.getByTestId("version-drawer");
    await drawer.waitFor();
    await drawer.getByRole("button", { name: "Restore v1 as v3" }).click();
    await expect.poll(() => page.getByTestId("save-message").textContent(), { timeout: 30_000 }).toMatch(/Version 1 restored as version 3\./);
    expect(await amounts(page)).toEqual(v1);
    await expect.poll(() => drawer.locator("[data-version]").count(), { timeout: 30_000 }).toBe(3);
    expect(await drawer.locator('[data-version="3"]').textContent()).toMatch(/Restored from v1/);
    await expect.poll(() => page.getByTestId("scenario-signoff-status").textContent(), { timeout: 30_000 }).toMatch(/Latest version 3/);
    expect(await amounts(page)).toEqual(v1); // the refresh kept the room's plan

    await drawer.getByRole("button", { name: "Compare" }).click();
    await drawer.getByTestId("version-diff").waitFor();
    expect(await drawer.getByTestId("version-diff-difference").textContent()).toMatch(/v3 − v2: [−+]?€[\d,]+ \(95% confidence/);
    await tab.screenshot("scenario-05-history");
    // Any console error fails the test.
    const unexpected = tab.errors;
    expect(unexpected, tab.errors.join("\n")).toEqual([]);
  });

  test("a save on a stale version gets a clear conflict; reloading keeps the edits and the next save follows", async () => {
    const { page } = tab;
    await page.keyboard.press("Escape"); // close the version history
    const scenarioId = new URL(page.url()).pathname.split("/").pop() as string;
    const sql = testDatabase();
    try {
      // Sam (another planner) saves version 4 from another browser.
      const { token } = await createTokenFor(sql, "sam@larkspur.example", "larkspur", "e2e conflict");
      const response = await api(`/api/scenarios/${scenarioId}/versions`, { method: "POST", token, json: { baseVersion: 3, restoreFrom: 2, note: "Sam's take" } });
      expect(response.status).toBe(201);
    } finally {
      await sql.end();
    }
    await slider(page, "Display").focus();
    await page.keyboard.press("ArrowRight");
    const edited = await amounts(page);
    await page.getByRole("button", { name: "Save version 4" }).click();
    const conflict = page.getByTestId("save-conflict");
    await conflict.waitFor({ timeout: 30_000 });
    expect(await conflict.textContent()).toMatch(/Version 4 was saved by Sam Okafor at .+ after the version you started from\. Reload to see it; your changes are kept in this page\./);
    await tab.screenshot("scenario-06-conflict");
    await conflict.getByRole("button", { name: "Reload versions, keep my changes" }).click();
    await page.getByRole("button", { name: "Save version 5" }).waitFor({ timeout: 30_000 });
    expect(await amounts(page)).toEqual(edited);
    await page.getByRole("button", { name: "Save version 5" }).click();
    await expect.poll(() => page.getByTestId("save-message").textContent(), { timeout: 30_000 }).toMatch(/Saved as version 5\./);
  });
});

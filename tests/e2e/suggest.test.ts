// The "Suggested split" and the response curves, as a planner meets them after the seed: from the
// approved demo fit start a scenario, ask for a suggestion → an unsaved draft beside the current plan,
// every channel inside the spend the fit has seen and a predicted outcome at least the current plan's
// (read from the page and from the API's answer); the plan is unchanged until "Use this draft", which is
// one undoable edit; Save version then stores it as a new version. Response curves per channel with the
// marginal return and its unit; the curves are readable from the keyboard.
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import type { SuggestResponse } from "@/app/api/fits/[id]/suggest/schema";
import { launch, openPage, type TestPage } from "./support/browser";
import { signInAs, testDatabase } from "./support/sign-in";

let browser: Browser;
let tab: TestPage;
let fit: { id: string; name: string; ranges: Record<string, { minimum: number; maximum: number }> };
let draft: SuggestResponse;
let before: Record<string, number>;

beforeAll(async () => {
  const sql = testDatabase();
  try {
    const rows = await sql<{ id: string; name: string; ranges: Record<string, { minimum: number; maximum: number }> }[]>`
      select f.id, f.name, f.record -> 'columnRanges' as ranges from fits f join workspaces w on w.id = f.workspace_id
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

const channelLabels = ["Search", "Social", "Video", "Display", "Podcast", "Email"];
const amountField = (page: Page, label: string) => page.getByRole("textbox", { name: `${label} spend for the horizon` });

/** Horizon amounts in cents by channel label, as the fields show them ("252,300" → 25230000). */
async function amounts(page: Page): Promise<Record<string, number>> {
  const result: Record<string, number> = {};
  for (const label of channelLabels) result[label] = Math.round(Number((await amountField(page, label).inputValue()).replace(/,/g, "")) * 100);
  return result;
}

describe("suggested split and response curves", () => {
  test("a planner starts a scenario from the demo fit", async () => {
    const { page } = tab;
    await signInAs(page, "planner");
    await page.goto(`/fits/${fit.id}`);
    const fromFit = page.getByRole("link", { name: /start a scenario/i });
    if ((await fromFit.count()) > 0) await fromFit.first().click();
    else await page.goto(`/scenarios/new?fitId=${fit.id}`);
    await page.waitForURL((url) => url.pathname === "/scenarios/new", { timeout: 30_000 });
    await page.getByLabel("Name").fill(`Suggested split ${Date.now()}`);
    await page.getByRole("button", { name: "Start the scenario" }).click();
    await page.waitForURL(/\/scenarios\/[0-9a-f-]{36}$/, { timeout: 60_000 });
    await page.locator('[data-testid="outcome-panel"][data-source="server"]').waitFor({ timeout: 30_000 });
    before = await amounts(page);
  });

  test("“Suggest a split” opens an unsaved draft inside the observed ranges, predicted at least as well as the current plan", async () => {
    const { page } = tab;
    const answered = page.waitForResponse((response) => response.url().endsWith(`/api/fits/${fit.id}/suggest`) && response.request().method() === "POST", { timeout: 60_000 });
    await page.getByRole("button", { name: "Suggest a split" }).click();
    const response = await answered;
    expect(response.status()).toBe(200);
    draft = (await response.json()) as SuggestResponse;
    const panel = page.getByTestId("suggest-draft");
    await panel.waitFor({ timeout: 30_000 });

    // Inside every observed range (per period = horizon amount ÷ 13), and no range warning on the draft.
    const horizon = draft.prediction.horizon;
    for (const [channel, amount] of Object.entries(draft.allocation)) {
      expect(amount / horizon, channel).toBeGreaterThanOrEqual(fit.ranges[channel].minimum);
      expect(amount / horizon, channel).toBeLessThanOrEqual(fit.ranges[channel].maximum);
      expect(Number(await panel.locator(`[data-draft-channel="${channel}"]`).getAttribute("data-amount"))).toBe(amount);
    }
    expect(draft.prediction.warnings.filter((warning) => warning.kind === "outside-range")).toEqual([]);
    // Same total (fixed mode), predicted outcome at least the current plan's — on the page and in the API.
    expect(Math.round(draft.total * 100)).toBe(Object.values(before).reduce((sum, cents) => sum + cents, 0));
    expect(draft.prediction.horizonTotal.mean).toBeGreaterThanOrEqual(draft.current.mean);
    const suggestedOnPage = Number(await page.getByTestId("suggest-outcome-suggested").getAttribute("data-value"));
    const currentOnPage = Number(await page.getByTestId("suggest-outcome-current").getAttribute("data-value"));
    expect(suggestedOnPage).toBeGreaterThanOrEqual(currentOnPage);
    expect(currentOnPage).toBeCloseTo(Number(await page.getByTestId("horizon-total").getAttribute("data-value")), 3);
    // The gain with the interval of the difference, the method, the binding constraints and the caution.
    expect(await page.getByTestId("suggest-gain").textContent()).toMatch(/^[−+]?€[\d,]+ \(95% confidence [−+]?€[\d,]+ to [−+]?€[\d,]+\)/);
    expect(await page.getByTestId("suggest-method").textContent()).toMatch(/Best plan under these constraints|Local optimum: best found from \d+ starts; not guaranteed best/);
    expect(await page.getByTestId("suggest-binding").locator("li").count()).toBeGreaterThan(0);
    expect(await page.getByTestId("suggest-caution").textContent()).toMatch(/not proof that moving money causes the gain; test the shift on part of the budget first/);
    // Unsaved: the plan on screen is unchanged.
    expect(await amounts(page)).toEqual(before);
    await page.getByTestId("suggest-panel").scrollIntoViewIfNeeded();
    await tab.screenshot("suggest-01-draft");
  });

  test("“Use this draft” puts it into the plan as one undoable edit; Save version makes a new version", async () => {
    const { page } = tab;
    const drafted = Object.fromEntries(draft.channels.map((channel) => [channel.label, Math.round(channel.amount * 100)]));
    await page.getByRole("button", { name: "Use this draft" }).click();
    await expect.poll(() => amounts(page), { timeout: 30_000 }).toEqual(drafted);
    await page.getByTestId("suggest-used").waitFor();
    // One undo step back to the plan before, and redo forward again.
    await page.getByRole("button", { name: "Undo" }).click();
    await expect.poll(() => amounts(page), { timeout: 30_000 }).toEqual(before);
    await page.getByRole("button", { name: "Redo" }).click();
    await expect.poll(() => amounts(page), { timeout: 30_000 }).toEqual(drafted);
    // The outcome panel now shows the draft's predicted total (server-confirmed).
    await page.locator('[data-testid="outcome-panel"][data-source="server"]').waitFor({ timeout: 30_000 });
    await expect
      .poll(async () => Number(await page.getByTestId("horizon-total").getAttribute("data-value")), { timeout: 30_000 })
      .toBeCloseTo(draft.prediction.horizonTotal.mean, 3);

    await page.getByLabel("Note for this version").fill("The suggested split, inside the observed ranges");
    await page.getByRole("button", { name: "Save version 1" }).click();
    await expect.poll(() => page.getByTestId("save-message").textContent(), { timeout: 30_000 }).toMatch(/Saved as version 1\./);
    const scenarioId = new URL(page.url()).pathname.split("/").pop() as string;
    const saved = await page.request.get(`/api/scenarios/${scenarioId}/versions/1`);
    expect(saved.status()).toBe(200);
    const version = (await saved.json()) as { allocation: Record<string, number> };
    expect(version.allocation).toEqual(draft.allocation);
    await tab.screenshot("suggest-02-saved");
  });

  test("response curves: one per channel with the marginal return and its unit, readable from the keyboard", async () => {
    const { page } = tab;
    const section = page.getByTestId("response-curves");
    await section.scrollIntoViewIfNeeded();
    await expect.poll(() => section.getByTestId("response-curve").count(), { timeout: 30_000 }).toBe(channelLabels.length);
    for (const text of await section.getByTestId("marginal-return").allTextContents()) {
      expect(text).toMatch(/Marginal return at the plan: −?[\d.,]+ \(95% confidence −?[\d.,]+ to −?[\d.,]+\) € of sales per € of spend, association/);
    }
    expect(await section.getByTestId("observed-range").count()).toBe(channelLabels.length);
    const chart = section.getByRole("img", { name: /^Response curve of Search/ });
    await chart.focus();
    await page.keyboard.press("ArrowRight");
    await expect.poll(() => section.locator('figure[data-curve-channel="search_eur"] [aria-live]').textContent(), { timeout: 10_000 }).toMatch(/^Search at €[\d,]+: predicted €[\d,]+ \(95% confidence/);
    await tab.screenshot("suggest-03-curves");
    const unexpected = tab.errors.filter((error) => !/\/favicon\.ico\)$|_rsc=\w+\)$/.test(error));
    expect(unexpected, tab.errors.join("\n")).toEqual([]);
  });
});

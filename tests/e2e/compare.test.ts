// Side by side with finance, as the people meet it after the seed: a planner has a scenario with
// versions 1 and 2 (saved through the API), picks them on /compare, saves the comparison and shares it
// with the finance member, who gets an e-mail and a notification, opens the comparison (read-only: no
// allocation controls; the API refuses a save with 403), comments mentioning the planner (e-mailed)
// and signs off version 2. The planner saves version 3 on the scenario page and sees that it is not
// signed off (version 2 is). Exports download; the notification is marked read. Finance meets the
// scenario room read-only (banner; every control disabled, keyboard too); the scenarios list and the
// scenario header show each scenario's sign-off status; the header's unread count follows a share
// without a reload.
import type { Browser, Page } from "playwright-core";
import type postgres from "postgres";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { demoComparisonName, demoGrowthScenarioName, demoSpringScenarioName } from "@/seed/demo-names";
import { launch, openPage, type TestPage } from "./support/browser";
import { linksIn, waitForMail } from "./support/mail";
import { api, createTokenFor, demoAccountFor, signInAs, testDatabase } from "./support/sign-in";

let browser: Browser;
let planner: TestPage;
let finance: TestPage;
let sql: postgres.Sql;
let plannerToken: string;
let financeToken: string;
let scenarioId: string;
let comparisonPath: string;
const stamp = Date.now().toString(36);
const scenarioName = `Q3 push ${stamp}`;
const comparisonName = `Q3 options ${stamp}`;
const planners = demoAccountFor("planner");
const financeAccount = demoAccountFor("finance");

type Json = Record<string, any>;

beforeAll(async () => {
  sql = testDatabase();
  plannerToken = (await createTokenFor(sql, planners.email, "larkspur", "e2e compare")).token;
  financeToken = (await createTokenFor(sql, financeAccount.email, "larkspur", "e2e compare")).token;
  const [fit] = await sql<{ id: string }[]>`
    select f.id from fits f join workspaces w on w.id = f.workspace_id
    where w.slug = 'larkspur' and f.status = 'approved' order by f.approved_at limit 1`;
  if (!fit) throw new Error("The seed has no approved fit in Larkspur Outfitters.");
  // Versions 1 and 2 through the API: the starting plan, then 1,000 a week moved from display to search.
  const started = (await (await api("/api/scenarios", { method: "POST", token: plannerToken, json: { fitId: fit.id, name: scenarioName } })).json()) as Json;
  scenarioId = started.id;
  const { allocation, controls, horizon, total } = started.baseline;
  for (const [index, moved] of [0, 13_000].entries()) {
    const plan = { ...allocation, search_eur: allocation.search_eur + moved, display_eur: allocation.display_eur - moved };
    const saved = await api(`/api/scenarios/${scenarioId}/versions`, {
      method: "POST",
      token: plannerToken,
      json: { baseVersion: index, mode: "fixed", allocation: plan, controls, horizon, total, note: index === 0 ? "Last quarter's split" : "More on search" },
    });
    expect(saved.status, await saved.clone().text()).toBe(201);
  }
  browser = await launch();
  planner = await openPage(browser);
  finance = await openPage(browser);
});

afterAll(async () => {
  await planner?.close();
  await finance?.close();
  await browser?.close();
  await sql`delete from api_tokens where name = 'e2e compare'`.catch(() => {});
  await sql?.end();
});

/** Console errors other than the favicon 404 (the app ships an SVG icon only). */
const unexpectedErrors = (tab: TestPage) => tab.errors.filter((error) => !/favicon\.ico/.test(error));

/** A message's text with quoted-printable soft breaks and escapes undone (UTF-8). */
const readable = (raw: string) =>
  Buffer.from(raw.replace(/=\r?\n/g, "").replace(/=([0-9A-F]{2})/g, (_match, hex: string) => String.fromCharCode(parseInt(hex, 16))), "latin1").toString("utf8");

const column = (page: Page, version: number) => page.locator(`[data-testid="comparison-column"][data-version="${version}"]`);

describe("side by side with finance", () => {
  test("the planner picks versions 1 and 2, saves the comparison and shares it with finance", async () => {
    const { page } = planner;
    await signInAs(page, "planner");
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Side by side" }).click();
    await page.waitForURL((url) => url.pathname === "/compare");
    // The seed's growing-total plan takes e-mail past its range: the picker says so in words, not colour alone.
    const warned = page.getByRole("checkbox", { name: `${demoGrowthScenarioName} version 1, has extrapolation warnings`, exact: true });
    await warned.waitFor();
    expect(await page.locator("label", { has: warned }).textContent()).toContain("has warnings");
    await page.getByRole("checkbox", { name: `${scenarioName} version 1` }).check();
    await page.getByRole("checkbox", { name: `${scenarioName} version 2` }).check();
    await page.getByRole("button", { name: "Show side by side" }).click();
    await page.waitForURL((url) => url.pathname === "/compare/view");
    await page.getByTestId("comparison-table").waitFor();
    // The difference of v2 from v1 with its own interval (both on the demo fit).
    const difference = page.locator('[data-testid="difference"][data-kind="joint"]');
    await expect.poll(() => difference.count()).toBe(1);
    expect(await difference.textContent()).toMatch(/^[+−]€[\d,]+95% confidence interval [+−]?€[\d,]+ to [+−]?€[\d,]+/);
    await page.getByLabel("Name this comparison").fill(comparisonName);
    await page.getByRole("button", { name: "Save comparison" }).click();
    await page.waitForURL(/\/compare\/[0-9a-f-]{36}$/, { timeout: 15_000 });
    comparisonPath = new URL(page.url()).pathname;
    expect(await page.getByTestId("comparison-title").textContent()).toBe(comparisonName);
    await planner.screenshot("compare-01-planner-saved");

    const since = new Date(Date.now() - 1_000);
    await page.getByRole("button", { name: "Share with finance" }).click();
    await page.getByRole("checkbox", { name: new RegExp(financeAccount.name) }).check();
    await page.getByLabel("Note (optional)").fill("Please look at v2 before Friday.");
    await page.getByRole("button", { name: "Share and e-mail" }).click();
    await expect.poll(() => page.getByTestId("share-done").textContent(), { timeout: 15_000 }).toMatch(`Shared with ${financeAccount.name}`);
    await planner.screenshot("compare-02-planner-shared");

    const mail = await waitForMail({ to: financeAccount.email, since });
    expect(readable(mail.raw)).toContain("Please look at v2 before Friday.");
    expect(linksIn(mail.raw).some((link) => link.endsWith(comparisonPath))).toBe(true);
    expect(unexpectedErrors(planner)).toEqual([]);
  });

  test("finance sees the notification, opens the comparison read-only, comments and signs off version 2", async () => {
    const { page } = finance;
    await signInAs(page, "finance");
    // the home page lists the scenario as awaiting sign-off (its latest version, 2, is shared, undecided)
    await page.goto("/");
    const awaiting = page.locator(`[data-testid="home-awaiting"][data-scenario="${scenarioId}"]`);
    expect(await awaiting.getByTestId("signoff-summary").getAttribute("data-state")).toBe("awaiting");
    expect(await awaiting.textContent()).toContain("Awaiting sign-off of v2");
    // so are the demo's scenarios, which the seed's planner shared with finance in their comparison
    const demo = page.locator('[data-testid="home-awaiting"]', { hasText: demoSpringScenarioName });
    expect(await demo.getByTestId("signoff-summary").getAttribute("data-state")).toBe("awaiting");
    expect(await demo.textContent()).toContain("Awaiting sign-off of v2");
    await finance.screenshot("compare-03a-finance-home-awaiting");
    // The demo's comparison opens its review on the shift (the first undecided version besides the
    // baseline), where finance's comment is, not on the last column.
    await page.goto("/compare");
    await page.getByRole("link", { name: `Comparison “${demoComparisonName}”` }).click();
    await page.getByTestId("comparison-table").waitFor();
    expect(await page.getByRole("tab", { selected: true }).textContent()).toContain(`${demoSpringScenarioName} v2`);
    expect(await page.getByTestId("review-panel").textContent()).toContain("Can we run the shift in two regions");
    const unread = Number(await page.getByTestId("notifications-link").getAttribute("data-unread"));
    expect(unread).toBeGreaterThanOrEqual(1);
    await page.getByTestId("notifications-link").click();
    await page.waitForURL((url) => url.pathname === "/notifications");
    const item = page.getByRole("link", { name: `${planners.name} shared the comparison “${comparisonName}” with you.` });
    await item.first().waitFor();
    await finance.screenshot("compare-03-finance-notifications");
    await item.first().click();
    await page.waitForURL((url) => url.pathname === comparisonPath);
    await page.getByTestId("comparison-table").waitFor();

    // Read-only: no allocation controls anywhere on the comparison.
    expect(await page.getByRole("slider").count()).toBe(0);
    expect(await page.getByRole("textbox", { name: /spend for the horizon/ }).count()).toBe(0);
    expect(await page.getByRole("button", { name: /^Save version/ }).count()).toBe(0);
    expect(await column(page, 2).getByTestId("signoff-badge").getAttribute("data-state")).toBe("none");

    // The review opens on the first undecided version besides the baseline (v1): version 2.
    expect(await page.getByTestId("review-panel").getAttribute("data-version")).toBe("2");
    // Review version 2: comment mentioning the planner, then sign off.
    await page.getByRole("tab", { name: new RegExp(`${scenarioName} v2`) }).click();
    const since = new Date(Date.now() - 1_000);
    const box = page.getByLabel("Comment on version 2");
    await box.fill("Search looks right. ");
    await page.getByRole("combobox", { name: "Mention a member" }).selectOption({ label: planners.name });
    await box.press("End");
    await box.pressSequentially("can we keep display above 100k?");
    expect(await page.getByTestId("mention-preview").textContent()).toBe(`Will e-mail ${planners.name}.`);
    await page.getByRole("button", { name: "Post comment" }).click();
    await expect.poll(() => page.getByTestId("comment").count(), { timeout: 15_000 }).toBe(1);
    const mention = await waitForMail({ to: planners.email, since, subject: /mentioned you/ });
    expect(readable(mention.raw)).toContain("@Priya Nair can we keep display above 100k?");

    await page.getByRole("button", { name: "Sign off version 2" }).click();
    await expect.poll(() => column(page, 2).getByTestId("signoff-badge").getAttribute("data-state"), { timeout: 15_000 }).toBe("signed_off");
    expect(await column(page, 1).getByTestId("signoff-badge").getAttribute("data-state")).toBe("none");
    expect(await page.getByTestId("signoff-sentence").textContent()).toMatch(`Version 2 was signed off by ${financeAccount.name}`);
    await finance.screenshot("compare-04-finance-signed-off");

    // The notification was marked read on the way in.
    await page.goto("/notifications");
    const shared = page.locator('[data-testid="notification"]', { hasText: comparisonName }).first();
    expect(await shared.getAttribute("data-unread")).toBe("false");
    expect(unexpectedErrors(finance)).toEqual([]);
  });

  test("finance sees the sign-off on the scenarios list and the scenario header", async () => {
    const { page } = finance;
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Scenarios" }).click();
    await page.waitForURL((url) => url.pathname === "/scenarios");
    const summary = page.locator(`[data-testid="scenario-row"][data-scenario="${scenarioId}"] [data-testid="signoff-summary"]`);
    expect(await summary.getAttribute("data-state")).toBe("signed_off");
    expect(await summary.textContent()).toContain(`Signed off v2 by ${financeAccount.name}`);
    expect(await page.locator(`[data-testid="scenario-row"][data-scenario="${scenarioId}"]`).textContent()).toContain("v2");
    await finance.screenshot("compare-04b-finance-scenarios-list");
    // …and on the home page's newest scenarios
    await page.goto("/");
    const home = page.locator(`[data-testid="home-scenario"][data-scenario="${scenarioId}"] [data-testid="signoff-summary"]`);
    expect(await home.getAttribute("data-state")).toBe("signed_off");
    expect(await home.textContent()).toContain(`Signed off v2 by ${financeAccount.name}`);
    await page.goto(`/scenarios/${scenarioId}`);
    const header = page.getByTestId("scenario-header-signoff");
    expect(await header.getByTestId("signoff-summary").getAttribute("data-state")).toBe("signed_off");
    expect(await header.textContent()).toContain(`Signed off v2 by ${financeAccount.name}`);
  });

  test("finance cannot change an allocation: the room is read-only (banner, disabled controls, keyboard too), and the API answers 403", async () => {
    const { page } = finance;
    await page.goto(`/scenarios/${scenarioId}`);
    await page.getByTestId("scenario-signoff-status").waitFor();
    expect(await page.getByRole("button", { name: /^Save version/ }).count()).toBe(0);

    // The banner says why and what finance can do instead.
    const banner = page.getByTestId("read-only-banner");
    expect(await banner.textContent()).toMatch(/Read-only for you\. Your roles \(Finance\) do not include planning/);
    expect(await banner.textContent()).toMatch(/open any saved version from Version history, put versions side by side and comment on, sign off or decline versions shared with you/);
    // The outcome is computed here and no server answer is coming, so it is not called a preview.
    await page.locator('[data-testid="outcome-panel"][data-source="local"]').waitFor({ timeout: 15_000 });
    expect(await page.getByTestId("prediction-source").textContent()).toBe("Computed in this browser from the approved fit");

    // Every channel's slider and amount are disabled; so are locks, bounds, the total, the mode and the controls.
    const sliders = page.getByRole("slider");
    await sliders.first().waitFor();
    const sliderCount = await sliders.count();
    expect(sliderCount).toBeGreaterThan(1);
    for (let index = 0; index < sliderCount; index += 1) {
      expect(await sliders.nth(index).getAttribute("aria-disabled")).toBe("true");
      expect(await sliders.nth(index).getAttribute("data-disabled")).not.toBeNull();
    }
    const amounts = page.getByRole("textbox", { name: /spend for the horizon$/ });
    expect(await amounts.count()).toBe(sliderCount);
    for (let index = 0; index < sliderCount; index += 1) expect(await amounts.nth(index).isDisabled()).toBe(true);
    const locks = page.getByRole("button", { name: /^Lock / });
    expect(await locks.count()).toBe(sliderCount);
    for (let index = 0; index < sliderCount; index += 1) expect(await locks.nth(index).isDisabled()).toBe(true);
    await page.locator("summary", { hasText: "Bounds" }).first().click();
    expect(await page.getByRole("textbox", { name: /floor for the horizon$/ }).first().isDisabled()).toBe(true);
    expect(await page.getByRole("textbox", { name: "Fixed total for the horizon" }).isDisabled()).toBe(true);
    expect(await page.getByRole("radio", { name: "Fixed total" }).isDisabled()).toBe(true);
    expect(await page.getByRole("radio", { name: /^Growing total/ }).isDisabled()).toBe(true);
    const controls = page.getByTestId("controls-panel").getByRole("spinbutton");
    for (let index = 0; index < (await controls.count()); index += 1) expect(await controls.nth(index).isDisabled()).toBe(true);
    expect(await page.getByRole("button", { name: "Undo" }).count()).toBe(0);
    expect(await page.getByRole("button", { name: "Redo" }).count()).toBe(0);
    expect(await page.getByTestId("suggest-panel").count()).toBe(0);

    // The keyboard changes nothing either: an arrow on the slider, Ctrl+Z on the page.
    const search = page.getByRole("slider", { name: "Search spend for the horizon" });
    const searchAmount = page.getByRole("textbox", { name: "Search spend for the horizon" });
    const before = { slider: await search.getAttribute("aria-valuenow"), amount: await searchAmount.inputValue(), outcome: await page.getByTestId("unit-conversion").textContent() };
    await search.focus();
    await page.keyboard.press("ArrowRight");
    await search.press("ArrowRight");
    await page.keyboard.press("Control+z");
    await page.waitForTimeout(500);
    expect(await search.getAttribute("aria-valuenow")).toBe(before.slider);
    expect(await searchAmount.inputValue()).toBe(before.amount);
    expect(await page.getByTestId("unit-conversion").textContent()).toBe(before.outcome);

    // Versions still open (read-only), none can be restored; the outcome and curves are there.
    await page.getByRole("button", { name: /^Version history/ }).click();
    const drawer = page.getByTestId("version-drawer");
    expect(await drawer.getByRole("button", { name: /^Restore/ }).count()).toBe(0);
    await drawer.getByRole("button", { name: "Open v1" }).click();
    await expect.poll(() => page.getByTestId("save-message").textContent()).toMatch("Opened version 1 (read-only).");
    expect(await page.getByRole("slider", { name: "Search spend for the horizon" }).getAttribute("aria-disabled")).toBe("true");
    await drawer.getByRole("button", { name: "Close" }).click();
    expect(await page.getByTestId("response-curves").count()).toBe(1);
    // The curves follow the opened version (after their short settle), not the latest one.
    const openedSearch = Math.round(Number((await searchAmount.inputValue()).replace(/[^\d.]/g, "")) * 100);
    expect(openedSearch).not.toBe(Math.round(Number(before.amount.replace(/[^\d.]/g, "")) * 100));
    await expect
      .poll(() => page.locator('[data-testid="response-curve"][data-curve-channel="search_eur"]').getAttribute("data-plan-cents"), { timeout: 10_000 })
      .toBe(String(openedSearch));
    await finance.screenshot("compare-04c-finance-read-only-room");
    const versions = (await (await api(`/api/scenarios/${scenarioId}`, { token: financeToken })).json()) as Json;
    const latest = (await (await api(`/api/scenarios/${scenarioId}/versions/2`, { token: financeToken })).json()) as Json;
    const attempt = await api(`/api/scenarios/${scenarioId}/versions`, {
      method: "POST",
      token: financeToken,
      json: { baseVersion: versions.latestVersion, mode: "fixed", allocation: { ...latest.allocation, search_eur: latest.allocation.search_eur + 100, display_eur: latest.allocation.display_eur - 100 }, controls: latest.controls, horizon: latest.horizon, total: latest.total },
    });
    expect(attempt.status).toBe(403);
    expect(((await attempt.json()) as Json).error).toMatch(/roles/i);
    const [{ count }] = await sql<{ count: number }[]>`select count(*)::int as count from scenario_versions where scenario_id = ${scenarioId}`;
    expect(count).toBe(2);
  });

  test("the planner saves version 3 and sees it is not signed off (version 2 is)", async () => {
    const { page } = planner;
    await page.goto(`/scenarios/${scenarioId}`);
    const status = page.getByTestId("scenario-signoff-status");
    await expect.poll(() => status.textContent(), { timeout: 15_000 }).toMatch(/Latest version 2: v2 · Signed off/);
    const search = page.getByRole("slider", { name: "Search spend for the horizon" });
    await search.focus();
    await page.keyboard.press("ArrowRight");
    await page.getByLabel("Note for this version").fill("A little more on search");
    await page.getByRole("button", { name: "Save version 3" }).click();
    await expect.poll(() => page.getByTestId("save-message").textContent(), { timeout: 15_000 }).toMatch(/Saved as version 3/);
    // The review section follows the new version without a reload.
    await expect.poll(() => status.textContent(), { timeout: 20_000 }).toMatch(/Latest version 3: v3 · Not signed off/);
    expect(await status.textContent()).toContain("Version 2 is signed off; version 3 is not.");
    const row = (n: number) => page.locator(`[data-testid="version-signoff-row"][data-version="${n}"] [data-testid="signoff-badge"]`);
    expect(await row(3).getAttribute("data-state")).toBe("none");
    expect(await row(2).getAttribute("data-state")).toBe("signed_off");
    const header = page.getByTestId("scenario-header-signoff");
    expect(await header.textContent()).toContain("v2 signed off; v3 not signed off");
    expect(await header.getByTestId("signoff-summary").getAttribute("data-state")).toBe("not_shared");
    await page.getByTestId("scenario-signoff-status").scrollIntoViewIfNeeded();
    await planner.screenshot("compare-05-planner-version-3-not-signed-off");

    // The scenarios list: latest version 3, not signed off, and version 2 still is.
    await page.goto("/scenarios");
    const listed = page.locator(`[data-testid="scenario-row"][data-scenario="${scenarioId}"]`);
    expect(await listed.getByTestId("signoff-summary").getAttribute("data-state")).toBe("not_shared");
    expect(await listed.getByTestId("signoff-summary").getAttribute("data-version")).toBe("3");
    expect(await listed.textContent()).toContain("v3 not shared with finance");
    expect(await listed.getByTestId("signoff-earlier").textContent()).toBe("v2 signed off; v3 not signed off");
    await planner.screenshot("compare-05b-planner-scenarios-list");

    // The same on /compare, and the API agrees.
    await page.goto("/compare");
    const overview = page.locator(`[data-testid="signoff-overview-row"][data-scenario="${scenarioId}"] [data-testid="signoff-badge"]`);
    expect(await overview.getAttribute("data-state")).toBe("none");
    expect(await overview.textContent()).toBe("v3 · Not signed off");
    const v3 = (await (await api(`/api/scenarios/${scenarioId}/versions/3/signoff`, { token: plannerToken })).json()) as Json;
    expect(v3.current).toBeNull();
    const v2 = (await (await api(`/api/scenarios/${scenarioId}/versions/2/signoff`, { token: plannerToken })).json()) as Json;
    expect(v2.current).toMatchObject({ decision: "signed_off", decidedByName: financeAccount.name });
    await planner.screenshot("compare-06-overview");
    expect(unexpectedErrors(planner)).toEqual([]);
  });

  test("exports: the CSV and the one-page PDF download from the comparison", async () => {
    const id = comparisonPath.split("/").pop() as string;
    const csv = await api(`/api/comparisons/${id}/export.csv`, { token: financeToken });
    expect(csv.status).toBe(200);
    const text = await csv.text();
    expect(text).toContain(scenarioName);
    expect(text.split("\r\n").filter(Boolean)).toHaveLength(3);
    const pdf = await api(`/api/comparisons/${id}/export.pdf`, { token: financeToken });
    expect(pdf.status).toBe(200);
    expect(pdf.headers.get("content-type")).toBe("application/pdf");
    expect(Buffer.from(await pdf.arrayBuffer()).subarray(0, 5).toString()).toBe("%PDF-");
  });

  test("the header's unread count follows a share without a reload, and marking read brings it down", async () => {
    const tab = await openPage(browser);
    try {
      // The page's own clock, so the test can jump past one poll interval (30 s) instead of waiting for it.
      await tab.context.clock.install();
      const { page } = tab;
      await signInAs(page, "finance");
      const link = page.getByTestId("notifications-link");
      const before = Number(await link.getAttribute("data-unread"));
      await page.evaluate(() => Object.assign(window, { sameDocument: true }));

      const shared = await api(`/api/scenarios/${scenarioId}/versions/2/share`, {
        method: "POST",
        token: plannerToken,
        json: { recipients: [financeAccount.email], note: "Version 2 once more, for the record.", acknowledgement: "Checked the warnings." },
      });
      expect(shared.status, await shared.clone().text()).toBe(201);
      await page.clock.fastForward(31_000);
      await expect.poll(() => link.getAttribute("data-unread"), { timeout: 15_000 }).toBe(String(before + 1));
      expect(await page.getByTestId("unread-count").textContent()).toBe(`${before + 1} unread`);
      // Same document: the count changed without a reload.
      expect(await page.evaluate(() => (window as unknown as { sameDocument?: boolean }).sameDocument)).toBe(true);
      await tab.screenshot("compare-07-finance-unread-updated");

      // Marking everything read on /notifications lowers the header's count at once.
      await link.click();
      await page.waitForURL((url) => url.pathname === "/notifications");
      await page.getByRole("button", { name: "Mark all read" }).click();
      await expect.poll(() => link.getAttribute("data-unread"), { timeout: 15_000 }).toBe("0");
      expect(await page.getByTestId("unread-count").count()).toBe(0);
      expect(await page.evaluate(() => (window as unknown as { sameDocument?: boolean }).sameDocument)).toBe(true);
      expect(unexpectedErrors(tab)).toEqual([]);
    } finally {
      await tab.close();
    }
  });
});

// Fits in the browser, as people use them: the seeded approved fit's report (collinearity warning for
// online video and display), an analyst building a fit from the seeded history and sending it for
// review, its author unable to approve it (even holding the reviewer role), and a reviewer approving it.
import { randomBytes } from "node:crypto";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { hashPassword } from "@/server/auth/password";
import { launch, openPage } from "./support/browser";
import { waitForMail } from "./support/mail";
import { api, createTokenFor, demoAccountFor, demoAccounts, signInAs, testDatabase } from "./support/sign-in";

const approvedDemoFitName = "Weekly sales on six channels and promotions";

let browser: Browser;
let sql: ReturnType<typeof testDatabase>;
beforeAll(async () => {
  browser = await launch();
  sql = testDatabase();
});
afterAll(async () => {
  await browser?.close();
  await sql?.end();
});

async function seededFitId(name: string): Promise<string> {
  const [row] = await sql<{ id: string }[]>`
    select f.id from fits f join workspaces w on w.id = f.workspace_id where w.slug = 'larkspur' and f.name = ${name}`;
  if (!row) throw new Error(`the seed has no fit named ${name}`);
  return row.id;
}

/** Builds a fit in the builder (defaults: the seeded history, every channel, the promotion control) and lands on its report. */
async function buildFit(page: Page, name: string): Promise<string> {
  await page.goto("/fits");
  await page.getByRole("link", { name: "Build a fit" }).click();
  await page.waitForURL("**/fits/new");
  await expect.poll(() => page.getByTestId("design-n").textContent(), { timeout: 20_000 }).toBe("156");
  expect(await page.getByTestId("design-p").textContent()).toBe("8");
  // Leave display out (it rides on video), fit search with diminishing returns.
  await page.getByLabel("display_eur", { exact: true }).uncheck();
  expect(await page.getByTestId("design-p").textContent()).toBe("7");
  await page.getByLabel("Shape of search_eur").selectOption("log1p");
  await page.getByLabel("Name (optional)").fill(name);
  await page.getByRole("button", { name: "Fit", exact: true }).click();
  await page.waitForURL(/\/fits\/[0-9a-f-]{36}$/, { timeout: 30_000 });
  expect(await page.getByTestId("fit-name").textContent()).toBe(name);
  expect(await page.getByTestId("fit-status").getAttribute("data-status")).toBe("draft");
  return new URL(page.url()).pathname.split("/").pop()!;
}

describe("fit report", () => {
  test("the seeded approved fit shows its coefficients with intervals, the caution and the collinearity warning for video and display", async () => {
    const tab = await openPage(browser);
    try {
      await signInAs(tab.page, "planner");
      const id = await seededFitId(approvedDemoFitName);
      await tab.page.goto(`/fits/${id}`);
      expect(await tab.page.getByTestId("fit-status").textContent()).toBe("Approved");
      expect(await tab.page.getByTestId("association-caution").textContent()).toBe(
        "These effects are associations in past data, not the result of changing one channel alone.",
      );
      const rows = tab.page.getByTestId("coefficient-table").locator("tbody tr");
      expect(await rows.count()).toBe(8);
      expect(await rows.locator("svg[role=img]").count()).toBe(8); // an interval drawn beside every row
      const pValues = await tab.page.getByTestId("coefficient-table").textContent();
      expect(pValues).toContain("< 0.0001");
      expect(pValues).not.toMatch(/\*/); // numbers, never stars

      const warning = tab.page.getByTestId("collinearity-warning");
      expect(await warning.count()).toBe(1);
      const text = (await warning.textContent()) ?? "";
      expect(text).toMatch(/video_eur and display_eur move together/);
      expect(text).toMatch(/above 10/);
      expect(await tab.page.locator("td[data-strong=true]").count()).toBe(2);
      expect(await tab.page.getByTestId("durbin-watson-note").textContent()).toMatch(/close to 2/);
      // The demo's errors have one spread and a near-normal shape: both residual checks say so in words.
      expect(await tab.page.getByTestId("breusch-pagan-note").getAttribute("data-tone")).toBe("ok");
      expect(await tab.page.getByTestId("breusch-pagan-note").textContent()).toMatch(/Breusch–Pagan p-value 0\.\d{3}: no sign/);
      expect(await tab.page.getByTestId("jarque-bera-note").textContent()).toMatch(/Jarque–Bera p-value 0\.\d{3}: no sign/);
      expect(await tab.page.getByTestId("breusch-pagan").textContent()).toMatch(/^\d+\.\d+/);
      // The reviewer's run-down: the demo's two known issues to look at, the other checks fine, words not colours.
      expect(await tab.page.getByTestId("report-checks-summary").textContent()).toBe("2 things to keep in mind when reading this fit's numbers.");
      const checks = tab.page.getByTestId("report-checks").locator("li");
      const states = Object.fromEntries(await checks.evaluateAll((items) => items.map((item) => [item.getAttribute("data-check"), item.getAttribute("data-status")])));
      expect(states).toEqual({ collinearity: "look", periods: "ok", autocorrelation: "ok", variance: "ok", normality: "ok", holdout: "ok", influence: "ok", "spend-signs": "look" });
      expect(await tab.page.locator('[data-check="spend-signs"]').textContent()).toMatch(/^Look:Spend with a negative estimate: display_eur/);
      // Held-out check: the latest 13 weeks against a refit without them.
      expect(await tab.page.getByTestId("holdout-summary").textContent()).toMatch(/Refitted on the first 143 rows \(in week_start order\), the model predicted the latest 13: \d+ of 13 actual values/);
      expect(await tab.page.getByTestId("holdout-row").count()).toBe(13);
      for (const title of ["Residuals vs fitted", "Normal Q–Q of standardized residuals", "Leverage vs standardized residuals"]) {
        expect(await tab.page.getByText(title, { exact: true }).count()).toBe(1);
      }
      const trail = await tab.page.getByTestId("review-trail").textContent();
      expect(trail).toMatch(/Tobias Reyes built this fit.*sent it for review.*Ingrid Solberg approved it/s);
      // Planners read fits but take no review action.
      expect(await tab.page.getByTestId("fit-actions").count()).toBe(0);
      await tab.screenshot("fits-approved-report");
      expect(tab.errors.filter((e) => e.startsWith("uncaught"))).toEqual([]);
    } finally {
      await tab.close();
    }
  });
});

describe("building, submitting and approving", () => {
  test("an analyst builds a fit from the seeded history and submits it; the author cannot approve; a reviewer approves", async () => {
    const name = `Sales without display ${randomBytes(3).toString("hex")}`;
    const analyst = await openPage(browser);
    let fitId: string;
    const since = new Date();
    try {
      await signInAs(analyst.page, "analyst");
      fitId = await buildFit(analyst.page, name);
      const table = await analyst.page.getByTestId("coefficient-table").textContent();
      expect(table).toContain("log1p(search_eur)");
      expect(table).not.toContain("display_eur");
      await analyst.screenshot("fits-built-draft");

      await analyst.page.getByRole("button", { name: "Send for review" }).click();
      await expect.poll(() => analyst.page.getByTestId("fit-status").getAttribute("data-status"), { timeout: 20_000 }).toBe("in_review");
      // The author holds no review permission: no approve button, and the API refuses.
      expect(await analyst.page.getByRole("button", { name: "Approve" }).count()).toBe(0);
      const { token } = await createTokenFor(sql, demoAccountFor("analyst").email, "larkspur", "e2e fits");
      const refused = await api(`/api/fits/${fitId}/review`, { method: "POST", token, json: { decision: "approve" } });
      expect(refused.status).toBe(403);
      // The analyst's home lists it among their fits in progress, in review.
      await analyst.page.goto("/");
      const mine = analyst.page.locator(`[data-testid="home-my-fit"][data-fit="${fitId}"]`);
      await mine.waitFor();
      expect(await mine.getAttribute("data-status")).toBe("in_review");
      expect(await mine.textContent()).toContain("In review");
      expect(analyst.errors.filter((e) => e.startsWith("uncaught"))).toEqual([]);
    } finally {
      await analyst.close();
    }
    await waitForMail({ to: demoAccountFor("reviewer").email, subject: `Fit to review: ${name}`, since });

    const reviewer = await openPage(browser);
    try {
      await signInAs(reviewer.page, "reviewer");
      // The reviewer's home lists it in their queue.
      const queued = reviewer.page.locator(`[data-testid="home-awaiting-review"][data-fit="${fitId}"]`);
      await queued.waitFor();
      expect(await queued.textContent()).toMatch(new RegExp(`${name}.*${demoAccountFor("analyst").name}.*sent`));
      await reviewer.page.goto("/fits");
      await reviewer.page.getByTestId("fits-in_review").getByRole("link", { name }).click();
      await reviewer.page.waitForURL(`**/fits/${fitId}`);
      await reviewer.page.getByRole("button", { name: "Request changes" }).click();
      expect(await reviewer.page.getByTestId("fit-actions").getByRole("alert").textContent()).toMatch(/needs a comment/);
      await reviewer.page.getByLabel(/^Comment/).fill("Display left out on purpose: agreed.");
      await reviewer.page.getByRole("button", { name: "Approve" }).click();
      await expect.poll(() => reviewer.page.getByTestId("fit-status").getAttribute("data-status"), { timeout: 20_000 }).toBe("approved");
      expect(await reviewer.page.getByTestId("review-trail").textContent()).toContain("Display left out on purpose: agreed.");
      await reviewer.screenshot("fits-approved-by-reviewer");
      await reviewer.page.goto("/");
      await reviewer.page.locator("#awaiting-review").waitFor();
      expect(await reviewer.page.locator(`[data-testid="home-awaiting-review"][data-fit="${fitId}"]`).count()).toBe(0);
    } finally {
      await reviewer.close();
    }
    await waitForMail({ to: demoAccountFor("analyst").email, subject: `Fit approved: ${name}`, since });
  });

  test("a member holding both analyst and reviewer roles cannot approve the fit they built", async () => {
    const email = `both-${randomBytes(4).toString("hex")}@larkspur.example`;
    const password = "both-roles-password";
    const [user] = await sql<{ id: string }[]>`
      insert into "user" (id, email, name, password_hash)
      values (${crypto.randomUUID()}, ${email}, 'Alex Both', ${await hashPassword(password)}) returning id`;
    await sql`insert into memberships (workspace_id, user_id, roles) select id, ${user.id}, ${["analyst", "reviewer"]} from workspaces where slug = 'larkspur'`;
    const tab = await openPage(browser);
    try {
      await signInAs(tab.page, { email, password });
      const fitId = await buildFit(tab.page, `Own fit ${randomBytes(3).toString("hex")}`);
      await tab.page.getByRole("button", { name: "Send for review" }).click();
      await expect.poll(() => tab.page.getByTestId("fit-status").getAttribute("data-status"), { timeout: 20_000 }).toBe("in_review");
      expect(await tab.page.getByRole("button", { name: "Approve" }).count()).toBe(0);
      expect(await tab.page.getByTestId("self-approval-note").textContent()).toMatch(/You built this fit, so someone else must approve it/);
      const { token } = await createTokenFor(sql, email, "larkspur", "e2e fits");
      const refused = await api(`/api/fits/${fitId}/review`, { method: "POST", token, json: { decision: "approve" } });
      expect(refused.status).toBe(403);
      expect((await refused.json()).error).toMatch(/someone else must approve it/);
      await tab.screenshot("fits-self-approval-refused");
    } finally {
      await tab.close();
      // The person stays (they authored a fit); their membership goes, so Larkspur's member list is as seeded.
      await sql`delete from memberships where user_id = ${user.id}`;
    }
  });
});

describe("refit links from the residual checks", () => {
  test("a refit link names its standard errors and the builder starts with them chosen", async () => {
    const tab = await openPage(browser);
    try {
      await signInAs(tab.page, "analyst");
      const id = await seededFitId(approvedDemoFitName);
      const chosen = async (query: string) => {
        await tab.page.goto(`/fits/new?from=${id}${query}`);
        await expect.poll(() => tab.page.getByTestId("design-n").textContent(), { timeout: 20_000 }).toBe("156");
        return tab.page.locator("input[name=covariance]:checked").getAttribute("value");
      };
      expect(await chosen("")).toBe("classical");
      expect(await chosen("&covariance=hc3")).toBe("hc3");
      expect(await chosen("&covariance=newey-west")).toBe("newey-west");
      expect(await chosen("&covariance=anything-else")).toBe("classical");
      expect(tab.errors.filter((e) => e.startsWith("uncaught"))).toEqual([]);
    } finally {
      await tab.close();
    }
  });
});

describe("fits side by side", () => {
  test("an analyst compares the approved fit with the draft without video: one best per ranked figure, video missing from the draft, display named as shifting", async () => {
    const tab = await openPage(browser);
    try {
      await signInAs(tab.page, "analyst");
      const approved = await seededFitId(approvedDemoFitName);
      const draft = await seededFitId("Weekly sales without online video");
      await tab.page.goto("/fits");
      await tab.page.getByRole("link", { name: "Compare fits" }).click();
      await tab.page.waitForURL("**/fits/compare");
      await tab.page.locator(`input[name=ids][value="${approved}"]`).check();
      await tab.page.locator(`input[name=ids][value="${draft}"]`).check();
      await tab.page.getByRole("button", { name: "Compare" }).click();
      await tab.page.waitForURL((url) => url.pathname === "/fits/compare" && url.searchParams.getAll("ids").length === 2);

      expect(await tab.page.getByTestId("comparison-basis").textContent()).toMatch(/Same outcome on the same 156 rows/);
      for (const key of ["aic", "bic", "adjRSquared", "sigma", "holdoutMae"]) {
        expect(await tab.page.getByTestId(`summary-${key}`).locator("td[data-best=true]").count(), key).toBe(1);
      }
      expect(await tab.page.getByTestId("summary-rSquared").locator("td[data-best=true]").count()).toBe(0);
      // Columns follow the order the fits were asked for.
      const order = new URL(tab.page.url()).searchParams.getAll("ids");
      const video = tab.page.locator('[data-testid=term-row][data-term="video_eur"]');
      expect(await video.locator("td").nth(order.indexOf(draft)).textContent()).toBe("not in this fit");
      expect(await video.locator("td").nth(order.indexOf(approved)).textContent()).toMatch(/^2\.08/);
      expect(await tab.page.locator('[data-testid=term-row][data-term="display_eur"]').getAttribute("data-shifting")).toBe("true");
      expect(await tab.page.getByTestId("shift-caution").textContent()).toMatch(/display_eur .*shares credit/);
      await tab.screenshot("fits-side-by-side");

      // One fit only: the chooser asks for another; a fit of another workspace does not exist here.
      await tab.page.goto(`/fits/compare?ids=${approved}`);
      expect(await tab.page.getByTestId("compare-problem").textContent()).toBe("Pick at least one more fit.");
      expect(tab.errors.filter((e) => e.startsWith("uncaught"))).toEqual([]);
    } finally {
      await tab.close();
    }
    const outsider = await openPage(browser);
    try {
      await signInAs(outsider.page, demoAccounts.find((account) => account.workspace === "foreign")!);
      const approved = await seededFitId(approvedDemoFitName);
      const draft = await seededFitId("Weekly sales without online video");
      const response = await outsider.page.goto(`/fits/compare?ids=${approved},${draft}`);
      expect(response?.status()).toBe(404);
    } finally {
      await outsider.close();
    }
  });
});

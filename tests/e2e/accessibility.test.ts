// Every main screen, signed in as the role that uses it, checked with axe-core (Deque's accessibility
// engine, from the registry) against WCAG 2.1 A and AA: contrast, labels, landmarks, names of
// controls, links told apart from text by more than colour. The seeded demo gives every screen content.
import AxeBuilder from "@axe-core/playwright";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { demoApprovedFitName, demoComparisonName, demoDatasetName, demoDraftFitName, demoSpringScenarioName } from "@/seed/demo-names";
import type { Role } from "@/db/schema/workspaces";
import { launch, openPage } from "./support/browser";
import { signInAs, testDatabase } from "./support/sign-in";

let browser: Browser;
let sql: ReturnType<typeof testDatabase>;
const ids: Record<"fit" | "draft" | "dataset" | "scenario" | "comparison", string> = { fit: "", draft: "", dataset: "", scenario: "", comparison: "" };

beforeAll(async () => {
  browser = await launch();
  sql = testDatabase();
  const one = async (query: Promise<{ id: string }[]>, what: string) => {
    const [row] = await query;
    if (!row) throw new Error(`the seed has no ${what}`);
    return row.id;
  };
  ids.fit = await one(sql`select f.id from fits f join workspaces w on w.id = f.workspace_id where w.slug = 'larkspur' and f.name = ${demoApprovedFitName}`, "approved fit");
  ids.draft = await one(sql`select f.id from fits f join workspaces w on w.id = f.workspace_id where w.slug = 'larkspur' and f.name = ${demoDraftFitName}`, "draft fit");
  ids.dataset = await one(sql`select d.id from datasets d join workspaces w on w.id = d.workspace_id where w.slug = 'larkspur' and d.name = ${demoDatasetName}`, "dataset");
  ids.scenario = await one(sql`select s.id from scenarios s join workspaces w on w.id = s.workspace_id where w.slug = 'larkspur' and s.name = ${demoSpringScenarioName}`, "scenario");
  ids.comparison = await one(sql`select c.id from comparisons c join workspaces w on w.id = c.workspace_id where w.slug = 'larkspur' and c.name = ${demoComparisonName}`, "comparison");
});
afterAll(async () => {
  await browser?.close();
  await sql?.end();
});

/** axe's violations in a form a failing test can print: rule, impact, how many, and the first places. */
async function violations(page: Page): Promise<string[]> {
  await page.waitForLoadState("networkidle", { timeout: 15_000 }).catch(() => {});
  const results = await new AxeBuilder({ page }).withTags(["wcag2a", "wcag2aa", "wcag21a", "wcag21aa"]).analyze();
  return results.violations.map(
    (violation) =>
      `${violation.id} (${violation.impact}, ${violation.nodes.length}×): ${violation.help} — ${violation.nodes
        .slice(0, 3)
        .map((node) => `${node.target.join(" ")}: ${(node.failureSummary ?? "").split("\n").slice(1).join(" ").trim()}`)
        .join(" | ")}`,
  );
}

const screens: { role: Role | null; paths: () => string[] }[] = [
  { role: null, paths: () => ["/login"] },
  { role: "planner", paths: () => ["/", "/scenarios", `/scenarios/${ids.scenario}`, `/scenarios/new?fitId=${ids.fit}`, "/compare", `/compare/${ids.comparison}`, "/notifications"] },
  { role: "analyst", paths: () => ["/datasets", `/datasets/${ids.dataset}`, "/datasets/upload", "/fits", "/fits/new", `/fits/${ids.fit}`, "/fits/compare", `/fits/compare?ids=${ids.fit},${ids.draft}`] },
  { role: "reviewer", paths: () => ["/", `/fits/${ids.fit}`] },
  { role: "finance", paths: () => ["/", `/compare/${ids.comparison}`, `/scenarios/${ids.scenario}`] },
  { role: "admin", paths: () => ["/settings", "/settings/tokens", "/settings/outbox", "/api-docs"] },
];

describe("accessibility (axe-core, WCAG 2.1 A and AA)", () => {
  for (const { role, paths } of screens) {
    test(`${role ?? "signed-out"} screens have no violations`, async () => {
      const tab = await openPage(browser);
      try {
        if (role) await signInAs(tab.page, role);
        const found: Record<string, string[]> = {};
        for (const path of paths()) {
          await tab.page.goto(path);
          const problems = await violations(tab.page);
          if (problems.length > 0) found[path] = problems;
        }
        expect(found).toEqual({});
      } finally {
        await tab.close();
      }
    });
  }
});

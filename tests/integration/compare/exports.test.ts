// Exports of a comparison: the CSV re-imports (papaparse) to the very numbers of the view, with
// formula-like text made inert; the one-page PDF renders (poppler's pdftotext and pdfinfo) and shows
// each plan's spend, predicted outcome and intervals, the difference, the fit and its approval, the
// warnings and the cautions.
import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import Papa from "papaparse";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as exportCsv } from "@/app/api/comparisons/[id]/export.csv/route";
import { GET as exportPdf } from "@/app/api/comparisons/[id]/export.pdf/route";
import { POST as createComparison } from "@/app/api/comparisons/route";
import { POST as decide } from "@/app/api/scenarios/[id]/versions/[n]/signoff/route";
import { demoChannels } from "@/seed/history";
import { amountToCents } from "@/server/planning/allocation";
import { call, type Json, makeReviewWorkspace, scenarioWithVersions, type Workspace } from "./support";

let setup: Workspace;
let other: Workspace;
let view: Json;
let folder: string;

beforeAll(async () => {
  folder = mkdtempSync(path.join(tmpdir(), "tributary-exports-"));
  setup = await makeReviewWorkspace();
  other = await makeReviewWorkspace();
  // A name a spreadsheet would run as a formula.
  const scenario = await scenarioWithVersions(setup, '=HYPERLINK("http://evil.example","Q3")', [0, 26_000]);
  const podcastMaximum = setup.fit.record.columnRanges.podcast_eur.maximum;
  const warned = await scenarioWithVersions(setup, "Podcast test", [0], {
    extra: [
      (() => {
        const allocation = { ...scenario.baseline.allocation, podcast_eur: (podcastMaximum + 1_500) * scenario.baseline.horizon };
        const total = Object.values(allocation as Record<string, number>).reduce((sum, value) => sum + amountToCents(value), 0) / 100;
        return { allocation, total };
      })(),
    ],
  });
  await call(decide, `/api/scenarios/${scenario.id}/versions/2/signoff`, { id: scenario.id, n: "2" }, {
    method: "POST",
    json: { decision: "signed_off" },
    token: setup.members.finance.token,
  });
  const created = await call(createComparison, "/api/comparisons", {}, {
    method: "POST",
    json: {
      name: "Q3 options for finance",
      versions: [
        { scenarioId: scenario.id, version: 1 },
        { scenarioId: scenario.id, version: 2 },
        { scenarioId: warned.id, version: 1 },
      ],
    },
    token: setup.members.planner.token,
  });
  expect(created.status).toBe(201);
  view = created.body;
});

afterAll(() => rmSync(folder, { recursive: true, force: true }));

describe("CSV export", () => {
  it("re-imports with papaparse to the same numbers", async () => {
    const { status, response } = await call(exportCsv, `/api/comparisons/${view.id}/export.csv`, { id: view.id }, { token: setup.members.finance.token });
    expect(status).toBe(200);
    expect(response.headers.get("content-type")).toBe("text/csv; charset=utf-8");
    expect(response.headers.get("content-disposition")).toMatch(/^attachment; filename="side-by-side-Q3-options-for-finance\.csv"/);
    const text = await response.text();
    const parsed = Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: true, dynamicTyping: false });
    expect(parsed.errors).toEqual([]);
    expect(parsed.data).toHaveLength(3);
    const number = (value: string) => (value === "" ? null : Number(value));
    parsed.data.forEach((row, index) => {
      const column = view.columns[index];
      expect(number(row.Position)).toBe(index + 1);
      expect(number(row.Version)).toBe(column.version);
      expect(view.channels.map((channel: Json) => channel.name)).toEqual(demoChannels.map((channel) => channel.column));
      for (const channel of view.channels) {
        expect(number(row[`Spend: ${channel.label} (EUR)`])).toBe(column.allocation[channel.name]);
      }
      expect(number(row["Total spend (EUR)"])).toBe(column.totalSpend);
      expect(number(row["Predicted total"])).toBe(column.outcome.mean);
      expect(number(row["Confidence interval low"])).toBe(column.outcome.confidence[0]);
      expect(number(row["Confidence interval high"])).toBe(column.outcome.confidence[1]);
      expect(number(row["Prediction interval low"])).toBe(column.outcome.prediction[0]);
      expect(number(row["Prediction interval high"])).toBe(column.outcome.prediction[1]);
      expect(number(row["Interval level"])).toBe(0.95);
      if (column.difference.kind === "joint") {
        expect(number(row["Difference from baseline"])).toBe(column.difference.mean);
        expect(number(row["Difference interval low"])).toBe(column.difference.confidence[0]);
        expect(number(row["Difference interval high"])).toBe(column.difference.confidence[1]);
      }
    });
    expect(parsed.data.map((row) => row.Baseline)).toEqual(["yes", "no", "no"]);
    expect(parsed.data.map((row) => row["Sign-off"])).toEqual(["Not signed off", "Signed off", "Not signed off"]);
    expect(parsed.data[2].Warnings).toMatch(/^Podcast at €[\d,]+ over 13 weeks/);
    expect(parsed.data[1]["Fit approved by"]).toBe("Reviewer");
  });

  it("escapes cells that a spreadsheet would run as formulas", async () => {
    const { response } = await call(exportCsv, `/api/comparisons/${view.id}/export.csv`, { id: view.id }, { token: setup.members.planner.token });
    const text = await response.text();
    const parsed = Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: true });
    expect(parsed.data[0].Scenario).toBe(`'=HYPERLINK("http://evil.example","Q3")`);
    expect(text).not.toMatch(/(^|,)"?=HYPERLINK/m);
    // Negative numbers stay numbers (not quoted as text).
    const difference = Number(parsed.data[1]["Difference interval low"]);
    expect(Number.isFinite(difference)).toBe(true);
  });

  it("is 404 for another workspace's caller", async () => {
    const { status } = await call(exportCsv, `/api/comparisons/${view.id}/export.csv`, { id: view.id }, { token: other.members.finance.token });
    expect(status).toBe(404);
  });
});

describe("PDF export", () => {
  it("renders one page with each plan's numbers, the fit and its approval, warnings and the cautions", async () => {
    const { status, response } = await call(exportPdf, `/api/comparisons/${view.id}/export.pdf`, { id: view.id }, { token: setup.members.finance.token });
    expect(status).toBe(200);
    expect(response.headers.get("content-type")).toBe("application/pdf");
    const bytes = Buffer.from(await response.arrayBuffer());
    expect(bytes.subarray(0, 5).toString()).toBe("%PDF-");
    const file = path.join(folder, "comparison.pdf");
    writeFileSync(file, bytes);
    const info = execFileSync("pdfinfo", [file], { encoding: "utf8" });
    expect(info).toMatch(/^Pages:\s+1$/m);
    const fonts = execFileSync("pdffonts", [file], { encoding: "utf8" });
    expect(fonts).toMatch(/WorkSans/);
    const text = execFileSync("pdftotext", ["-layout", file, "-"], { encoding: "utf8" }).replace(/\s+/g, " ");
    const euros = (value: number) => new Intl.NumberFormat("en-IE", { style: "currency", currency: "EUR", maximumFractionDigits: 0 }).format(Math.round(value));
    expect(text).toContain("Side by side: Q3 options for finance");
    for (const column of view.columns) {
      expect(text).toContain(euros(column.totalSpend));
      expect(text).toContain(euros(column.outcome.mean));
      expect(text).toContain(`${euros(column.outcome.confidence[0])} to ${euros(column.outcome.confidence[1])}`);
      expect(text).toContain(`${euros(column.outcome.prediction[0])} to ${euros(column.outcome.prediction[1])}`);
      for (const channel of demoChannels) expect(text).toContain(euros(column.allocation[channel.column]));
    }
    const moved = view.columns[1].difference;
    expect(text).toContain(`+${euros(moved.mean)}`.replace("+-", "−"));
    expect(text).toContain("Signed off by Finance");
    expect(text).toContain("Not signed off");
    expect(text).toContain("Weekly sales on channel spend (test)");
    expect(text).toMatch(/Approved by Reviewer, /);
    expect(text).toContain("Podcast at €");
    expect(text).toContain("associations in past data, not the result of changing one channel alone");
    expect(text).toContain("The intervals assume the fitted model still describes the market");
    expect(text).toContain("test the shift on part of it first");
    // Rendered to an image as well (poppler draws every object without error).
    execFileSync("pdftoppm", ["-png", "-r", "60", "-singlefile", file, path.join(folder, "page")]);
  });
});

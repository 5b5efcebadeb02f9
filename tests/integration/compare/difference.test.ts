// The side-by-side view's difference from the baseline: on one fit, its interval is the one of the
// difference (a_A − a_B)ᵀβ̂ with variance s²·(a_A − a_B)ᵀ(XᵀX)⁻¹(a_A − a_B), checked against an
// independent computation (ml-matrix's inverse of XᵀX from the dataset rows, jstat's t quantile);
// it is not the gap between the two totals' intervals. On different fits there is no joint interval.
import jStatModule from "jstat";
import { Matrix, inverse } from "ml-matrix";
import { beforeAll, describe, expect, it } from "vitest";
import { GET as getComparison } from "@/app/api/comparisons/[id]/route";
import { POST as createComparison } from "@/app/api/comparisons/route";
import { demoChannels, demoControl, demoOutcome } from "@/seed/history";
import { createApprovedDemoFit } from "../scenarios/support/approved-fit";
import { getDatabase } from "@/db/client";
import { call, type Json, makeReviewWorkspace, scenarioWithVersions, type Workspace } from "./support";

const { jStat } = jStatModule;
const channels = demoChannels.map((channel) => channel.column);
const relative = (actual: number, expected: number) => Math.abs(actual - expected) / Math.max(Math.abs(expected), 1e-300);
/** The engine solves by QR in double-double; the explicit inverse loses a few digits on this design. */
const INDEPENDENT_RTOL = 1e-7;

let setup: Workspace;
let scenario: Awaited<ReturnType<typeof scenarioWithVersions>>;

beforeAll(async () => {
  setup = await makeReviewWorkspace();
  // v1: the starting plan; v2: 1,500 a week moved from display to search over 13 weeks; v3: 3,000 a week.
  scenario = await scenarioWithVersions(setup, "Search push", [0, 19_500, 39_000]);
});

/** Sum over the horizon of the design rows x = (1, spend per period…, promo): a = Σ_t x_t. */
function horizonRow(plan: Json): number[] {
  const H = plan.horizon as number;
  const promoWeeks = plan.controls[demoControl.column] as number;
  const point = (promo: number) => [1, ...channels.map((channel) => plan.allocation[channel] / H), promo];
  return point(0).map((value, index) => value * (H - promoWeeks) + point(1)[index] * promoWeeks);
}

/** (xA − xB)ᵀβ ± t·s·√((xA − xB)ᵀ(XᵀX)⁻¹(xA − xB)), from the dataset rows by explicit inversion. */
function independentDifference(planA: Json, planB: Json, level: number) {
  const rows = setup.fit.rows;
  const predictors = [...channels, demoControl.column];
  const x = new Matrix(rows.map((row) => [1, ...predictors.map((column) => row[column as keyof typeof row] as number)]));
  const y = Matrix.columnVector(rows.map((row) => row[demoOutcome.column as keyof typeof row] as number));
  const inverseGram = inverse(x.transpose().mmul(x));
  const beta = inverseGram.mmul(x.transpose()).mmul(y);
  const residuals = y.clone().sub(x.mmul(beta));
  const n = rows.length;
  const p = predictors.length + 1;
  const s = Math.sqrt(residuals.transpose().mmul(residuals).get(0, 0) / (n - p));
  const t = jStat.studentt.inv(1 - (1 - level) / 2, n - p);
  const aA = horizonRow(planA);
  const aB = horizonRow(planB);
  const d = Matrix.columnVector(aA.map((value, index) => value - aB[index]));
  const mean = d.transpose().mmul(beta).get(0, 0);
  const half = t * s * Math.sqrt(d.transpose().mmul(inverseGram).mmul(d).get(0, 0));
  return { mean, low: mean - half, high: mean + half, half };
}

async function compare(versions: { scenarioId: string; version: number }[], baseline = 0, name = "Difference check") {
  const created = await call(createComparison, "/api/comparisons", {}, { method: "POST", json: { name, versions, baseline }, token: setup.members.planner.token });
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  return created.body;
}

describe("difference from the baseline on one fit", () => {
  it("equals the independent computation (xA−xB)ᵀβ ± t·s·√((xA−xB)ᵀ(XᵀX)⁻¹(xA−xB))", async () => {
    const view = await compare([1, 2, 3].map((version) => ({ scenarioId: scenario.id, version })));
    expect(view.oneFit).toBe(true);
    expect(view.columns[0].difference).toEqual({ kind: "baseline" });
    for (const position of [1, 2]) {
      const column = view.columns[position];
      const expected = independentDifference(scenario.versions[position], scenario.versions[0], 0.95);
      expect(column.difference.kind).toBe("joint");
      expect(column.difference.level).toBe(0.95);
      expect(relative(column.difference.mean, expected.mean)).toBeLessThan(INDEPENDENT_RTOL);
      expect(relative(column.difference.confidence[0], expected.low)).toBeLessThan(INDEPENDENT_RTOL);
      expect(relative(column.difference.confidence[1], expected.high)).toBeLessThan(INDEPENDENT_RTOL);
    }
  });

  it("is not the gap between the two totals' intervals (that would ignore the shared estimates)", async () => {
    const view = await compare([{ scenarioId: scenario.id, version: 1 }, { scenarioId: scenario.id, version: 2 }]);
    const [base, moved] = view.columns;
    const half = (moved.difference.confidence[1] - moved.difference.confidence[0]) / 2;
    const naive = (base.outcome.confidence[1] - base.outcome.confidence[0]) / 2 + (moved.outcome.confidence[1] - moved.outcome.confidence[0]) / 2;
    // Here the shared estimates make the difference's interval markedly narrower than the naive sum of half-widths.
    expect(half).toBeLessThan(naive * 0.8);
    // The mean is still the difference of the two saved totals.
    expect(moved.difference.mean).toBeCloseTo(moved.outcome.mean - base.outcome.mean, 4);
  });

  it("follows the chosen baseline: against version 3, version 1's difference is the negative", async () => {
    const view = await compare([1, 3].map((version) => ({ scenarioId: scenario.id, version })), 1);
    const reversed = await call(getComparison, `/api/comparisons/${view.id}?baseline=0`, { id: view.id }, { token: setup.members.finance.token });
    expect(reversed.status).toBe(200);
    expect(view.columns[0].difference.mean).toBeCloseTo(-reversed.body.columns[1].difference.mean, 6);
    expect(view.columns[0].difference.confidence[0]).toBeCloseTo(-reversed.body.columns[1].difference.confidence[1], 6);
  });
});

describe("versions on different fits", () => {
  it("says no joint interval exists and shows each outcome alone", async () => {
    const { sql } = getDatabase();
    const secondFit = await createApprovedDemoFit(sql, {
      workspaceId: setup.workspace.id,
      authorId: setup.members.analyst.id,
      approverId: setup.members.reviewer.id,
      name: "Second fit",
    });
    const other = await scenarioWithVersions(setup, "On the second fit", [0], { fitId: secondFit.fitId });
    const view = await compare([{ scenarioId: scenario.id, version: 2 }, { scenarioId: other.id, version: 1 }]);
    expect(view.oneFit).toBe(false);
    const column = view.columns[1];
    expect(column.difference.kind).toBe("none");
    expect(column.difference.reason).toMatch(/no joint interval exists/);
    expect(column.difference.confidence).toBeUndefined();
    expect(column.outcome.confidence).toHaveLength(2);
    expect(column.fit.name).toBe("Second fit");
    expect(column.fit.approvedByName).toBe("Reviewer");
  });
});

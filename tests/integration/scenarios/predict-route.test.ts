// POST /api/fits/{id}/predict against real PostgreSQL: the numbers match the pure engine exactly
// and an independent computation (jstat's t quantile, ml-matrix's inverse of XᵀX from the dataset
// rows); validation, status and workspace refusals; no database round trip once warm.
import jStatModule from "jstat";
import { Matrix, inverse } from "ml-matrix";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import predictRoute from "@/pages/api/fits/[id]/predict";
import { callPagesRoute } from "@/tests/support/pages-route";
import { getDatabase } from "@/db/client";
import { demoChannels, demoControl, demoOutcome } from "@/seed/history";
import { invalidateFitCache, HEAD_TTL_MS } from "@/server/predict/fit-cache";
import { describePlanShape } from "@/server/predict/plan-shape";
import { scenarioOutcome, type ScenarioOutcome } from "@/server/predict/scenario-outcome";
import { apiRequest, makePlanningWorkspace } from "./support/workspace";

const { jStat } = jStatModule;
const channels = demoChannels.map((channel) => channel.column);

let setup: Awaited<ReturnType<typeof makePlanningWorkspace>>;
let other: Awaited<ReturnType<typeof makePlanningWorkspace>>;

beforeAll(async () => {
  setup = await makePlanningWorkspace();
  other = await makePlanningWorkspace();
});

afterAll(() => vi.restoreAllMocks());

async function callPredict(fitId: string, body: unknown, token = setup.members.planner.token): Promise<{ status: number; body: ScenarioOutcome & { error?: string; details?: { path: string }[] } }> {
  const response = await callPagesRoute(predictRoute, apiRequest(`/api/fits/${fitId}/predict`, { method: "POST", token, json: body }), { id: fitId });
  return { status: response.status, body: await response.json() };
}

/** A plan near the history's average week, 13 weeks with 3 promotion weeks. */
function typicalPlan() {
  const allocation: Record<string, number> = {};
  for (const channel of channels) {
    const mean = setup.fit.rows.reduce((sum, row) => sum + (row[channel as keyof (typeof setup.fit.rows)[number]] as number), 0) / setup.fit.rows.length;
    allocation[channel] = Math.round(mean * 13 * 100) / 100;
  }
  return { allocation, controls: { [demoControl.column]: 3 }, horizon: 13 };
}

/** The independent check: OLS and interval formulas by explicit inversion, t from jstat. */
function directComputation(plan: ReturnType<typeof typicalPlan>, level: number) {
  const rows = setup.fit.rows;
  const predictors = [...channels, demoControl.column];
  const x = new Matrix(rows.map((row) => [1, ...predictors.map((column) => row[column as keyof typeof row] as number)]));
  const y = Matrix.columnVector(rows.map((row) => row[demoOutcome.column as keyof typeof row] as number));
  const inverseGram = inverse(x.transpose().mmul(x));
  const beta = inverseGram.mmul(x.transpose()).mmul(y);
  const residuals = y.clone().sub(x.mmul(beta));
  const n = rows.length;
  const p = predictors.length + 1;
  const s2 = residuals.transpose().mmul(residuals).get(0, 0) / (n - p);
  const t = jStat.studentt.inv(1 - (1 - level) / 2, n - p);
  const H = plan.horizon;
  const promoWeeks = plan.controls[demoControl.column];
  const point = (promo: number) => [1, ...channels.map((channel) => plan.allocation[channel] / H), promo];
  const a = point(0).map((value, index) => value * (H - promoWeeks) + point(1)[index] * promoWeeks);
  const av = Matrix.columnVector(a);
  const total = av.transpose().mmul(beta).get(0, 0);
  const quadratic = av.transpose().mmul(inverseGram).mmul(av).get(0, 0);
  const leverageOf = (values: number[]) => {
    const v = Matrix.columnVector(values);
    return v.transpose().mmul(inverseGram).mmul(v).get(0, 0);
  };
  const trainingLeverages = rows.map((_, index) => leverageOf(x.getRow(index)));
  return {
    total,
    confidenceHalf: t * Math.sqrt(s2 * quadratic),
    predictionHalf: t * Math.sqrt(H * s2 + s2 * quadratic),
    perPeriodPredictionHalf: t * Math.sqrt(s2 + (s2 * quadratic) / H ** 2),
    leverage: Math.max(leverageOf(point(0)), leverageOf(point(1))),
    maxTrainingLeverage: Math.max(...trainingLeverages),
    s2,
    t,
  };
}

const relative = (actual: number, expected: number) => Math.abs(actual - expected) / Math.max(Math.abs(expected), 1e-300);
/** Agreement between the QR engine and explicit inversion on this well-conditioned design. */
const INDEPENDENT_RTOL = 1e-8;

describe("POST /api/fits/{id}/predict", () => {
  it("returns exactly what the pure engine computes from the fit record", async () => {
    const plan = typicalPlan();
    const { status, body } = await callPredict(setup.fit.fitId, { ...plan, level: 0.95 });
    expect(status).toBe(200);
    const shape = describePlanShape(setup.fit.record, { periodNoun: "week", outcomeUnit: "EUR" });
    const engine = scenarioOutcome(setup.fit.record, shape, plan, { level: 0.95, money: { currency: "EUR", locale: "en-IE" } });
    expect(body.horizonTotal).toEqual(engine.horizonTotal);
    expect(body.perPeriod).toEqual(engine.perPeriod);
    expect(body.leverage).toBe(engine.leverage);
    expect(body.maxTrainingLeverage).toBe(engine.maxTrainingLeverage);
    expect(body.contributions).toEqual(engine.contributions);
    expect(body.warnings).toEqual([]);
    expect(body.periodNoun).toBe("week");
  });

  it("matches an independent computation: jstat's t quantile and ml-matrix's inverse of XᵀX", async () => {
    const plan = typicalPlan();
    for (const level of [0.8, 0.95, 0.99]) {
      const { body } = await callPredict(setup.fit.fitId, { ...plan, level });
      const direct = directComputation(plan, level);
      const total = body.horizonTotal;
      expect(relative(total.mean, direct.total)).toBeLessThan(INDEPENDENT_RTOL);
      expect(relative((total.confidence[1] - total.confidence[0]) / 2, direct.confidenceHalf)).toBeLessThan(INDEPENDENT_RTOL);
      expect(relative((total.prediction[1] - total.prediction[0]) / 2, direct.predictionHalf)).toBeLessThan(INDEPENDENT_RTOL);
      expect(relative(body.perPeriod.mean, direct.total / plan.horizon)).toBeLessThan(INDEPENDENT_RTOL);
      expect(relative((body.perPeriod.confidence[1] - body.perPeriod.confidence[0]) / 2, direct.confidenceHalf / plan.horizon)).toBeLessThan(INDEPENDENT_RTOL);
      expect(relative((body.perPeriod.prediction[1] - body.perPeriod.prediction[0]) / 2, direct.perPeriodPredictionHalf)).toBeLessThan(INDEPENDENT_RTOL);
      expect(relative(body.leverage, direct.leverage)).toBeLessThan(1e-7);
      expect(relative(body.maxTrainingLeverage, direct.maxTrainingLeverage)).toBeLessThan(1e-7);
    }
  });

  it("uses the variance of a sum of future periods for the horizon total, not one period's interval times H", async () => {
    const plan = typicalPlan();
    const { body } = await callPredict(setup.fit.fitId, plan);
    const direct = directComputation(plan, 0.95);
    const half = (body.horizonTotal.prediction[1] - body.horizonTotal.prediction[0]) / 2;
    // Direct formula: t √(H s² + s² aᵀ(XᵀX)⁻¹a).
    expect(relative(half, direct.predictionHalf)).toBeLessThan(INDEPENDENT_RTOL);
    // Independent period errors add in variance: the total's PI is much narrower than H × one week's PI.
    const weekHalf = (body.perPeriod.prediction[1] - body.perPeriod.prediction[0]) / 2;
    expect(half).toBeLessThan(0.5 * weekHalf * plan.horizon);
    expect(half).toBeGreaterThan(weekHalf * Math.sqrt(plan.horizon) * 0.99);
  });

  it("gives the difference from another plan with its own interval from the covariance", async () => {
    const plan = typicalPlan();
    const moved = { ...plan, allocation: { ...plan.allocation, search_eur: plan.allocation.search_eur + 13_000, display_eur: plan.allocation.display_eur - 13_000 } };
    const { body } = await callPredict(setup.fit.fitId, { ...moved, compareTo: plan });
    const both = await callPredict(setup.fit.fitId, plan);
    expect(body.difference?.mean).toBeCloseTo(body.horizonTotal.mean - both.body.horizonTotal.mean, 6);
    const direct = directComputation(plan, 0.95);
    const record = setup.fit.record;
    const search = record.estimableTerms.indexOf("search_eur");
    const display = record.estimableTerms.indexOf("display_eur");
    // d = 1000 per week × 13 weeks on search, −the same on display: Var = d² (V_ss + V_dd − 2 V_sd).
    const d = 13_000;
    const variance = d ** 2 * (record.covariance[search][search] + record.covariance[display][display] - 2 * record.covariance[search][display]);
    const half = ((body.difference?.confidence[1] ?? 0) - (body.difference?.confidence[0] ?? 0)) / 2;
    expect(relative(half, direct.t * Math.sqrt(variance))).toBeLessThan(1e-9);
  });

  it("warns in plain words when a channel is beyond its observed range, and on an unseen combination", async () => {
    const plan = typicalPlan();
    const podcastMax = setup.fit.record.columnRanges.podcast_eur.maximum;
    const beyond = { ...plan, allocation: { ...plan.allocation, podcast_eur: (podcastMax + 1000) * 13 } };
    const { status, body } = await callPredict(setup.fit.fitId, beyond);
    expect(status).toBe(200);
    const warning = body.warnings.find((item) => item.kind === "outside-range");
    expect(warning).toMatchObject({ kind: "outside-range", column: "podcast_eur", label: "Podcast", direction: "above", role: "channel" });
    expect(warning && "beyondPerPeriod" in warning ? warning.beyondPerPeriod : 0).toBeCloseTo(1000, 6);
    expect(warning && "beyondPerHorizon" in warning ? warning.beyondPerHorizon : 0).toBeCloseTo(13_000, 6);
    expect(warning?.message).toMatch(/^Podcast at €[\d,]+ over 13 weeks \(€[\d,]+ per week\) is \d+% above the most it ever had \(€[\d,]+ per week\): €1,000 per week, €13,000 over the horizon\.$/);

    // Video and display were always bought together: each inside its range, the pair never seen.
    const ranges = setup.fit.record.columnRanges;
    const unseen = {
      ...plan,
      allocation: { ...plan.allocation, video_eur: ranges.video_eur.maximum * 0.95 * 13, display_eur: (ranges.display_eur.minimum + 50) * 13 },
    };
    const hidden = await callPredict(setup.fit.fitId, unseen);
    expect(hidden.body.warnings.filter((item) => item.kind === "outside-range")).toEqual([]);
    expect(hidden.body.leverage).toBeGreaterThan(hidden.body.maxTrainingLeverage);
    expect(hidden.body.warnings).toContainEqual(expect.objectContaining({ kind: "hidden-extrapolation", message: expect.stringMatching(/^This mix of spend was never seen together in the history \(leverage [\d.]+, above the largest of any past week, [\d.]+\)\.$/) }));
  });

  it("refuses unknown or missing channels, negative amounts and bad controls with 422", async () => {
    const plan = typicalPlan();
    const unknown = await callPredict(setup.fit.fitId, { ...plan, allocation: { ...plan.allocation, radio_eur: 100 } });
    expect(unknown.status).toBe(422);
    expect(unknown.body.error).toMatch(/no channel "radio_eur"/);
    expect(unknown.body.details?.map((detail) => detail.path)).toContain("allocation.radio_eur");

    const { search_eur: _dropped, ...withoutSearch } = plan.allocation;
    const missing = await callPredict(setup.fit.fitId, { ...plan, allocation: withoutSearch });
    expect(missing.status).toBe(422);
    expect(missing.body.details?.map((detail) => detail.path)).toContain("allocation.search_eur");

    const negative = await callPredict(setup.fit.fitId, { ...plan, allocation: { ...plan.allocation, email_eur: -5 } });
    expect(negative.status).toBe(422);
    expect(negative.body.error).toMatch(/can't be negative/);

    const promo = await callPredict(setup.fit.fitId, { ...plan, controls: { promo_week: 14 } });
    expect(promo.status).toBe(422);
    const text = await callPredict(setup.fit.fitId, { ...plan, horizon: "13" });
    expect(text.status).toBe(422);
  });

  it("answers 409 for a fit that is not approved and stops predicting within seconds of retirement", async () => {
    const { sql } = getDatabase();
    const { createApprovedDemoFit } = await import("./support/approved-fit");
    const draft = await createApprovedDemoFit(sql, { workspaceId: setup.workspace.id, authorId: setup.members.analyst.id, approverId: setup.members.reviewer.id, status: "draft" });
    const refused = await callPredict(draft.fitId, typicalPlan());
    expect(refused.status).toBe(409);
    expect(refused.body.error).toMatch(/not approved/);

    const fit = await createApprovedDemoFit(sql, { workspaceId: setup.workspace.id, authorId: setup.members.analyst.id, approverId: setup.members.reviewer.id });
    expect((await callPredict(fit.fitId, typicalPlan())).status).toBe(200);
    await sql`update fits set status = 'retired', retired_at = now(), retired_by = ${setup.members.reviewer.id} where id = ${fit.fitId}`;
    // Without any hint to this process: the cached status expires after HEAD_TTL_MS.
    const started = Date.now();
    let status = 200;
    while (status === 200 && Date.now() - started < HEAD_TTL_MS + 5_000) {
      status = (await callPredict(fit.fitId, typicalPlan())).status;
      if (status === 200) await new Promise((resolve) => setTimeout(resolve, 100));
    }
    expect(status).toBe(409);
    expect(Date.now() - started).toBeLessThan(HEAD_TTL_MS + 2_500);
  });

  it("answers 404 for another workspace's fit and 403 without fit:predict", async () => {
    const foreign = await callPredict(other.fit.fitId, typicalPlan());
    expect(foreign.status).toBe(404);
    const finance = await callPredict(setup.fit.fitId, typicalPlan(), setup.members.finance.token);
    expect(finance.status).toBe(403);
    const reviewer = await callPredict(setup.fit.fitId, typicalPlan(), setup.members.reviewer.token);
    expect(reviewer.status).toBe(200);
  });

  it("makes no database round trip per prediction once the fit and token are warm", async () => {
    const plan = typicalPlan();
    invalidateFitCache(setup.fit.fitId);
    const started = Date.now();
    expect((await callPredict(setup.fit.fitId, plan)).status).toBe(200);
    const database = getDatabase();
    const calls = [
      vi.spyOn(database.db, "select"),
      vi.spyOn(database.db, "insert"),
      vi.spyOn(database.db, "update"),
      vi.spyOn(database.db, "execute"),
    ];
    const unsafe = vi.spyOn(database.sql, "unsafe");
    for (let index = 0; index < 50; index++) {
      const moved = { ...plan, allocation: { ...plan.allocation, search_eur: plan.allocation.search_eur + index * 100 } };
      expect((await callPredict(setup.fit.fitId, moved)).status).toBe(200);
    }
    // The only reads allowed are the cache refreshes: the fit's status every HEAD_TTL_MS and the
    // token identity every 5 s, whose cached copy may be older than this test (on a quiet machine
    // the 50 requests take well under both windows: zero reads).
    const elapsed = Date.now() - started;
    const [selects, inserts, updates, executes] = calls.map((spy) => spy.mock.calls.length);
    expect(selects).toBeLessThanOrEqual(Math.floor(elapsed / HEAD_TTL_MS) + Math.floor(elapsed / 5_000) + 1);
    expect(selects).toBeLessThan(5);
    expect([inserts, updates, executes]).toEqual([0, 0, 0]);
    expect(unsafe).not.toHaveBeenCalled();
    for (const spy of [...calls, unsafe]) spy.mockRestore();
  });
});

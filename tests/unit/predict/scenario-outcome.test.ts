import { describe, expect, it } from "vitest";
import { describePlanShape } from "@/server/predict/plan-shape";
import { checkScenarioPlan, channelWarningSentences, planDifference, planPeriods, scenarioOutcome } from "@/server/predict/scenario-outcome";
import { predict, predictDifference, predictTotal } from "@/server/stats";
import { demoRecord, middlePlan, money } from "./support";

const record = demoRecord();
const shape = describePlanShape(record, { periodNoun: "week" });

/** Relative tolerance for two routes through the same doubles (sums in another order). */
const SAME_ARITHMETIC_RTOL = 1e-12;
const close = (actual: number, expected: number) => expect(Math.abs(actual - expected)).toBeLessThanOrEqual(SAME_ARITHMETIC_RTOL * Math.max(1, Math.abs(expected)));

describe("planPeriods", () => {
  it("spreads each channel's horizon amount evenly and puts the promotion weeks first", () => {
    const plan = middlePlan(record, 4);
    const periods = planPeriods(shape, plan);
    expect(periods.map((group) => [group.point.promo_week, group.periods])).toEqual([
      [1, 4],
      [0, 9],
    ]);
    expect(periods[0].point.search_eur).toBe(plan.allocation.search_eur / 13);
  });

  it("gives one group when no period is a promotion week (or all are)", () => {
    expect(planPeriods(shape, middlePlan(record, 0)).map((group) => group.periods)).toEqual([13]);
    expect(planPeriods(shape, middlePlan(record, 13)).map((group) => [group.point.promo_week, group.periods])).toEqual([[1, 13]]);
  });
});

describe("checkScenarioPlan", () => {
  it("accepts a complete plan", () => {
    expect(checkScenarioPlan(shape, middlePlan(record))).toEqual([]);
  });

  it("names unknown, missing and negative channels and impossible promotion counts", () => {
    const plan = middlePlan(record);
    const { email_eur: _email, ...rest } = plan.allocation;
    const problems = checkScenarioPlan(shape, { ...plan, allocation: { ...rest, radio_eur: 5, search_eur: -1 }, controls: { promo_week: 2.5 } });
    expect(problems.map((problem) => problem.path).sort()).toEqual(["allocation.email_eur", "allocation.radio_eur", "allocation.search_eur", "controls.promo_week"]);
    expect(problems.find((problem) => problem.path === "allocation.radio_eur")?.message).toMatch(/no channel "radio_eur" \(its channels: search_eur, /);
    expect(checkScenarioPlan(shape, { ...plan, horizon: 0 })[0].path).toBe("horizon");
  });
});

describe("scenarioOutcome", () => {
  it("equals the engine's total over the plan's periods and is consistent per period", () => {
    const plan = middlePlan(record, 3);
    const outcome = scenarioOutcome(record, shape, plan, { money });
    const points = planPeriods(shape, plan).flatMap((group) => Array.from({ length: group.periods }, () => group.point));
    const total = predictTotal(record, { points });
    expect(outcome.horizonTotal.mean).toBe(total.total);
    expect(outcome.horizonTotal.confidence).toEqual([total.confidenceInterval.lower, total.confidenceInterval.upper]);
    expect(outcome.horizonTotal.prediction).toEqual([total.predictionInterval.lower, total.predictionInterval.upper]);
    close(outcome.perPeriod.mean * 13, outcome.horizonTotal.mean);
    close((outcome.perPeriod.confidence[1] - outcome.perPeriod.confidence[0]) * 13, outcome.horizonTotal.confidence[1] - outcome.horizonTotal.confidence[0]);
  });

  it("gives a one-period plan the engine's point prediction", () => {
    const plan = { ...middlePlan(record, 1), horizon: 1 };
    const point = predict(record, { ...Object.fromEntries(Object.entries(plan.allocation)), promo_week: 1 });
    const outcome = scenarioOutcome(record, shape, plan, { money });
    close(outcome.perPeriod.mean, point.mean);
    close(outcome.perPeriod.prediction[0], point.predictionInterval.lower);
    close(outcome.perPeriod.confidence[1], point.confidenceInterval.upper);
    close(outcome.leverage, point.leverage);
  });

  it("splits the expected total into contributions that add up to it", () => {
    const outcome = scenarioOutcome(record, shape, middlePlan(record), { money });
    const sum = outcome.contributions.reduce((total, contribution) => total + contribution.value, 0);
    close(sum, outcome.horizonTotal.mean);
    expect(outcome.contributions.map((contribution) => contribution.label)).toEqual(["Baseline (intercept)", "Search", "Social", "Video", "Display", "Podcast", "Email", "Promo week"]);
  });

  it("gives the difference from another plan with the engine's interval", () => {
    const plan = middlePlan(record);
    const moved = { ...plan, allocation: { ...plan.allocation, search_eur: plan.allocation.search_eur + 26_000, video_eur: plan.allocation.video_eur - 26_000 } };
    const outcome = scenarioOutcome(record, shape, moved, { money, compareTo: plan });
    const points = (p: typeof plan) => planPeriods(shape, p).flatMap((group) => Array.from({ length: group.periods }, () => group.point));
    const engine = predictDifference(record, { points: points(moved) }, { points: points(plan) });
    expect(outcome.difference).toEqual({ mean: engine.difference, confidence: [engine.confidenceInterval.lower, engine.confidenceInterval.upper], baselineTotal: engine.totalB });
    expect(planDifference(record, shape, moved, plan).mean).toBe(engine.difference);
  });

  it("warns with amounts per week and per horizon when a channel is beyond its observed range", () => {
    const plan = middlePlan(record);
    const max = record.columnRanges.email_eur.maximum;
    const outcome = scenarioOutcome(record, shape, { ...plan, allocation: { ...plan.allocation, email_eur: (max + 500) * 13 } }, { money });
    const warning = outcome.warnings.find((item) => item.kind === "outside-range");
    expect(warning).toMatchObject({ column: "email_eur", direction: "above", beyondPerPeriod: expect.closeTo(500, 6), beyondPerHorizon: expect.closeTo(6500, 6) });
    expect(warning?.message).toContain("€500 per week, €6,500 over the horizon");
    expect(channelWarningSentences(shape, outcome.warnings)).toMatchObject({ email_eur: warning?.message, search_eur: null });
  });

  it("warns below the observed range too, and about no combination inside the hull", () => {
    const plan = middlePlan(record);
    const outcome = scenarioOutcome(record, shape, { ...plan, allocation: { ...plan.allocation, search_eur: 0 } }, { money });
    expect(outcome.warnings.find((item) => item.kind === "outside-range")?.message).toMatch(/^Search at €0 over 13 weeks \(€0 per week\) is below the least it ever had \(€[\d,]+ per week\)/);
    expect(scenarioOutcome(record, shape, plan, { money }).warnings).toEqual([]);
  });
});

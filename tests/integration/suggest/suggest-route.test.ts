// POST /api/fits/{id}/suggest against real PostgreSQL (the demo fit stored in a fresh workspace):
// every suggestion keeps every constraint it was given (fixed and growing totals, locks, floors,
// ceilings, observed ranges, the hull); its prediction is exactly POST /predict's for the suggested plan
// and never below the current plan's when the current plan keeps the same rules; infeasible or invalid
// input is 422 with a detail naming the field; not approved 409; another workspace 404; finance 403.
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import predictRoute from "@/pages/api/fits/[id]/predict";
import type { SuggestResponse } from "@/app/api/fits/[id]/suggest/schema";
import { POST as suggest } from "@/app/api/fits/[id]/suggest/route";
import { callPagesRoute } from "@/tests/support/pages-route";
import { getDatabase } from "@/db/client";
import { demoChannels, demoControl } from "@/seed/history";
import type { ScenarioOutcome } from "@/server/predict/scenario-outcome";
import { createApprovedDemoFit } from "../scenarios/support/approved-fit";
import { apiRequest, makePlanningWorkspace, routeContext } from "../scenarios/support/workspace";

const channels = demoChannels.map((channel) => channel.column);
const H = 13;

let setup: Awaited<ReturnType<typeof makePlanningWorkspace>>;
let other: Awaited<ReturnType<typeof makePlanningWorkspace>>;

beforeAll(async () => {
  setup = await makePlanningWorkspace();
  other = await makePlanningWorkspace();
});

afterAll(() => vi.restoreAllMocks());

type Answer = { status: number; body: SuggestResponse & { error?: string; details?: { path: string; message: string }[] } };

async function callSuggest(fitId: string, body: unknown, token = setup.members.planner.token): Promise<Answer> {
  const response = await suggest(apiRequest(`/api/fits/${fitId}/suggest`, { method: "POST", token, json: body }), routeContext({ id: fitId }));
  return { status: response.status, body: await response.json() };
}

async function callPredict(fitId: string, body: unknown): Promise<ScenarioOutcome> {
  const response = await callPagesRoute(predictRoute, apiRequest(`/api/fits/${fitId}/predict`, { method: "POST", token: setup.members.planner.token, json: body }), { id: fitId });
  expect(response.status).toBe(200);
  return response.json();
}

/** Observed spend per period of a channel in the stored fit (what "inside the observed range" means). */
const observed = (channel: string) => setup.fit.record.columnRanges[channel];

/** The last quarter's spend: the plan a scenario starts from. */
function lastQuarter() {
  const rows = setup.fit.rows.slice(-H);
  const allocation: Record<string, number> = {};
  for (const channel of channels) allocation[channel] = Math.round(rows.reduce((sum, row) => sum + (row[channel as keyof (typeof rows)[number]] as number), 0) * 100) / 100;
  return { allocation, controls: { [demoControl.column]: 2 }, horizon: H };
}

const sum = (allocation: Record<string, number>) => Math.round(Object.values(allocation).reduce((total, value) => total + value * 100, 0));
const cents = (amount: number) => Math.round(amount * 100);

/** Every constraint a suggestion must keep (amounts in currency per horizon). */
function expectKept(
  answer: SuggestResponse,
  rules: { mode: "fixed" | "growing"; budget: number; current: Record<string, number>; locks?: string[]; floors?: Record<string, number>; ceilings?: Record<string, number>; inside?: boolean; hull?: boolean },
) {
  const total = sum(answer.allocation);
  if (rules.mode === "fixed") expect(total).toBe(cents(rules.budget));
  else expect(total).toBeLessThanOrEqual(cents(rules.budget));
  expect(cents(answer.total)).toBe(total);
  for (const channel of channels) {
    const amount = answer.allocation[channel];
    expect(Number.isInteger(Math.round(amount * 100))).toBe(true);
    expect(amount).toBeGreaterThanOrEqual(0);
    if (rules.locks?.includes(channel)) expect(cents(amount)).toBe(cents(rules.current[channel]));
    if (rules.floors?.[channel] !== undefined) expect(cents(amount)).toBeGreaterThanOrEqual(cents(rules.floors[channel]));
    if (rules.ceilings?.[channel] !== undefined) expect(cents(amount)).toBeLessThanOrEqual(cents(rules.ceilings[channel]));
    if (rules.inside !== false) {
      // The scenario screen's own arithmetic: horizon amount ÷ H against the observed per-period range.
      expect(amount / H).toBeGreaterThanOrEqual(observed(channel).minimum);
      expect(amount / H).toBeLessThanOrEqual(observed(channel).maximum);
    }
  }
  if (rules.inside !== false) expect(answer.prediction.warnings.filter((warning) => warning.kind === "outside-range")).toEqual([]);
  if (rules.hull !== false && answer.hull.status === "kept") expect(answer.prediction.leverage).toBeLessThanOrEqual(answer.prediction.maxTrainingLeverage * (1 + 1e-9));
}

describe("POST /api/fits/{id}/suggest", () => {
  it("suggests a fixed-total split inside every observed range and the hull, predicted at least as well as the current plan", async () => {
    const plan = lastQuarter();
    const { status, body } = await callSuggest(setup.fit.fitId, plan);
    expect(status, JSON.stringify(body)).toBe(200);
    expectKept(body, { mode: "fixed", budget: sum(plan.allocation) / 100, current: plan.allocation });
    expect(body.method).toBe("exact");
    expect(body.caution).toMatch(/not proof that moving money causes the gain; test the shift on part of the budget first/);
    expect(body.binding.length).toBeGreaterThan(0);
    for (const constraint of body.binding) expect(constraint.message.length).toBeGreaterThan(10);
    expect(body.binding.some((constraint) => constraint.kind === "total-fixed")).toBe(true);

    // The prediction is exactly POST /predict's for the suggested plan, compared with the current plan.
    const predicted = await callPredict(setup.fit.fitId, { allocation: body.allocation, controls: plan.controls, horizon: H, compareTo: plan });
    expect(body.prediction.horizonTotal).toEqual(predicted.horizonTotal);
    expect(body.prediction.difference).toEqual(predicted.difference);
    const current = await callPredict(setup.fit.fitId, plan);
    expect(body.current.mean).toBeCloseTo(current.horizonTotal.mean, 6);
    // The gain and its interval are the difference's (dᵀVd), not the two intervals'.
    expect(body.gain.mean).toBeCloseTo(predicted.difference!.mean, 6);
    expect(body.gain.confidence[0]).toBeCloseTo(predicted.difference!.confidence[0], 6);
    expect(body.gain.confidence[1]).toBeCloseTo(predicted.difference!.confidence[1], 6);
    expect(body.gain.confidence[1] - body.gain.confidence[0]).toBeLessThan(
      body.prediction.horizonTotal.confidence[1] - body.prediction.horizonTotal.confidence[0] + (body.current.confidence[1] - body.current.confidence[0]),
    );
    // The last quarter lies inside the history, so it keeps the same rules: the suggestion is no worse.
    if (current.warnings.length === 0) expect(body.prediction.horizonTotal.mean).toBeGreaterThanOrEqual(current.horizonTotal.mean - 1e-6);
  });

  it("keeps locks, floors and ceilings, and says which of them bind", async () => {
    const plan = lastQuarter();
    const [locked, floored, capped] = channels;
    const floors = { [floored]: Math.ceil(plan.allocation[floored] * 1.05) };
    const ceilings = { [capped]: Math.floor(plan.allocation[capped] * 0.9) };
    const { status, body } = await callSuggest(setup.fit.fitId, { ...plan, locks: [locked], floors, ceilings });
    expect(status, JSON.stringify(body)).toBe(200);
    expectKept(body, { mode: "fixed", budget: sum(plan.allocation) / 100, current: plan.allocation, locks: [locked], floors, ceilings });
    expect(body.binding.some((constraint) => constraint.kind === "locked" && constraint.channel === locked)).toBe(true);
    expect(body.channels.find((channel) => channel.name === locked)).toMatchObject({ locked: true, change: 0 });
  });

  it("in growing mode spends at most the ceiling", async () => {
    const plan = lastQuarter();
    const ceiling = Math.round(sum(plan.allocation) * 1.1) / 100;
    const { status, body } = await callSuggest(setup.fit.fitId, { ...plan, mode: "growing", ceiling });
    expect(status, JSON.stringify(body)).toBe(200);
    expectKept(body, { mode: "growing", budget: ceiling, current: plan.allocation });
  });

  it("without the observed-range and hull rules it may leave them, and says so in the prediction", async () => {
    const plan = lastQuarter();
    const { status, body } = await callSuggest(setup.fit.fitId, { ...plan, keepInsideObservedRange: false, keepInsideHull: false });
    expect(status, JSON.stringify(body)).toBe(200);
    expectKept(body, { mode: "fixed", budget: sum(plan.allocation) / 100, current: plan.allocation, inside: false, hull: false });
    expect(body.hull.status).toBe("off");
    const inside = await callSuggest(setup.fit.fitId, plan);
    // Fewer rules never predict less.
    expect(body.prediction.horizonTotal.mean).toBeGreaterThanOrEqual(inside.body.prediction.horizonTotal.mean - 1e-6);
  });

  it("refuses infeasible and invalid input with 422 and a detail naming the field", async () => {
    const plan = lastQuarter();
    const total = sum(plan.allocation) / 100;
    const cases: { body: unknown; path: RegExp; message?: RegExp }[] = [
      // More money than every channel can take inside its observed range.
      { body: { ...plan, allocation: Object.fromEntries(channels.map((channel) => [channel, observed(channel).maximum * H * 1.2])) }, path: /^total$/, message: /at most/ },
      // Floors above the fixed total.
      { body: { ...plan, floors: Object.fromEntries(channels.map((channel) => [channel, total])) }, path: /^total$|^allocation\./ },
      // A floor above the channel's own ceiling.
      { body: { ...plan, floors: { [channels[0]]: 2000 }, ceilings: { [channels[0]]: 1000 } }, path: /^floors\./, message: /above its ceiling/ },
      // A floor beyond anything the channel was seen at, with the observed range kept.
      { body: { ...plan, floors: { [channels[1]]: observed(channels[1]).maximum * H * 2 } }, path: /^allocation\./, message: /no room/ },
      { body: { ...plan, locks: ["nonexistent_eur"] }, path: /^locks\.0$/ },
      { body: { ...plan, ceilings: { nonexistent_eur: 10 } }, path: /^ceilings\.nonexistent_eur$/ },
      { body: { ...plan, total: total + 500 }, path: /^total$/, message: /add up to/ },
      { body: { ...plan, mode: "growing" }, path: /^ceiling$/, message: /needs a ceiling/ },
      { body: { ...plan, mode: "growing", ceiling: total - 1000 }, path: /^ceiling$/, message: /below/ },
      { body: { ...plan, allocation: { ...plan.allocation, mystery_eur: 10 } }, path: /^allocation\.mystery_eur$/ },
      { body: { ...plan, allocation: { ...plan.allocation, [channels[0]]: -5 } }, path: new RegExp(`^allocation\\.${channels[0]}$`) },
      { body: { ...plan, controls: {} }, path: new RegExp(`^controls\\.${demoControl.column}$`) },
      { body: { ...plan, horizon: 0 }, path: /^horizon$/ },
      { body: { ...plan, mode: "sideways" }, path: /^mode$/ },
      { body: { ...plan, keepInsideHull: "yes" }, path: /^keepInsideHull$/ },
      { body: { ...plan, floors: { [channels[0]]: -1 } }, path: new RegExp(`^floors\\.${channels[0]}$`) },
    ];
    for (const { body, path, message } of cases) {
      const answer = await callSuggest(setup.fit.fitId, body);
      expect(answer.status, JSON.stringify({ body, answer: answer.body })).toBe(422);
      expect(answer.body.error?.length).toBeGreaterThan(10);
      expect(answer.body.details?.some((detail) => path.test(detail.path)), JSON.stringify(answer.body.details)).toBe(true);
      if (message) expect(answer.body.details?.map((detail) => detail.message).join(" ")).toMatch(message);
    }
  });

  it("answers 409 for a fit that is not approved, 404 for another workspace's, 403 without fit:predict", async () => {
    const { sql } = getDatabase();
    const draft = await createApprovedDemoFit(sql, { workspaceId: setup.workspace.id, authorId: setup.members.analyst.id, approverId: setup.members.reviewer.id, status: "draft" });
    const refused = await callSuggest(draft.fitId, lastQuarter());
    expect(refused.status).toBe(409);
    expect(refused.body.error).toMatch(/not approved/);
    expect((await callSuggest(other.fit.fitId, lastQuarter())).status).toBe(404);
    expect((await callSuggest(setup.fit.fitId, lastQuarter(), setup.members.finance.token)).status).toBe(403);
    expect((await callSuggest(setup.fit.fitId, lastQuarter(), other.members.planner.token)).status).toBe(404);
  });

  it("on many random plans and rules, every suggestion keeps every constraint (or is refused with 422)", async () => {
    let seed = 7;
    const random = () => ((seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31);
    let made = 0;
    for (let trial = 0; trial < 40; trial++) {
      const allocation: Record<string, number> = {};
      for (const channel of channels) {
        const range = observed(channel);
        allocation[channel] = Math.round((range.minimum + random() * (range.maximum - range.minimum)) * H * 100) / 100;
      }
      const plan = { allocation, controls: { [demoControl.column]: Math.floor(random() * 4) }, horizon: H };
      const locks = channels.filter(() => random() < 0.2);
      const floors: Record<string, number> = {};
      const ceilings: Record<string, number> = {};
      for (const channel of channels) {
        if (random() < 0.25) floors[channel] = Math.round(allocation[channel] * (0.7 + random() * 0.3));
        if (random() < 0.25) ceilings[channel] = Math.round(allocation[channel] * (1 + random() * 0.3));
      }
      const growing = random() < 0.4;
      const ceiling = Math.round(sum(allocation) * (1 + random() * 0.2)) / 100;
      const body = { ...plan, locks, floors, ceilings, ...(growing ? { mode: "growing", ceiling } : {}) };
      const answer = await callSuggest(setup.fit.fitId, body);
      if (answer.status === 422) continue;
      expect(answer.status, JSON.stringify(answer.body)).toBe(200);
      made++;
      expectKept(answer.body, { mode: growing ? "growing" : "fixed", budget: growing ? ceiling : sum(allocation) / 100, current: allocation, locks, floors, ceilings });
    }
    expect(made).toBeGreaterThan(20);
  });
});

// The suggestion for an all-linear fit is the optimum of a linear programme. Checked on 120 seeded
// random instances (2–6 channels, coefficients of both signs, fixed and growing totals, floors,
// ceilings, locks, observed ranges on and off, controls held over groups of periods, hull off)
// against an independent solver: GNU GLPK's simplex, as glpk.js 5.0.0 from the npm registry.
// The LP is built here from the engine alone (objective slopes by exact differences of
// `predictTotal`, bounds from the allocation and the record's ranges), not from the optimiser's code.
import GLPK, { type GLPK as Glpk, type LP } from "glpk.js/node";
import { beforeAll, describe, expect, it } from "vitest";
import type { AllocationState } from "@/server/planning/allocation";
import { type PeriodGroup, enginePlan, suggestAllocation } from "@/server/planning/suggest";
import { type FitRecord, predictTotal } from "@/server/stats";
import { controlGroups, makeInstance, makePlan } from "./support/instances";

/** The acceptance criterion: optimum equal to the independent LP's within 1e-6 relative. */
const optimumTolerance = 1e-6;
const instanceCount = 120;

let glpk: Glpk;
beforeAll(async () => {
  glpk = await GLPK();
});

function totalOf(record: FitRecord, groups: PeriodGroup[], state: AllocationState, amounts: number[]): number {
  const names = state.channels.map((channel) => channel.name);
  return predictTotal(record, enginePlan(groups, names, amounts, state.horizonPeriods)).total;
}

/** Max Σ cⱼAⱼ + F(0) over the same feasible set, by GLPK. */
function oracleOptimum(record: FitRecord, groups: PeriodGroup[], state: AllocationState, keepObserved: boolean) {
  const H = state.horizonPeriods;
  const zero = state.channels.map(() => 0);
  const base = totalOf(record, groups, state, zero);
  // F is affine in the amounts, so a difference over a large step is its slope to rounding.
  const step = 1e8;
  const slopes = state.channels.map((_, j) => (totalOf(record, groups, state, zero.map((v, k) => (k === j ? step : 0))) - base) / step);
  const bounds = state.channels.map((channel) => {
    if (channel.locked) return { lb: channel.amountCents, ub: channel.amountCents };
    let lb = Math.max(0, channel.floorCents ?? 0);
    let ub = channel.ceilingCents ?? Infinity;
    const range = record.columnRanges[channel.name];
    if (keepObserved && range) {
      // The observed range over the horizon, rounded inward to whole cents.
      lb = Math.max(lb, Math.ceil(range.minimum * H * 100));
      ub = Math.min(ub, Math.floor(range.maximum * H * 100));
    }
    return { lb, ub };
  });
  const budget = state.mode === "fixed" ? state.totalCents : state.ceilingCents;
  const lp: LP = {
    name: "allocation",
    objective: { direction: glpk.GLP_MAX, name: "outcome", vars: slopes.map((coef, j) => ({ name: `a${j}`, coef })) },
    subjectTo: [
      {
        name: "budget",
        vars: state.channels.map((_, j) => ({ name: `a${j}`, coef: 1 })),
        bnds: state.mode === "fixed" ? { type: glpk.GLP_FX, lb: budget, ub: budget } : { type: glpk.GLP_UP, lb: 0, ub: budget },
      },
    ],
    bounds: bounds.map(({ lb, ub }, j) => ({
      name: `a${j}`,
      type: lb === ub ? glpk.GLP_FX : Number.isFinite(ub) ? glpk.GLP_DB : glpk.GLP_LO,
      lb,
      ub: Number.isFinite(ub) ? ub : 0,
    })),
  };
  const solved = glpk.solve(lp, { msglev: glpk.GLP_MSG_OFF });
  return { status: solved.result.status, optimum: base + solved.result.z };
}

describe("linear fits: the suggestion is the linear programme's optimum", () => {
  const cases = Array.from({ length: instanceCount }, (_, index) => ({
    index,
    channelCount: 2 + (index % 5),
    mode: index % 2 === 0 ? ("fixed" as const) : ("growing" as const),
    controls: index % 3 === 0,
    keepObserved: index % 4 !== 1,
  }));

  it.each(cases)("instance $index ($channelCount channels, $mode, controls $controls, observed range $keepObserved)", (spec) => {
    const instance = makeInstance({ kind: "linear", channelCount: spec.channelCount, seed: 1000 + spec.index, controls: spec.controls, controlInteraction: spec.controls });
    const state = makePlan(instance, { seed: 5000 + spec.index, mode: spec.mode, locks: true, bounds: true });
    const groups = spec.controls ? controlGroups(state.horizonPeriods, spec.index % 6) : [{ point: {}, periods: state.horizonPeriods }];
    const result = suggestAllocation({ record: instance.record, allocation: state, controlPeriods: groups, keepInsideHull: false, keepInsideObservedRange: spec.keepObserved });
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    const { suggestion } = result;
    const oracle = oracleOptimum(instance.record, groups, state, spec.keepObserved);
    expect(oracle.status).toBe(glpk.GLP_OPT);
    expect(suggestion.method).toBe("exact");
    const ours = totalOf(instance.record, groups, state, state.channels.map((channel) => suggestion.allocation[channel.name]));
    expect(Math.abs(ours - oracle.optimum) / Math.abs(oracle.optimum)).toBeLessThan(optimumTolerance);
    expect(suggestion.predicted.mean).toBeCloseTo(ours, 6);
  });
});

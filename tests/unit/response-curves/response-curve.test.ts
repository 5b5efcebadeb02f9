// Response curves and marginal returns. The marginal return must equal the curve's own slope (a
// central finite difference of the engine's predicted totals along the curve) and its interval
// must be gᵀβ ± t·√(gᵀVg) computed here by hand: g written out from the model's terms (linear, log1p,
// spend × promotion, controls), V the fit record's covariance, t from jStat 1.9.6's Student t
// inverse (npm registry) — not from the code under test.
import jstatModule from "jstat";
import { describe, expect, it } from "vitest";
import { marginalReturn, responseCurve, responseCurves } from "@/server/planning/response-curves";
import { controlGroups, makeInstance, makePlan } from "../suggest/support/instances";

const { jStat } = jstatModule;

/** Finite difference vs analytic slope: truncation ~F‴h², rounding ~1e-16·F/h. */
const slopeTolerance = 1e-6;
/** jStat's quantile is accurate to about 2e-8 relative; the engine polishes its own. */
const intervalTolerance = 1e-7;

const instance = makeInstance({ kind: "mixed-control", channelCount: 4, seed: 31337, noise: 500 });
const state = makePlan(instance, { seed: 4242, mode: "fixed" });
const H = state.horizonPeriods;
const promoWeeks = 4;
const groups = controlGroups(H, promoWeeks, 10.5);

describe("responseCurve", () => {
  const curves = responseCurves({ record: instance.record, allocation: state, controlPeriods: groups });

  it("gives every channel a curve of 61 points from 0 past the observed maximum and the plan", () => {
    expect(curves.map((curve) => curve.channel)).toEqual(instance.channels);
    for (const curve of curves) {
      expect(curve.points).toHaveLength(61);
      expect(curve.points[0].amountCents).toBe(0);
      const top = curve.points[60].amountCents;
      expect(top).toBeGreaterThanOrEqual(curve.observed?.maxCents ?? 0);
      expect(top).toBeGreaterThanOrEqual(1.5 * curve.current.amountCents - 1);
      for (const point of curve.points) {
        expect(point.confidence[0]).toBeLessThanOrEqual(point.mean);
        expect(point.prediction[0]).toBeLessThanOrEqual(point.confidence[0]);
        expect(point.prediction[1]).toBeGreaterThanOrEqual(point.confidence[1]);
        const outside = curve.observed !== null && (point.amountCents < curve.observed.minCents - 1 || point.amountCents > curve.observed.maxCents + 1);
        const inside = curve.observed !== null && point.amountCents > curve.observed.minCents + 1 && point.amountCents < curve.observed.maxCents - 1;
        if (outside) expect(point.beyondObservedRange).toBe(true);
        if (inside) expect(point.beyondObservedRange).toBe(false);
      }
    }
  });

  it("has a marginal return equal to the curve's finite-difference slope at the plan", () => {
    for (const curve of curves) {
      const at = curve.current.amountCents;
      const step = 1000; // cents
      const [down, , up] = responseCurve({ record: instance.record, allocation: state, controlPeriods: groups, channel: curve.channel, grid: [at - step, at, at + step] }).points;
      const slopePerCurrencyUnit = ((up.mean - down.mean) / (2 * step)) * 100;
      const scale = Math.max(Math.abs(slopePerCurrencyUnit), 1e-3);
      expect(Math.abs(curve.marginalReturn.value - slopePerCurrencyUnit) / scale).toBeLessThan(slopeTolerance);
    }
  });

  it("has a marginal return interval of gᵀβ ± t·√(gᵀVg), computed by hand", () => {
    const record = instance.record;
    const level = 0.9;
    const t = jStat.studentt.inv(1 - (1 - level) / 2, record.residualDegreesOfFreedom);
    for (const [j, name] of instance.channels.entries()) {
      const perPeriod = state.channels[j].amountCents / 100 / H;
      // ∂(Σ over periods of the design row)/∂(one currency unit of horizon spend), term by term.
      const g = record.estimableTerms.map((term) => {
        if (term === name) return 1;
        if (term === `log1p(${name})`) return 1 / (1 + perPeriod);
        if (term === `${name}:promo`) return promoWeeks / H;
        return 0;
      });
      const value = g.reduce((sum, gk, k) => sum + gk * record.coefficients[k], 0);
      const variance = g.reduce((sum, gk, k) => sum + gk * g.reduce((inner, gl, l) => inner + record.covariance[k][l] * gl, 0), 0);
      const result = marginalReturn({ record, allocation: state, controlPeriods: groups, channel: name, confidenceLevel: level, units: { outcome: "EUR of sales", spend: "EUR" } });
      const halfWidth = t * Math.sqrt(variance);
      expect(result.value).toBeCloseTo(value, 9);
      expect(Math.abs(result.standardError - Math.sqrt(variance)) / Math.sqrt(variance)).toBeLessThan(1e-12);
      expect(Math.abs(result.confidence[0] - (value - halfWidth)) / halfWidth).toBeLessThan(intervalTolerance);
      expect(Math.abs(result.confidence[1] - (value + halfWidth)) / halfWidth).toBeLessThan(intervalTolerance);
      expect(result.unit).toBe("EUR of sales per EUR of spend");
    }
  });

  it("refuses an unknown channel and a missing control value", () => {
    expect(() => responseCurve({ record: instance.record, allocation: state, controlPeriods: groups, channel: "nope" })).toThrow(/channel of the allocation/);
    expect(() => marginalReturn({ record: instance.record, allocation: state, channel: "ch0" })).toThrow(/price/);
  });
});

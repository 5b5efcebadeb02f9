/**
 * Response curves: the expected horizon outcome as one channel's spend varies with every other
 * channel held at the plan, each point with its confidence band (the mean) and prediction band
 * (the realised total) from the engine's `predictTotal`, flags where the point leaves the observed
 * range or the data's hull, the observed range to shade, and the marginal return at the plan.
 *
 * Default grid: 0 … max(the most seen per period × H, 1.5 × the plan's amount), 60 equal steps —
 * wide enough to show where the fit runs out of data.
 */
import { type PeriodGroup, enginePlan } from "@/server/planning/suggest";
import { wholeHorizon } from "@/server/planning/suggest/period-groups";
import { predictTotal } from "@/server/stats";
import { marginalReturn } from "./marginal-return";
import type { ResponseCurve, ResponseCurveInput, ResponseCurvePoint } from "./types";

/** The default grid of amounts (cents per horizon). */
export function curveGrid(observedMaxCents: number, currentCents: number, pointCount: number, horizonPeriods: number): number[] {
  // A channel never seen nor planned still gets a visible axis: one currency unit per period.
  const top = Math.max(observedMaxCents, 1.5 * currentCents, 100 * horizonPeriods);
  const steps = Math.max(1, pointCount - 1);
  return Array.from({ length: steps + 1 }, (_, index) => Math.round((top * index) / steps));
}

function curvePoint(input: ResponseCurveInput, groups: readonly PeriodGroup[], channel: number, amountCents: number, level: number): ResponseCurvePoint {
  const { allocation, record } = input;
  const names = allocation.channels.map((entry) => entry.name);
  const amounts = allocation.channels.map((entry, index) => (index === channel ? amountCents : entry.amountCents));
  const total = predictTotal(record, enginePlan(groups, names, amounts, allocation.horizonPeriods), { confidenceLevel: level });
  return {
    amountCents,
    mean: total.total,
    confidence: [total.confidenceInterval.lower, total.confidenceInterval.upper],
    prediction: [total.predictionInterval.lower, total.predictionInterval.upper],
    beyondObservedRange: total.extrapolation.some((report) => report.columns.some((excursion) => excursion.name === names[channel])),
    unseenCombination: total.extrapolation.some((report) => report.hiddenExtrapolation),
  };
}

/**
 * The response curve of one channel.
 *
 * @example responseCurve({ record, allocation, channel: "search" }).points.length // => 61
 * @throws if the channel is not in the allocation, a control value is missing, or the level is outside (0, 1)
 * Cost: O(points × H × p²) — a few milliseconds for 61 points over a quarter of weeks.
 */
export function responseCurve(input: ResponseCurveInput & { channel: string }): ResponseCurve {
  const { allocation, record } = input;
  const channel = allocation.channels.findIndex((entry) => entry.name === input.channel);
  if (channel < 0) throw new Error(`responseCurve requires a channel of the allocation (got '${input.channel}')`);
  const H = allocation.horizonPeriods;
  const groups = input.controlPeriods ?? wholeHorizon(H);
  const level = input.confidenceLevel ?? record.confidenceLevel;
  const range = record.columnRanges[input.channel];
  const observed = range ? { minCents: Math.round(range.minimum * H * 100), maxCents: Math.round(range.maximum * H * 100) } : null;
  const currentCents = allocation.channels[channel].amountCents;
  const grid = input.grid ?? curveGrid(observed?.maxCents ?? 0, currentCents, input.pointCount ?? 61, H);
  return {
    channel: input.channel,
    label: allocation.channels[channel].label,
    points: grid.map((amount) => curvePoint(input, groups, channel, amount, level)),
    observed,
    current: curvePoint(input, groups, channel, currentCents, level),
    marginalReturn: marginalReturn({ ...input, controlPeriods: groups, confidenceLevel: level }),
  };
}

/** Every channel's response curve, in plan order. */
export function responseCurves(input: ResponseCurveInput): ResponseCurve[] {
  return input.allocation.channels.map((entry) => responseCurve({ ...input, channel: entry.name }));
}

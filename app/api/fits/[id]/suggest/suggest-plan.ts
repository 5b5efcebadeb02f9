/**
 * The suggest route's domain: the request → the planner's allocation state → `suggestAllocation`
 * (server/planning/suggest, pure) → the response, with the suggested plan predicted exactly as
 * POST /predict would. Nothing here saves anything.
 */
import "server-only";
import { AppError, type ErrorDetail } from "@/server/errors";
import {
  type AllocationChannel,
  type AllocationState,
  amountToCents,
  centsFormatter,
  centsToAmount,
  createAllocationState,
  FIXED_TOTAL_TOLERANCE_CENTS,
  type MoneyLocale,
} from "@/server/planning/allocation";
import { suggestAllocation } from "@/server/planning/suggest";
import type { CachedFit } from "@/server/predict/fit-cache";
import { planPeriods, type ScenarioPlan } from "@/server/predict/scenario-outcome";
import { assertPlanFits, predictPlan } from "@/server/predict/service";
import type { SuggestResponse, suggestRequestSchema } from "./schema";
import type { z } from "zod";

type Body = z.output<typeof suggestRequestSchema>;

function invalid(details: ErrorDetail[]): never {
  throw new AppError("invalid:suggestion", details[0]?.message ?? "The plan cannot be improved under these rules.", { details });
}

/** The allocation state the optimiser starts from (422 for names or bounds that do not fit). */
export function allocationStateOf(fit: CachedFit, body: Body, money: MoneyLocale): AllocationState {
  const shape = fit.shape;
  const names = new Set(shape.channels.map((channel) => channel.name));
  const known = [...names].join(", ");
  const format = centsFormatter(money);
  const details: ErrorDetail[] = [];
  body.locks.forEach((name, index) => {
    if (!names.has(name)) details.push({ path: `locks.${index}`, message: `This fit has no channel "${name}" to lock (its channels: ${known}).` });
  });
  for (const [field, values] of [["floors", body.floors], ["ceilings", body.ceilings]] as const) {
    for (const name of Object.keys(values)) {
      if (!names.has(name)) details.push({ path: `${field}.${name}`, message: `This fit has no channel "${name}" (its channels: ${known}).` });
    }
  }
  const channels: AllocationChannel[] = shape.channels.map((channel) => {
    const floorCents = body.floors[channel.name] === undefined ? undefined : amountToCents(body.floors[channel.name]);
    const ceilingCents = body.ceilings[channel.name] === undefined ? undefined : amountToCents(body.ceilings[channel.name]);
    if (floorCents !== undefined && ceilingCents !== undefined && floorCents > ceilingCents) {
      details.push({
        path: `floors.${channel.name}`,
        message: `${channel.label}'s floor (${format(floorCents)}) is above its ceiling (${format(ceilingCents)}).`,
      });
    }
    return {
      name: channel.name,
      label: channel.label,
      amountCents: amountToCents(body.allocation[channel.name] ?? 0),
      locked: body.locks.includes(channel.name),
      ...(floorCents === undefined ? {} : { floorCents }),
      ...(ceilingCents === undefined ? {} : { ceilingCents }),
      observed: { minPerPeriodCents: amountToCents(channel.observed.minimum), maxPerPeriodCents: amountToCents(channel.observed.maximum) },
    };
  });
  const sum = channels.reduce((total, channel) => total + channel.amountCents, 0);
  if (body.mode === "fixed" && body.total !== undefined && Math.abs(amountToCents(body.total) - sum) > FIXED_TOTAL_TOLERANCE_CENTS) {
    details.push({
      path: "total",
      message: `The channels add up to ${format(sum)}, but the fixed total is ${format(amountToCents(body.total))}. Send amounts that add up to the total, or use mode "growing" with a ceiling.`,
    });
  }
  if (body.mode === "growing" && body.ceiling !== undefined && amountToCents(body.ceiling) < sum) {
    details.push({ path: "ceiling", message: `The ceiling (${format(amountToCents(body.ceiling))}) is below what the plan already spends (${format(sum)}).` });
  }
  if (details.length > 0) invalid(details);
  return createAllocationState({
    mode: body.mode,
    horizonPeriods: body.horizon,
    channels,
    ...(body.mode === "growing" && body.ceiling !== undefined ? { ceilingCents: amountToCents(body.ceiling) } : {}),
  });
}

/** The optimiser's paths in the API's words: channels.x → allocation.x, controlPeriods → controls. */
function apiPath(path: string, mode: Body["mode"]): string {
  if (path.startsWith("channels.")) return `allocation.${path.slice("channels.".length)}`;
  if (path.startsWith("controlPeriods")) return "controls";
  if (path === "total" && mode === "growing") return "ceiling";
  return path;
}

/**
 * The suggestion for a plan on an approved fit, or 422 when the plan or the rules leave no plan.
 * Cost: the optimiser (microseconds for a linear fit, tens of milliseconds for the local method)
 * plus one prediction.
 */
export function suggestForPlan(fit: CachedFit, body: Body, money: MoneyLocale): SuggestResponse {
  const plan: ScenarioPlan = { allocation: body.allocation, controls: body.controls, horizon: body.horizon };
  assertPlanFits(fit, plan);
  const state = allocationStateOf(fit, body, money);
  const result = suggestAllocation({
    record: fit.record,
    allocation: state,
    controlPeriods: planPeriods(fit.shape, plan),
    keepInsideObservedRange: body.keepInsideObservedRange,
    keepInsideHull: body.keepInsideHull,
    confidenceLevel: body.level,
    format: centsFormatter(money),
    periodNoun: fit.shape.periodNoun,
  });
  if (!result.ok) invalid(result.problems.map((problem) => ({ path: apiPath(problem.path, body.mode), message: problem.message })));
  const suggestion = result.suggestion;
  const allocation = Object.fromEntries(Object.entries(suggestion.allocation).map(([name, cents]) => [name, centsToAmount(cents)]));
  const prediction = predictPlan(fit, { ...plan, allocation }, { level: suggestion.confidenceLevel, money, compareTo: plan });
  const starts = suggestion.method === "local" ? Number(/best of (\d+) local searches/.exec(suggestion.notes.join(" "))?.[1] ?? NaN) : NaN;
  return {
    fitId: fit.id,
    allocation,
    total: centsToAmount(suggestion.totalCents),
    channels: suggestion.channels.map((channel) => ({
      name: channel.name,
      label: channel.label,
      amount: centsToAmount(channel.amountCents),
      current: centsToAmount(channel.currentCents),
      change: centsToAmount(channel.changeCents),
      locked: channel.locked,
    })),
    prediction,
    current: suggestion.current,
    gain: { mean: suggestion.gain.mean, confidence: suggestion.gain.confidence },
    level: suggestion.confidenceLevel,
    binding: suggestion.binding,
    method: suggestion.method,
    starts: Number.isFinite(starts) ? starts : null,
    solver: suggestion.solver,
    converged: suggestion.converged,
    hull: suggestion.hull,
    notes: suggestion.notes,
    caution: suggestion.caution,
  };
}


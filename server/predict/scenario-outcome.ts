/**
 * A scenario's predicted outcome from a fit record: horizon total and an average period with
 * confidence and prediction intervals, the difference from another plan, each term's contribution,
 * and extrapolation warnings in plain words. Isomorphic (no `server-only`): the predict route and
 * the browser's instant preview run exactly this. See README.md.
 *
 * Units. Planners enter spend per horizon (e.g. €130,000 over 13 weeks); the model was fitted on
 * spend per period. Each channel's horizon amount is spread evenly: per period = amount ÷ H
 * (`horizonToPerPeriod`). Controls are given per horizon too: a `count` control as the number of
 * periods it is on (4 promotion weeks of 13), a `level` control as its value in every period.
 */
import { amountToCents, formatCents, horizonToPerPeriod, type MoneyLocale } from "@/server/planning/allocation";
import {
  type ExtrapolationReport,
  type FitRecord,
  type NamedPoint,
  type Plan,
  evaluateScenarioPoint,
  predictDifference,
  predictTotal,
  studentTCriticalValue,
} from "@/server/stats";
import { type PlanShape, periodsWord } from "./plan-shape";

/** A plan as the API takes it: amounts per horizon in the workspace currency. */
export interface ScenarioPlan {
  allocation: Readonly<Record<string, number>>;
  controls: Readonly<Record<string, number>>;
  horizon: number;
}

/** Mean with its confidence interval (expected value) and prediction interval (realised value). */
export interface OutcomeInterval {
  mean: number;
  confidence: [number, number];
  prediction: [number, number];
}

export type ScenarioWarning =
  | {
      kind: "outside-range";
      /** The column (channel or control). */
      column: string;
      label: string;
      role: "channel" | "control";
      direction: "above" | "below";
      /** Per period (the model's unit). */
      value: number;
      minimum: number;
      maximum: number;
      /** How far beyond the nearest bound, per period and over the horizon. */
      beyondPerPeriod: number;
      beyondPerHorizon: number;
      message: string;
    }
  | {
      kind: "hidden-extrapolation";
      leverage: number;
      maxTrainingLeverage: number;
      /** Terms (e.g. an interaction) outside their observed range while their columns are inside. */
      terms: string[];
      message: string;
    };

export interface Contribution {
  /** Design term name, "(Intercept)" for the baseline. */
  term: string;
  label: string;
  /** Coefficient × the term's value summed over the horizon (outcome units). */
  value: number;
  /** The same for an average period. */
  perPeriod: number;
}

export interface ScenarioOutcome {
  checksum: string;
  level: number;
  horizon: number;
  periodNoun: string;
  perPeriod: OutcomeInterval;
  horizonTotal: OutcomeInterval;
  /** Largest leverage h₀ among the plan's distinct periods. */
  leverage: number;
  maxTrainingLeverage: number;
  warnings: ScenarioWarning[];
  contributions: Contribution[];
  /** This plan's expected total minus the comparison plan's, with its confidence interval. */
  difference?: { mean: number; confidence: [number, number]; baselineTotal: number };
}

export interface PlanProblem {
  path: string;
  message: string;
}

/** Largest horizon a plan may cover (ten years of weeks). */
export const maxHorizonPeriods = 520;

/**
 * Everything wrong with a plan against a fit's shape (empty when usable): unknown or missing
 * channels and controls, negative or non-finite amounts, a count control that is not a whole
 * number of periods within the horizon, a horizon that is not a whole number of periods.
 */
export function checkScenarioPlan(shape: PlanShape, plan: ScenarioPlan): PlanProblem[] {
  const problems: PlanProblem[] = [];
  const channelNames = new Set(shape.channels.map((channel) => channel.name));
  const controlNames = new Set(shape.controls.map((control) => control.name));
  const known = (names: Set<string>) => [...names].join(", ") || "none";
  if (!Number.isInteger(plan.horizon) || plan.horizon < 1 || plan.horizon > maxHorizonPeriods) {
    problems.push({ path: "horizon", message: `The horizon must be a whole number of ${shape.periodNoun}s from 1 to ${maxHorizonPeriods}.` });
  }
  for (const [name, amount] of Object.entries(plan.allocation)) {
    if (!channelNames.has(name)) {
      problems.push({ path: `allocation.${name}`, message: `This fit has no channel "${name}" (its channels: ${known(channelNames)}).` });
    } else if (typeof amount !== "number" || !Number.isFinite(amount)) {
      problems.push({ path: `allocation.${name}`, message: `The amount for "${name}" must be a number.` });
    } else if (amount < 0) {
      problems.push({ path: `allocation.${name}`, message: `Spend can't be negative ("${name}" is ${amount}).` });
    }
  }
  for (const channel of shape.channels) {
    if (!Object.hasOwn(plan.allocation, channel.name)) {
      problems.push({ path: `allocation.${channel.name}`, message: `Give an amount for ${channel.label} ("${channel.name}"), 0 if it gets nothing.` });
    }
  }
  for (const [name, value] of Object.entries(plan.controls)) {
    const control = shape.controls.find((candidate) => candidate.name === name);
    if (!control) {
      problems.push({ path: `controls.${name}`, message: `This fit has no control "${name}" (its controls: ${known(controlNames)}).` });
    } else if (typeof value !== "number" || !Number.isFinite(value)) {
      problems.push({ path: `controls.${name}`, message: `The value of "${name}" must be a number.` });
    } else if (control.kind === "count" && (!Number.isInteger(value) || value < 0 || (Number.isInteger(plan.horizon) && value > plan.horizon))) {
      problems.push({
        path: `controls.${name}`,
        message: `${control.label} counts ${shape.periodNoun}s: a whole number from 0 to ${plan.horizon} (got ${value}).`,
      });
    }
  }
  for (const control of shape.controls) {
    if (!Object.hasOwn(plan.controls, control.name)) {
      problems.push({
        path: `controls.${control.name}`,
        message:
          control.kind === "count"
            ? `Say in how many ${shape.periodNoun}s of the horizon ${control.label} is on ("${control.name}").`
            : `Give the value of ${control.label} per ${shape.periodNoun} ("${control.name}").`,
      });
    }
  }
  return problems;
}

/**
 * The plan's periods as scenario points: spend per period = horizon amount ÷ H in every period;
 * a count control on in the first k periods, off in the rest; a level control constant.
 * Returns the distinct points with how many periods each covers.
 */
export function planPeriods(shape: PlanShape, plan: ScenarioPlan): { point: NamedPoint; periods: number }[] {
  const base: Record<string, number> = {};
  for (const channel of shape.channels) base[channel.name] = horizonToPerPeriod(plan.allocation[channel.name] ?? 0, plan.horizon);
  for (const control of shape.controls) if (control.kind === "level") base[control.name] = plan.controls[control.name] ?? 0;
  const counts = shape.controls.filter((control) => control.kind === "count");
  if (counts.length === 0) return [{ point: base, periods: plan.horizon }];
  // Periods t = 0 … H−1; a count control with value k is on where t < k. Between two consecutive
  // thresholds every period is the same point (and two segments always differ in some control).
  const thresholds = [...new Set([0, plan.horizon, ...counts.map((control) => Math.min(plan.horizon, plan.controls[control.name] ?? 0))])].sort((a, b) => a - b);
  const groups: { point: NamedPoint; periods: number }[] = [];
  for (let index = 0; index + 1 < thresholds.length; index++) {
    const start = thresholds[index];
    const point: Record<string, number> = { ...base };
    for (const control of counts) point[control.name] = start < (plan.controls[control.name] ?? 0) ? 1 : 0;
    groups.push({ point, periods: thresholds[index + 1] - start });
  }
  return groups;
}

/** The engine's plan: the repeated point, or one point per period (H points, a few distinct). */
function enginePlan(periods: { point: NamedPoint; periods: number }[]): Plan {
  if (periods.length === 1) return { point: periods[0].point, periods: periods[0].periods };
  const points: NamedPoint[] = [];
  for (const group of periods) for (let index = 0; index < group.periods; index++) points.push(group.point);
  return { points };
}

/** Student t critical values by level and degrees of freedom (a quantile costs hundreds of microseconds). */
const criticalValues = new Map<string, number>();

function criticalValue(level: number, degreesOfFreedom: number): number {
  const key = `${level}|${degreesOfFreedom}`;
  let value = criticalValues.get(key);
  if (value === undefined) {
    value = studentTCriticalValue(level, degreesOfFreedom);
    if (criticalValues.size > 1_000) criticalValues.clear();
    criticalValues.set(key, value);
  }
  return value;
}

function wholeMoney(amount: number, money: MoneyLocale): string {
  return formatCents(amountToCents(Math.round(amount)), money);
}

function percentOf(part: number, whole: number): string {
  if (!(whole > 0)) return "";
  const value = Math.round((part / whole) * 100);
  return value < 1 ? "less than 1% " : `${value}% `;
}

function rangeWarnings(shape: PlanShape, plan: ScenarioPlan, reports: ExtrapolationReport[], money: MoneyLocale): ScenarioWarning[] {
  const warnings: ScenarioWarning[] = [];
  const seen = new Set<string>();
  const period = shape.periodNoun;
  for (const report of reports) {
    for (const excursion of report.columns) {
      if (seen.has(excursion.name)) continue;
      seen.add(excursion.name);
      const channel = shape.channels.find((candidate) => candidate.name === excursion.name);
      const control = shape.controls.find((candidate) => candidate.name === excursion.name);
      const direction = excursion.value > excursion.maximum ? "above" : "below";
      const bound = direction === "above" ? excursion.maximum : excursion.minimum;
      const beyondPerHorizon = excursion.distance * plan.horizon;
      let message: string;
      if (channel) {
        const most = direction === "above" ? "the most it ever had" : "the least it ever had";
        message =
          `${channel.label} at ${wholeMoney(excursion.value * plan.horizon, money)} over ${periodsWord(plan.horizon, period)} ` +
          `(${wholeMoney(excursion.value, money)} per ${period}) is ${excursion.value === 0 ? "" : percentOf(excursion.distance, bound)}${direction} ${most} ` +
          `(${wholeMoney(bound, money)} per ${period}): ${wholeMoney(excursion.distance, money)} per ${period}, ` +
          `${wholeMoney(beyondPerHorizon, money)} over the horizon.`;
      } else {
        const label = control?.label ?? excursion.name;
        message = `${label} at ${formatNumber(excursion.value)} per ${period} is ${direction} anything in the history (${formatNumber(excursion.minimum)} to ${formatNumber(excursion.maximum)}).`;
      }
      warnings.push({
        kind: "outside-range",
        column: excursion.name,
        label: channel?.label ?? control?.label ?? excursion.name,
        role: channel ? "channel" : "control",
        direction,
        value: excursion.value,
        minimum: excursion.minimum,
        maximum: excursion.maximum,
        beyondPerPeriod: excursion.distance,
        beyondPerHorizon,
        message,
      });
    }
  }
  return warnings;
}

const plainNumber = new Intl.NumberFormat("en", { maximumSignificantDigits: 4 });

function formatNumber(value: number): string {
  return plainNumber.format(value);
}

function combinationWarning(shape: PlanShape, reports: ExtrapolationReport[]): ScenarioWarning | null {
  if (!reports.some((report) => report.hiddenExtrapolation || report.terms.length > 0)) return null;
  const hidden = reports.filter((report) => report.hiddenExtrapolation);
  // A term out of range while each of its columns is inside (an interaction, a power) is a
  // combination the history never had, too.
  const columnsOut = new Set(reports.flatMap((report) => report.columns.map((excursion) => excursion.name)));
  const interceptAndColumns = new Set([...shape.channels.map((c) => c.name), ...shape.controls.map((c) => c.name)]);
  const terms = [
    ...new Set(
      reports.flatMap((report) =>
        report.terms
          .map((excursion) => excursion.name)
          .filter((name) => !interceptAndColumns.has(name) && ![...columnsOut].some((column) => name.includes(column))),
      ),
    ),
  ];
  if (hidden.length === 0 && terms.length === 0) return null;
  const leverage = Math.max(...reports.map((report) => report.leverage));
  const maxTrainingLeverage = reports[0]?.maxTrainingLeverage ?? 0;
  const parts = [`This mix of spend was never seen together in the history`];
  if (hidden.length > 0) {
    parts.push(` (leverage ${leverage.toPrecision(3)}, above the largest of any past ${shape.periodNoun}, ${maxTrainingLeverage.toPrecision(3)})`);
  }
  if (terms.length > 0) parts.push(`${hidden.length > 0 ? ";" : ":"} ${terms.join(", ")} ${terms.length === 1 ? "is" : "are"} outside the observed range`);
  parts.push(".");
  return { kind: "hidden-extrapolation", leverage, maxTrainingLeverage, terms, message: parts.join("") };
}

/** Display labels of the record's terms, per shape (computed once). */
const termLabelCache = new WeakMap<PlanShape, Map<string, string>>();

function termLabel(shape: PlanShape, term: string): string {
  let labels = termLabelCache.get(shape);
  if (!labels) termLabelCache.set(shape, (labels = new Map()));
  let label = labels.get(term);
  if (label === undefined) {
    const columns = [...shape.channels, ...shape.controls];
    if (term === "(Intercept)") label = "Baseline (intercept)";
    else label = columns.find((candidate) => candidate.name === term)?.label ?? term.replace(/[a-z0-9_]+/gi, (name) => columns.find((c) => c.name === name)?.label ?? name);
    labels.set(term, label);
  }
  return label;
}

function contributions(record: FitRecord, shape: PlanShape, periods: { point: NamedPoint; periods: number }[], horizon: number): Contribution[] {
  const totals = new Float64Array(record.termNames.length);
  for (const group of periods) {
    const row = evaluateScenarioPoint(record.specification, group.point);
    for (let index = 0; index < row.length; index++) totals[index] += row[index] * group.periods;
  }
  return record.estimableTerms.map((term, position) => {
    const value = record.coefficients[position] * totals[record.termNames.indexOf(term)];
    return { term, label: termLabel(shape, term), value, perPeriod: value / horizon };
  });
}

/**
 * Predicts a plan's outcome.
 *
 * Horizon total: `predictTotal` over the H periods — variance aᵀVa for the expected total and
 * H·s² + aᵀVa for the realised total (a = sum of the periods' design rows), not one period's
 * interval times H. Average period: the total ÷ H, so its confidence interval is the total's ÷ H
 * (variance aᵀVa / H²), and its prediction interval is for one new period at that average plan,
 * s² + aᵀVa / H². Both use Student's t with the fit's residual degrees of freedom.
 *
 * @throws if the plan does not fit the shape (call `checkScenarioPlan` first) or the level is outside (0, 1)
 * Cost: O(H·p²) — microseconds for a quarter of weekly data.
 */
export function scenarioOutcome(
  record: FitRecord,
  shape: PlanShape,
  plan: ScenarioPlan,
  options: { level?: number; money: MoneyLocale; compareTo?: ScenarioPlan },
): ScenarioOutcome {
  const level = options.level ?? record.confidenceLevel;
  const periods = planPeriods(shape, plan);
  const total = predictTotal(record, enginePlan(periods), { confidenceLevel: level });
  const horizon = plan.horizon;
  const critical = criticalValue(level, record.residualDegreesOfFreedom);
  const perPeriodMean = total.total / horizon;
  const perPeriodStandardError = total.standardErrorOfTotal / horizon;
  const perPeriodPredictionError = Math.sqrt(record.residualStandardError ** 2 + perPeriodStandardError ** 2);
  const reports = total.extrapolation;
  const warnings = rangeWarnings(shape, plan, reports, options.money);
  const combination = combinationWarning(shape, reports);
  if (combination) warnings.push(combination);
  const outcome: ScenarioOutcome = {
    checksum: record.checksum,
    level,
    horizon,
    periodNoun: shape.periodNoun,
    perPeriod: {
      mean: perPeriodMean,
      confidence: [perPeriodMean - critical * perPeriodStandardError, perPeriodMean + critical * perPeriodStandardError],
      prediction: [perPeriodMean - critical * perPeriodPredictionError, perPeriodMean + critical * perPeriodPredictionError],
    },
    horizonTotal: {
      mean: total.total,
      confidence: [total.confidenceInterval.lower, total.confidenceInterval.upper],
      prediction: [total.predictionInterval.lower, total.predictionInterval.upper],
    },
    leverage: Math.max(...reports.map((report) => report.leverage)),
    maxTrainingLeverage: record.maxTrainingLeverage,
    warnings,
    contributions: contributions(record, shape, periods, horizon),
  };
  if (options.compareTo) {
    const difference = predictDifference(record, enginePlan(periods), enginePlan(planPeriods(shape, options.compareTo)), { confidenceLevel: level });
    outcome.difference = {
      mean: difference.difference,
      confidence: [difference.confidenceInterval.lower, difference.confidenceInterval.upper],
      baselineTotal: difference.totalB,
    };
  }
  return outcome;
}

export { channelWarningSentences } from "./channel-warnings";

/**
 * Expected total of plan A minus plan B with its confidence interval (from the fit's covariance:
 * both totals share the same estimates, so the difference is not the gap between two intervals).
 */
export function planDifference(
  record: FitRecord,
  shape: PlanShape,
  planA: ScenarioPlan,
  planB: ScenarioPlan,
  level = record.confidenceLevel,
): { mean: number; confidence: [number, number]; totalA: number; totalB: number } {
  const difference = predictDifference(record, enginePlan(planPeriods(shape, planA)), enginePlan(planPeriods(shape, planB)), { confidenceLevel: level });
  return {
    mean: difference.difference,
    confidence: [difference.confidenceInterval.lower, difference.confidenceInterval.upper],
    totalA: difference.totalA,
    totalB: difference.totalB,
  };
}

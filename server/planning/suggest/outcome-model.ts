/**
 * The predicted horizon outcome and the plan's leverage as functions of the channels' horizon
 * amounts, with exact gradients and Hessians — what the optimiser climbs and the hull it stays in.
 *
 * With amounts A (cents per horizon) and per-period spend s = A / (100·H), group g of m_g periods
 * has design row x_g(s) and the expected horizon total is F(A) = Σ_g m_g·βᵀx_g(s) (the engine's
 * `predictTotal` mean). Its derivatives follow from the terms' (term-derivatives.ts), each ∂/∂A
 * being ∂/∂s ÷ (100·H). Leverage of group g is h_g = x_gᵀ(XᵀX)⁻¹x_g over the estimable columns,
 * with (XᵀX)⁻¹ = R⁻¹R⁻ᵀ from the fit record.
 */
import { type FitRecord, predictorColumns } from "@/server/stats";
import type { PeriodGroup } from "./period-groups";
import { type CompiledTerm, compileTerm, termFirstDerivative, termSecondDerivative, termValue } from "./term-derivatives";

export interface OutcomeModel {
  record: FitRecord;
  /** The variables: every channel of the allocation, in its order (locked ones included). */
  channelNames: readonly string[];
  groups: readonly PeriodGroup[];
  horizonPeriods: number;
  /** β per design column (termNames order); 0 for aliased columns, which the engine ignores. */
  coefficients: Float64Array;
  /** Position of each design column among the estimable ones, or −1 when aliased. */
  estimablePosition: Int32Array;
  /** (XᵀX)⁻¹ over the estimable columns, rank × rank, row-major. */
  inverseGram: Float64Array;
  rank: number;
  /** Cents per horizon that make one currency unit per period: 100·H. */
  centsPerUnit: number;
  /** Per design column its compiled term (null for the intercept), over columns channels-first. */
  terms: (CompiledTerm | null)[];
  /** Per design column, the channel indices its term reads (empty for the intercept and controls). */
  termChannels: number[][];
  /** Per group, its column values: channels first (written per evaluation), then the controls. */
  groupValues: Float64Array[];
}

/** Value with gradient and Hessian (n × n row-major) in the amounts. */
export interface Derivatives {
  value: number;
  gradient: Float64Array;
  hessian: Float64Array;
}

/**
 * Prepares the model; the caller has checked the groups (period-groups.ts).
 * Cost: O(rank³) for (XᵀX)⁻¹ — microseconds.
 */
export function createOutcomeModel(
  record: FitRecord,
  channelNames: readonly string[],
  groups: readonly PeriodGroup[],
  horizonPeriods: number,
): OutcomeModel {
  const rank = record.estimableTerms.length;
  const estimablePosition = Int32Array.from(record.termNames, (name) => record.estimableTerms.indexOf(name));
  const coefficients = Float64Array.from(estimablePosition, (position) => (position < 0 ? 0 : record.coefficients[position]));
  const inverseGram = new Float64Array(rank * rank);
  // Row i of record.inverseUpper holds R⁻¹[i][i … rank−1]; (R⁻¹R⁻ᵀ)[a][b] = Σ_{k ≥ max(a,b)} R⁻¹[a][k]·R⁻¹[b][k].
  for (let a = 0; a < rank; a++) {
    for (let b = a; b < rank; b++) {
      let sum = 0;
      for (let k = b; k < rank; k++) sum += record.inverseUpper[a][k - a] * record.inverseUpper[b][k - b];
      inverseGram[a * rank + b] = sum;
      inverseGram[b * rank + a] = sum;
    }
  }
  const n = channelNames.length;
  const columns = [...channelNames, ...predictorColumns(record.specification).filter((column) => !channelNames.includes(column))];
  const indexOf = (column: string) => columns.indexOf(column);
  const offset = record.specification.intercept ? 1 : 0;
  const terms = record.termNames.map((_, column) => (column < offset ? null : compileTerm(record.specification.terms[column - offset], indexOf)));
  const termChannels = terms.map((term) =>
    term === null ? [] : [...new Set([term.first, term.second].filter((index) => index >= 0 && index < n))],
  );
  const groupValues = groups.map((group) => Float64Array.from(columns, (column, index) => (index < n ? 0 : group.point[column])));
  return { record, channelNames, groups, horizonPeriods, coefficients, estimablePosition, inverseGram, rank, centsPerUnit: 100 * horizonPeriods, terms, termChannels, groupValues };
}

/** Writes the amounts' per-period spend into group g's column values and returns them. */
function valuesAt(model: OutcomeModel, group: number, amounts: ArrayLike<number>): Float64Array {
  const values = model.groupValues[group];
  // perPeriodSpend's arithmetic, inlined: this runs thousands of times per suggestion.
  for (let j = 0; j < model.channelNames.length; j++) values[j] = amounts[j] / 100 / model.horizonPeriods;
  return values;
}

function columnValue(model: OutcomeModel, column: number, values: Float64Array): number {
  const term = model.terms[column];
  return term === null ? 1 : termValue(term, values);
}

/** Expected horizon total F(A). Cost: O(groups × p). */
export function horizonOutcome(model: OutcomeModel, amounts: ArrayLike<number>): number {
  let total = 0;
  for (let group = 0; group < model.groups.length; group++) {
    const values = valuesAt(model, group, amounts);
    let mean = 0;
    for (let column = 0; column < model.terms.length; column++) {
      if (model.coefficients[column] !== 0) mean += model.coefficients[column] * columnValue(model, column, values);
    }
    total += model.groups[group].periods * mean;
  }
  return total;
}

/** F(A) with its gradient (outcome per cent) and Hessian. Cost: O(groups × p × (terms' channels)²). */
export function outcomeDerivatives(model: OutcomeModel, amounts: ArrayLike<number>): Derivatives {
  const n = model.channelNames.length;
  const perCent = 1 / model.centsPerUnit;
  const gradient = new Float64Array(n);
  const hessian = new Float64Array(n * n);
  let value = 0;
  for (let group = 0; group < model.groups.length; group++) {
    const values = valuesAt(model, group, amounts);
    for (let column = 0; column < model.terms.length; column++) {
      const weight = model.groups[group].periods * model.coefficients[column];
      if (weight === 0) continue;
      value += weight * columnValue(model, column, values);
      const term = model.terms[column];
      if (term === null) continue;
      for (const j of model.termChannels[column]) {
        gradient[j] += weight * termFirstDerivative(term, values, j) * perCent;
        for (const k of model.termChannels[column]) hessian[j * n + k] += weight * termSecondDerivative(term, values, j, k) * perCent * perCent;
      }
    }
  }
  return { value, gradient, hessian };
}

/**
 * ∂F/∂A_j with channel j at `amountCents` and the others at `amounts`. For a separable outcome it
 * depends on A_j alone (and on channels that do not move). Cost: O(groups × p).
 */
export function channelMarginal(model: OutcomeModel, channel: number, amountCents: number, amounts: ArrayLike<number>): number {
  let total = 0;
  for (let group = 0; group < model.groups.length; group++) {
    const values = valuesAt(model, group, amounts);
    values[channel] = amountCents / 100 / model.horizonPeriods;
    let sum = 0;
    for (let column = 0; column < model.terms.length; column++) {
      const term = model.terms[column];
      if (term === null || model.coefficients[column] === 0 || !model.termChannels[column].includes(channel)) continue;
      sum += model.coefficients[column] * termFirstDerivative(term, values, channel);
    }
    total += model.groups[group].periods * sum;
  }
  return total / model.centsPerUnit;
}

/** Estimable part of group g's design row at the amounts. */
function estimableRow(model: OutcomeModel, values: Float64Array): Float64Array {
  const row = new Float64Array(model.rank);
  for (let column = 0; column < model.terms.length; column++) {
    const position = model.estimablePosition[column];
    if (position >= 0) row[position] = columnValue(model, column, values);
  }
  return row;
}

function quadratic(model: OutcomeModel, row: Float64Array): { value: number; product: Float64Array } {
  const rank = model.rank;
  const product = new Float64Array(rank);
  let value = 0;
  for (let a = 0; a < rank; a++) {
    let sum = 0;
    for (let b = 0; b < rank; b++) sum += model.inverseGram[a * rank + b] * row[b];
    product[a] = sum;
    value += row[a] * sum;
  }
  return { value, product };
}

/** Leverage of group g's period, no derivatives (for line searches). Cost: O(p²). */
export function leverageValue(model: OutcomeModel, group: number, amounts: ArrayLike<number>): number {
  return quadratic(model, estimableRow(model, valuesAt(model, group, amounts))).value;
}

/** Largest leverage over the groups (the plan's leverage, as the scenario screen reports it). */
export function planLeverage(model: OutcomeModel, amounts: ArrayLike<number>): number {
  let largest = 0;
  for (let group = 0; group < model.groups.length; group++) largest = Math.max(largest, leverageValue(model, group, amounts));
  return largest;
}

/**
 * Leverage h_g with gradient 2Jᵀu and Hessian 2JᵀGJ + 2Σ_t u_t∇²x_t, where u = (XᵀX)⁻¹x_g,
 * G = (XᵀX)⁻¹ and J = ∂x_g/∂A. Cost: O(p² n + p n²).
 */
export function leverageDerivatives(model: OutcomeModel, group: number, amounts: ArrayLike<number>): Derivatives {
  const n = model.channelNames.length;
  const rank = model.rank;
  const perCent = 1 / model.centsPerUnit;
  const values = valuesAt(model, group, amounts);
  const { value, product } = quadratic(model, estimableRow(model, values));
  // Jacobian rows of the estimable columns (rank × n) and the curvature term Σ_t u_t ∇²x_t.
  const jacobian = new Float64Array(rank * n);
  const hessian = new Float64Array(n * n);
  for (let column = 0; column < model.terms.length; column++) {
    const position = model.estimablePosition[column];
    const term = model.terms[column];
    if (position < 0 || term === null) continue;
    for (const j of model.termChannels[column]) {
      jacobian[position * n + j] = termFirstDerivative(term, values, j) * perCent;
      for (const k of model.termChannels[column]) hessian[j * n + k] += 2 * product[position] * termSecondDerivative(term, values, j, k) * perCent * perCent;
    }
  }
  const gradient = new Float64Array(n);
  for (let a = 0; a < rank; a++) for (let j = 0; j < n; j++) gradient[j] += 2 * product[a] * jacobian[a * n + j];
  for (let a = 0; a < rank; a++) {
    for (let b = 0; b < rank; b++) {
      const g = 2 * model.inverseGram[a * rank + b];
      if (g === 0) continue;
      for (let j = 0; j < n; j++) {
        const left = jacobian[a * n + j];
        if (left === 0) continue;
        for (let k = 0; k < n; k++) hessian[j * n + k] += g * left * jacobian[b * n + k];
      }
    }
  }
  return { value, gradient, hessian };
}

/**
 * ∂a/∂A_j over the estimable columns, where a = Σ_g m_g x_g is the plan's summed design row: the
 * marginal return of channel j is ∂a/∂A_jᵀβ and its variance ∂a/∂A_jᵀ V ∂a/∂A_j.
 * Cost: O(groups × p).
 */
export function designSumGradient(model: OutcomeModel, amounts: ArrayLike<number>, channel: number): Float64Array {
  const gradient = new Float64Array(model.rank);
  for (let group = 0; group < model.groups.length; group++) {
    const values = valuesAt(model, group, amounts);
    for (let column = 0; column < model.terms.length; column++) {
      const position = model.estimablePosition[column];
      const term = model.terms[column];
      if (position < 0 || term === null || !model.termChannels[column].includes(channel)) continue;
      gradient[position] += (model.groups[group].periods * termFirstDerivative(term, values, channel)) / model.centsPerUnit;
    }
  }
  return gradient;
}

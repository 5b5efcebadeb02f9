/**
 * The marginal return of a channel at a plan: how much the expected horizon outcome rises per one
 * more currency unit of that channel's horizon spend, with its confidence interval.
 *
 * The expected total is aᵀβ with a = Σ_g m_g x_g the plan's summed design row, so its derivative
 * in the channel's amount is gᵀβ with g = ∂a/∂A — a fixed linear combination of the coefficients.
 * Its variance is therefore gᵀVg, V the fit's covariance of β (classical, HC3 or Newey–West, as
 * the fit chose), and the interval gᵀβ ± t·√(gᵀVg) with Student's t on the fit's residual degrees
 * of freedom (the delta method is exact here: the derivative is linear in β).
 */
import type { AllocationState } from "@/server/planning/allocation";
import type { PeriodGroup } from "@/server/planning/suggest";
import { createOutcomeModel, designSumGradient } from "@/server/planning/suggest/outcome-model";
import { periodGroupProblems, wholeHorizon } from "@/server/planning/suggest/period-groups";
import { type FitRecord, studentTCriticalValue } from "@/server/stats";
import type { MarginalReturn } from "./types";

export const marginalReturnCaution =
  "An association in past spend, not a measured effect: the fit does not show that moving money causes this return.";

export interface MarginalReturnInput {
  record: FitRecord;
  allocation: AllocationState;
  channel: string;
  controlPeriods?: readonly PeriodGroup[];
  confidenceLevel?: number;
  units?: { outcome: string; spend: string };
}

/**
 * @example marginalReturn({ record, allocation, channel: "search" }).value // => 1.8 (outcome per currency unit)
 * @throws if the channel is not in the allocation, a control value is missing, or the level is outside (0, 1)
 * Cost: O(groups × p + p²).
 */
export function marginalReturn(input: MarginalReturnInput): MarginalReturn {
  const { record, allocation } = input;
  const names = allocation.channels.map((channel) => channel.name);
  const channel = names.indexOf(input.channel);
  if (channel < 0) throw new Error(`marginalReturn requires a channel of the allocation (got '${input.channel}')`);
  const level = input.confidenceLevel ?? record.confidenceLevel;
  if (!(level > 0 && level < 1)) throw new Error(`marginalReturn requires a confidence level strictly between 0 and 1 (got ${level})`);
  const amounts = allocation.channels.map((entry) => entry.amountCents);
  const groups = input.controlPeriods ?? wholeHorizon(allocation.horizonPeriods);
  const problem = periodGroupProblems(record, names, groups, allocation.horizonPeriods)[0];
  if (problem) throw new Error(`marginalReturn requires usable control periods: ${problem.message}`);
  const model = createOutcomeModel(record, names, groups, allocation.horizonPeriods);
  // Per cent → per currency unit.
  const gradient = designSumGradient(model, amounts, channel).map((value) => value * 100);
  const rank = gradient.length;
  let value = 0;
  let variance = 0;
  for (let a = 0; a < rank; a++) {
    value += gradient[a] * record.coefficients[a];
    let sum = 0;
    for (let b = 0; b < rank; b++) sum += record.covariance[a][b] * gradient[b];
    variance += gradient[a] * sum;
  }
  const standardError = Math.sqrt(Math.max(variance, 0));
  const halfWidth = studentTCriticalValue(level, record.residualDegreesOfFreedom) * standardError;
  const units = input.units ?? { outcome: "outcome", spend: "currency unit" };
  return {
    channel: input.channel,
    amountCents: amounts[channel],
    value,
    standardError,
    confidence: [value - halfWidth, value + halfWidth],
    confidenceLevel: level,
    unit: `${units.outcome} per ${units.spend} of spend`,
    caution: marginalReturnCaution,
  };
}

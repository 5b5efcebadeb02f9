/** Input and output of the response curves (`responseCurve`) and marginal returns. */
import type { AllocationState } from "@/server/planning/allocation";
import type { PeriodGroup } from "@/server/planning/suggest";
import type { FitRecord } from "@/server/stats";

export interface ResponseCurveInput {
  record: FitRecord;
  /** The plan the other channels are held at (amounts per horizon, horizon length). */
  allocation: AllocationState;
  /** Control values over the horizon (default: one group, no controls). */
  controlPeriods?: readonly PeriodGroup[];
  /** Points on the curve (default 61: 0 … the top, 60 equal steps). */
  pointCount?: number;
  /** Explicit amounts (cents per horizon) instead of the default grid. */
  grid?: readonly number[];
  /** Of the bands and the marginal return's interval (default: the fit's level). */
  confidenceLevel?: number;
  /** Units for the marginal return's label (default outcome "outcome", spend "currency unit"). */
  units?: { outcome: string; spend: string };
}

export interface ResponseCurvePoint {
  /** The channel's amount for the horizon, cents. */
  amountCents: number;
  /** Expected horizon total with its confidence band, and the prediction band of the realised total. */
  mean: number;
  confidence: [number, number];
  prediction: [number, number];
  /** The channel is outside the spend it was seen at (per period). */
  beyondObservedRange: boolean;
  /** The plan at this point is a combination of spend unlike any past period (leverage above the largest). */
  unseenCombination: boolean;
}

/**
 * Slope of the expected horizon total per one more currency unit of the channel's horizon spend,
 * at the plan: gᵀβ with g = ∂a/∂A (a the plan's summed design row), interval gᵀβ ± t·√(gᵀVg).
 */
export interface MarginalReturn {
  channel: string;
  amountCents: number;
  value: number;
  standardError: number;
  confidence: [number, number];
  confidenceLevel: number;
  /** e.g. "EUR of sales per EUR of spend". */
  unit: string;
  /** How to read it: an association in past data, not a measured effect of moving money. */
  caution: string;
}

export interface ResponseCurve {
  channel: string;
  label: string;
  points: ResponseCurvePoint[];
  /** The spend the fit saw, per period × H (cents per horizon), to shade; null when unknown. */
  observed: { minCents: number; maxCents: number } | null;
  /** The curve at the plan's own amount. */
  current: ResponseCurvePoint;
  marginalReturn: MarginalReturn;
}

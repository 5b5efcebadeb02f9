/**
 * Budget allocation rules (pure and isomorphic: imported by client components and by the server).
 * See README.md.
 */
export type * from "./types";
export { amountToCents, centsToAmount, formatCents, formatCentsCompact, formatCentsPlain, centsFormatter, plainCentsFormatter } from "./money";
export type { MoneyLocale } from "./money";
export {
  horizonToPerPeriod,
  perPeriodToHorizon,
  horizonCentsToPerPeriodCents,
  perPeriodCentsToHorizonCents,
  allocationPerHorizon,
  allocationPerPeriod,
  observedRangeForHorizon,
} from "./horizon";
export { createAllocationState, sumCents, lowOf, highOf } from "./state";
export type { AllocationInit } from "./state";
export { distributeProportionally, capacity } from "./distribute";
export type { Slot } from "./distribute";
export { rebalanceFixedTotal, setTotal } from "./fixed-total";
export { adjustGrowingTotal, setCeiling, setGrowth, headroomCents, growthOf } from "./growing-total";
export { moveChannel, setLocked, toggleLock, setBounds, setMode } from "./edit";
export type { ChannelBounds } from "./edit";
export { validateAllocation, FIXED_TOTAL_TOLERANCE_CENTS } from "./validate";
export type { AllocationProblem } from "./validate";
export { parseAmountInput, localeSeparators } from "./parse-amount";
export type { ParsedAmount } from "./parse-amount";
export { observedPosition } from "./observed-range";
export type { ObservedPosition } from "./observed-range";

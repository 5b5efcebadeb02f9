/** How the allocation's total behaves while channels move. */
export type AllocationMode = "fixed" | "growing";

/** The spend range a channel was fitted on, per period, in cents (from the fit's spend history). */
export interface ObservedRange {
  minPerPeriodCents: number;
  maxPerPeriodCents: number;
}

/** One channel's share of the plan. Amounts are integer cents for the whole horizon. */
export interface AllocationChannel {
  /** The model's term name (stable key). */
  name: string;
  /** What planners read, e.g. "Search". */
  label: string;
  amountCents: number;
  /** A locked channel is held still while others move. */
  locked: boolean;
  /** Optional lower bound (e.g. a contractual minimum); spend is never below 0 anyway. */
  floorCents?: number;
  /** Optional upper bound. */
  ceilingCents?: number;
  observed?: ObservedRange;
}

/**
 * A whole allocation. Invariant kept by every function here: `totalCents` equals the sum of the
 * channels' `amountCents` (exactly, in both modes).
 */
export interface AllocationState {
  mode: AllocationMode;
  channels: readonly AllocationChannel[];
  totalCents: number;
  /** The total the growing mode grows from (the starting plan's total). */
  baseTotalCents: number;
  /** Growing mode: the total may rise up to here. Kept ≥ `totalCents`. */
  ceilingCents: number;
  /** Number of periods (e.g. weeks) the amounts cover. */
  horizonPeriods: number;
}

/** Why a blocker could not give or take more money. */
export type BlockerKind = "locked" | "at-floor" | "at-zero" | "at-ceiling";

export interface Blocker {
  name: string;
  label: string;
  kind: BlockerKind;
}

/** Structured explanation of a request that was cut short, plus the sentence to show. */
export interface ClampReason {
  kind:
    | "channel-locked"
    | "own-floor"
    | "own-ceiling"
    | "negative"
    | "others-exhausted"
    | "total-ceiling"
    | "total-bounds"
    | "invalid";
  /** The plain sentence for the planner ("Only €1,200 can move: …"). */
  message: string;
  channel?: string;
  /** How far the request actually got, in cents (absolute). */
  movedCents?: number;
  blockers?: Blocker[];
}

/** Result of every edit: the next state (the same object when nothing changed) and, if cut short, why. */
export interface AllocationResult {
  state: AllocationState;
  reason?: ClampReason;
}

/** Formats integer cents for messages. */
export type CentsFormatter = (cents: number) => string;

/** Options shared by the edit functions. */
export interface EditOptions {
  /** Formats amounts inside reason messages; defaults to a plain two-decimal number. */
  format?: CentsFormatter;
}

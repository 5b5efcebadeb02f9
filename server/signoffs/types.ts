import "server-only";
import type { SignoffDecision } from "@/db/schema/reviews";

export type { SignoffDecision };

/** One finance decision on one version (UI: Signed off · Declined (with reason)). */
export type SignoffDto = {
  id: string;
  scenarioId: string;
  version: number;
  decision: SignoffDecision;
  reason: string;
  decidedById: string | null;
  decidedByName: string | null;
  decidedAt: string;
};

/** A version's review state: its latest decision (null: not signed off) and the decisions before it. */
export type VersionSignoffStatusDto = {
  scenarioId: string;
  version: number;
  current: SignoffDto | null;
  history: SignoffDto[];
};

/**
 * Where a scenario stands with finance, read off its latest version: `signed_off` / `declined` (that
 * version's latest decision), `awaiting` (shared with finance, directly or in a shared comparison, and
 * not decided), `not_shared`, or `no_version` before the first save.
 */
export type ScenarioSignoffState = "signed_off" | "declined" | "awaiting" | "not_shared" | "no_version";

/** A scenario's sign-off summary for lists and the scenario header (UI: Signed off · Declined). */
export type ScenarioSignoffSummaryDto = {
  scenarioId: string;
  latestVersion: number | null;
  state: ScenarioSignoffState;
  /** The latest version's current decision (null: none). */
  latestDecision: SignoffDto | null;
  /** The newest earlier version whose current decision is a sign-off, when the latest is not signed off. */
  earlierSignedOff: SignoffDto | null;
};

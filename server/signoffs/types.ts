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

import "server-only";
import type { ScenarioMode } from "@/db/schema/scenarios";
import type { PlanShape } from "@/server/predict/plan-shape";
import type { OutcomeInterval, ScenarioWarning } from "@/server/predict/scenario-outcome";
import type { SignoffDto } from "@/server/signoffs/types";

/** A scenario version as a comparison refers to it. */
export type VersionRef = { scenarioId: string; version: number };

/** The fit a version was predicted on, with its approval. */
export type ComparisonFitDto = {
  id: string;
  name: string;
  status: string;
  approvedByName: string | null;
  approvedAt: string | null;
  /** Confidence level of the fit's intervals (0.95). */
  level: number;
};

/**
 * A version's expected total minus the baseline's, with its own confidence interval from the fit's
 * covariance (`planDifference`, never the gap between two intervals) — or, on different fits, why
 * there is none.
 */
export type ComparisonDifference =
  | { kind: "baseline" }
  | { kind: "joint"; mean: number; confidence: [number, number]; level: number; horizonsDiffer: boolean }
  | { kind: "none"; reason: string };

export type ComparisonColumnDto = {
  position: number;
  scenarioId: string;
  scenarioName: string;
  version: number;
  /** The scenario's newest version (a later one than this means this column is not the latest plan). */
  latestVersion: number;
  note: string;
  savedByName: string | null;
  savedAt: string;
  mode: ScenarioMode;
  horizon: number;
  periodNoun: string;
  /** Channel → amount over the horizon in the workspace currency. */
  allocation: Record<string, number>;
  totalSpend: number;
  controls: Record<string, number>;
  /** The server's prediction saved with the version: the horizon total with CI and PI. */
  outcome: OutcomeInterval;
  level: number;
  warnings: ScenarioWarning[];
  fit: ComparisonFitDto;
  outcomeShape: PlanShape["outcome"];
  difference: ComparisonDifference;
  /** The version's latest finance decision, or null: not signed off. */
  signoff: SignoffDto | null;
};

export type ComparisonDto = {
  /** Null for a comparison shown without being saved. */
  id: string | null;
  name: string | null;
  workspaceId: string;
  createdByName: string | null;
  createdAt: string | null;
  baselinePosition: number;
  /** Every channel of the columns' fits, in the first fit's order, with its label. */
  channels: { name: string; label: string }[];
  columns: ComparisonColumnDto[];
  /** Whether all columns are on one fit (then every difference has a joint interval). */
  oneFit: boolean;
};

export type ComparisonSummaryDto = {
  id: string;
  name: string;
  createdByName: string | null;
  createdAt: string;
  versions: (VersionRef & { scenarioName: string; decision: "signed_off" | "declined" | null })[];
  baselinePosition: number;
};

/** What a finance member was sent: a scenario version or a comparison. */
export type SharedWithMeDto = {
  shareId: string;
  objectType: "scenario" | "comparison";
  title: string;
  link: string;
  sharedByName: string | null;
  sharedAt: string;
  note: string;
  acknowledgement: string | null;
};

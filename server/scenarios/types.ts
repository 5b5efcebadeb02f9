import "server-only";
import type { ChannelSettings, ScenarioMode } from "@/db/schema/scenarios";
import type { OutcomeInterval, ScenarioOutcome, ScenarioWarning } from "@/server/predict/scenario-outcome";

export type { ChannelSettings, ScenarioMode };

/** A plan in API units: amounts per horizon in the workspace currency (two decimals at most). */
export type PlanDto = {
  allocation: Record<string, number>;
  controls: Record<string, number>;
  horizon: number;
};

export type BaselineDto = PlanDto & { source: "history" | "version" | "custom"; description: string; total: number };

export type VersionSummaryDto = {
  number: number;
  mode: ScenarioMode;
  total: number;
  horizon: number;
  note: string;
  authorName: string | null;
  createdAt: string;
  basedOn: number | null;
  restoredFrom: number | null;
  horizonTotal: OutcomeInterval;
  warningKinds: ScenarioWarning["kind"][];
};

export type ScenarioSummaryDto = {
  id: string;
  name: string;
  fitId: string;
  fitName: string;
  fitStatus: string;
  ownerName: string | null;
  createdAt: string;
  horizon: number;
  latestVersion: number | null;
  latestSavedAt: string | null;
};

export type ScenarioDto = ScenarioSummaryDto & {
  workspaceId: string;
  ownerId: string | null;
  baseline: BaselineDto;
  versions: VersionSummaryDto[];
};

export type VersionDto = PlanDto & {
  scenarioId: string;
  number: number;
  mode: ScenarioMode;
  total: number;
  /** Growing mode only. */
  ceiling: number | null;
  settings: ChannelSettings;
  /** The server's prediction at save time (difference measured against the scenario's starting plan). */
  prediction: ScenarioOutcome;
  warnings: ScenarioWarning[];
  fitChecksum: string;
  note: string;
  authorId: string | null;
  authorName: string | null;
  createdAt: string;
  basedOn: number | null;
  restoredFrom: number | null;
};

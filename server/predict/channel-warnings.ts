// Per-channel warning sentences of an outcome, apart from the engine (server/predict/scenario-outcome.ts
// re-exports it): the scenario room needs them on first paint, before the engine's chunk has loaded.
import type { PlanShape } from "./plan-shape";
import type { ScenarioWarning } from "./scenario-outcome";

/** Channel name → its "Beyond observed range" sentence (for the allocation rows), null when inside. */
export function channelWarningSentences(shape: PlanShape, warnings: readonly ScenarioWarning[]): Record<string, string | null> {
  const sentences: Record<string, string | null> = {};
  for (const channel of shape.channels) sentences[channel.name] = null;
  for (const warning of warnings) {
    if (warning.kind === "outside-range" && warning.role === "channel") sentences[warning.column] = warning.message;
  }
  return sentences;
}

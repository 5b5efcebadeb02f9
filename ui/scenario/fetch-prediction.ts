import type { ScenarioOutcome } from "@/server/predict/scenario-outcome";

export class PredictError extends Error {
  constructor(
    message: string,
    readonly status: number,
  ) {
    super(message);
  }
}

/** POST /api/fits/{id}/predict with a plan already serialised (the body is also the cache key). */
export async function fetchPrediction(fitId: string, body: string, signal: AbortSignal): Promise<ScenarioOutcome> {
  const response = await fetch(`/api/fits/${fitId}/predict`, { method: "POST", headers: { "content-type": "application/json" }, body, signal });
  const json = (await response.json().catch(() => ({}))) as ScenarioOutcome & { error?: string };
  if (!response.ok) throw new PredictError(json.error ?? `The prediction failed (${response.status}).`, response.status);
  return json;
}

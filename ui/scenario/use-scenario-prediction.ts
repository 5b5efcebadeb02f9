"use client";

import { useQuery } from "@tanstack/react-query";
import { useEffect, useMemo, useState } from "react";
import { allocationPerHorizon, type AllocationState, type MoneyLocale } from "@/server/planning/allocation";
import type { PlanShape } from "@/server/predict/plan-shape";
import { type ScenarioOutcome, type ScenarioPlan, scenarioOutcome } from "@/server/predict/scenario-outcome";
import type { FitRecord } from "@/server/stats";

/** Debounce of the server request after the last move (the local preview is immediate). */
export const PREDICT_DEBOUNCE_MS = 120;

/** Performance mark set when the server's answer for the current plan replaces the preview. */
export const PREDICTION_CONFIRMED_MARK = "prediction-confirmed";

/** The API plan of an allocation: amounts per horizon in currency units. */
export function planOf(allocation: AllocationState, controls: Record<string, number>): ScenarioPlan {
  return { allocation: allocationPerHorizon(allocation), controls, horizon: allocation.horizonPeriods };
}

export function useDebouncedValue<T>(value: T, delayMs: number): T {
  const [debounced, setDebounced] = useState(value);
  useEffect(() => {
    const timer = setTimeout(() => setDebounced(value), delayMs);
    return () => clearTimeout(timer);
  }, [value, delayMs]);
  return debounced;
}

export class PredictError extends Error {
  constructor(
    message: string,
    readonly status: number,
  ) {
    super(message);
  }
}

async function fetchPrediction(fitId: string, body: string, signal: AbortSignal): Promise<ScenarioOutcome> {
  const response = await fetch(`/api/fits/${fitId}/predict`, { method: "POST", headers: { "content-type": "application/json" }, body, signal });
  const json = (await response.json().catch(() => ({}))) as ScenarioOutcome & { error?: string };
  if (!response.ok) throw new PredictError(json.error ?? `The prediction failed (${response.status}).`, response.status);
  return json;
}

export type PredictionView = {
  outcome: ScenarioOutcome | null;
  /** "preview": computed in this browser from the fit record; "server": the server's answer for this exact plan. */
  source: "preview" | "server";
  fetching: boolean;
  error: string | null;
  /** Set when the preview itself cannot be computed (e.g. a negative amount typed). */
  previewError: string | null;
};

/**
 * The outcome of the plan on screen: an instant preview computed here with the pure engine from the
 * fit record (no raw data is needed), replaced by the server's answer for the same plan once the
 * debounced request returns. Both run the same code (server/predict/scenario-outcome.ts).
 */
export function useScenarioPrediction(args: {
  fitId: string;
  record: FitRecord;
  shape: PlanShape;
  money: MoneyLocale;
  plan: ScenarioPlan;
  baseline: ScenarioPlan;
  /** False for readers without fit:predict (finance): the preview only. */
  canPredict: boolean;
}): PredictionView {
  const { fitId, record, shape, money, plan, baseline, canPredict } = args;
  const body = useMemo(() => JSON.stringify({ ...plan, compareTo: baseline }), [plan, baseline]);
  const preview = useMemo(() => {
    try {
      return { outcome: scenarioOutcome(record, shape, plan, { money, compareTo: baseline }), error: null };
    } catch (error) {
      return { outcome: null, error: error instanceof Error ? error.message : String(error) };
    }
  }, [record, shape, plan, baseline, money]);
  const debouncedBody = useDebouncedValue(body, PREDICT_DEBOUNCE_MS);
  const query = useQuery({
    queryKey: ["predict", fitId, debouncedBody],
    queryFn: ({ signal }) => fetchPrediction(fitId, debouncedBody, signal),
    enabled: canPredict,
    staleTime: Infinity,
    gcTime: 60_000,
    retry: false,
    refetchOnWindowFocus: false,
  });
  const confirmed = query.data !== undefined && debouncedBody === body ? query.data : null;
  useEffect(() => {
    if (confirmed && typeof performance !== "undefined") performance.mark(PREDICTION_CONFIRMED_MARK);
  }, [confirmed]);
  return {
    outcome: confirmed ?? preview.outcome,
    source: confirmed ? "server" : "preview",
    fetching: query.isFetching || debouncedBody !== body,
    error: query.error ? query.error.message : null,
    previewError: preview.error,
  };
}

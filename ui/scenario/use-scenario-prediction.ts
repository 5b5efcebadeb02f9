"use client";

import { useEffect, useMemo, useRef, useState } from "react";
import type { MoneyLocale } from "@/server/planning/allocation";
import type { PlanShape } from "@/server/predict/plan-shape";
import type { ScenarioOutcome, ScenarioPlan } from "@/server/predict/scenario-outcome";
import type { FitRecord } from "@/server/stats";

type Engine = typeof import("@/server/predict/scenario-outcome");
let engine: Engine | null = null;
let engineLoading: Promise<Engine> | null = null;

/**
 * The pure engine (server/predict/scenario-outcome.ts with the Student t functions it needs), loaded as
 * a chunk of its own after the room has painted: the first outcome comes rendered from the server, and
 * every later move is previewed with this.
 */
export function loadPreviewEngine(): Promise<Engine> {
  engineLoading ??= import("@/server/predict/scenario-outcome").then((module) => (engine = module));
  return engineLoading;
}

/** Debounce of the server request after the last move (the local preview is immediate). */
export const PREDICT_DEBOUNCE_MS = 120;

/** Performance mark set when the server's answer for the current plan replaces the preview. */
export const PREDICTION_CONFIRMED_MARK = "prediction-confirmed";

export { planOf } from "./room-plan";

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

/** Server answers kept per room (plans revisited by undo or alternating moves are not asked again). */
const ANSWERS_KEPT = 200;

/**
 * The outcome of the plan on screen: an instant preview computed here with the pure engine from the
 * fit record (no raw data is needed), replaced by the server's answer for the same plan once the
 * debounced request returns. Both run the same code (server/predict/scenario-outcome.ts). Until the
 * engine's chunk has loaded (just after the first paint), the outcome is the one the server rendered
 * for the opening plan (`initialOutcome`), then the last one shown.
 */
export function useScenarioPrediction(args: {
  fitId: string;
  record: FitRecord;
  shape: PlanShape;
  money: MoneyLocale;
  plan: ScenarioPlan;
  baseline: ScenarioPlan;
  /** The server's outcome of the plan the room opens with (null when it could not be computed). */
  initialOutcome: ScenarioOutcome | null;
  /** False for readers without fit:predict (finance): the preview only. */
  canPredict: boolean;
}): PredictionView {
  const { fitId, record, shape, money, plan, baseline, initialOutcome, canPredict } = args;
  const body = useMemo(() => JSON.stringify({ ...plan, compareTo: baseline }), [plan, baseline]);
  const [openingBody] = useState(body);
  const [engineReady, setEngineReady] = useState(() => engine !== null);
  useEffect(() => {
    if (engineReady) return;
    let live = true;
    loadPreviewEngine().then(
      () => live && setEngineReady(true),
      () => {}, // the server's answers still come; the preview stays off
    );
    return () => {
      live = false;
    };
  }, [engineReady]);
  const preview = useMemo(() => {
    if (!engineReady || !engine) return { outcome: body === openingBody ? initialOutcome : null, error: null };
    try {
      return { outcome: engine.scenarioOutcome(record, shape, plan, { money, compareTo: baseline }), error: null };
    } catch (error) {
      return { outcome: null, error: error instanceof Error ? error.message : String(error) };
    }
  }, [engineReady, record, shape, plan, baseline, money, body, openingBody, initialOutcome]);

  const debouncedBody = useDebouncedValue(body, PREDICT_DEBOUNCE_MS);
  const answers = useRef(new Map<string, ScenarioOutcome>());
  const [answer, setAnswer] = useState<{ body: string; outcome?: ScenarioOutcome; error?: string } | null>(null);
  const [pending, setPending] = useState<string | null>(null);
  useEffect(() => {
    if (!canPredict) return;
    const known = answers.current.get(debouncedBody);
    if (known) {
      setAnswer({ body: debouncedBody, outcome: known });
      return;
    }
    const controller = new AbortController();
    setPending(debouncedBody);
    fetchPrediction(fitId, debouncedBody, controller.signal).then(
      (outcome) => {
        if (answers.current.size >= ANSWERS_KEPT) answers.current.clear();
        answers.current.set(debouncedBody, outcome);
        if (!controller.signal.aborted) setAnswer({ body: debouncedBody, outcome });
      },
      (error: unknown) => {
        if (!controller.signal.aborted) setAnswer({ body: debouncedBody, error: error instanceof Error ? error.message : String(error) });
      },
    ).finally(() => {
      if (!controller.signal.aborted) setPending((current) => (current === debouncedBody ? null : current));
    });
    return () => {
      controller.abort();
      setPending((current) => (current === debouncedBody ? null : current));
    };
  }, [fitId, debouncedBody, canPredict]);

  const confirmed = answer?.outcome !== undefined && answer.body === debouncedBody && debouncedBody === body ? answer.outcome : null;
  useEffect(() => {
    if (confirmed && typeof performance !== "undefined") performance.mark(PREDICTION_CONFIRMED_MARK);
  }, [confirmed]);
  const lastShown = useRef<ScenarioOutcome | null>(initialOutcome);
  const outcome = confirmed ?? preview.outcome ?? (engineReady ? null : lastShown.current);
  useEffect(() => {
    if (outcome) lastShown.current = outcome;
  }, [outcome]);
  return {
    outcome,
    source: confirmed ? "server" : "preview",
    fetching: pending !== null || debouncedBody !== body,
    error: answer?.error !== undefined && answer.body === debouncedBody ? answer.error : null,
    previewError: preview.error,
  };
}

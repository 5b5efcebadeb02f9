"use client";

import dynamic from "next/dynamic";
import { createElement, type ReactNode, useCallback, useEffect, useMemo, useRef, useState } from "react";
import type { MoneyLocale } from "@/server/planning/allocation";
import type { PlanShape } from "@/server/predict/plan-shape";
import type { ScenarioOutcome, ScenarioPlan } from "@/server/predict/scenario-outcome";
import type { FitRecord } from "@/server/stats";
import type { ServerAnswer } from "./server-prediction";


// The server's answers come through react-query in a chunk loaded after the first paint (see there).
const ServerPrediction = dynamic(() => import("./server-prediction"), { ssr: false });

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

export type PredictionSource = "preview" | "server" | "local";

export type PredictionView = {
  outcome: ScenarioOutcome | null;
  /**
   * "preview": computed in this browser from the fit record, the server's answer to follow; "server":
   * the server's answer for this exact plan; "local": computed here for a reader who cannot ask the server.
   */
  source: PredictionSource;
  fetching: boolean;
  error: string | null;
  /** Set when the preview itself cannot be computed (e.g. a negative amount typed). */
  previewError: string | null;
  /** Render this in the room: it asks the server (nothing visible). */
  serverRequest: ReactNode;
};

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
  const [answer, setAnswer] = useState<ServerAnswer | null>(null);
  const onAnswer = useCallback((next: ServerAnswer) => setAnswer(next), []);
  const current = answer !== null && answer.body === debouncedBody ? answer : null;
  const confirmed = current?.outcome !== undefined && debouncedBody === body ? current.outcome : null;
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
    source: confirmed ? "server" : canPredict ? "preview" : "local",
    // Until the request's chunk has loaded and answered, the plan on screen is still being asked about.
    fetching: debouncedBody !== body || (canPredict && (current === null || current.fetching)),
    error: current?.error ?? null,
    previewError: preview.error,
    serverRequest: createElement(ServerPrediction, { fitId, body: debouncedBody, enabled: canPredict, onAnswer }),
  };
}

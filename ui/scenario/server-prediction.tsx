"use client";

import { QueryClient, QueryClientProvider, useQuery } from "@tanstack/react-query";
import { useEffect } from "react";
import type { ScenarioOutcome } from "@/server/predict/scenario-outcome";
import { fetchPrediction } from "./fetch-prediction";

/** What the server said (or is saying) about one plan, keyed by its request body. */
export type ServerAnswer = { body: string; outcome?: ScenarioOutcome; error?: string; fetching: boolean };

export type ServerPredictionProps = {
  fitId: string;
  /** The debounced plan as the request body. */
  body: string;
  enabled: boolean;
  onAnswer: (answer: ServerAnswer) => void;
};

// One cache for the page: the room's answers survive this component's remounts (e.g. Fast Refresh).
let client: QueryClient | null = null;

/**
 * Asks the server for the plan on screen with react-query, which keeps the answers per plan (undo and
 * alternating moves are not asked again) and cancels a request whose plan has left the screen. Loaded
 * after the room's first paint (the opening outcome comes rendered from the server), so the query
 * library is not part of the page's first load. Renders nothing.
 */
export default function ServerPrediction(props: ServerPredictionProps) {
  client ??= new QueryClient();
  return (
    <QueryClientProvider client={client}>
      <AskServer {...props} />
    </QueryClientProvider>
  );
}

function AskServer({ fitId, body, enabled, onAnswer }: ServerPredictionProps) {
  const query = useQuery({
    queryKey: ["predict", fitId, body],
    queryFn: ({ signal }) => fetchPrediction(fitId, body, signal),
    enabled,
    staleTime: Infinity,
    gcTime: 5 * 60_000,
    retry: false,
    refetchOnWindowFocus: false,
  });
  const error = query.error ? query.error.message : undefined;
  useEffect(() => {
    onAnswer({ body, outcome: query.data, error, fetching: query.isFetching });
  }, [onAnswer, body, query.data, error, query.isFetching]);
  return null;
}

import { useQuery, useQueryClient } from "@tanstack/react-query";
import { useCallback, useEffect } from "react";
import { UNREAD_POLL_MS } from "./poll";

const unreadKey = ["notifications", "unread"] as const;

async function fetchUnread(): Promise<number> {
  // limit=0: the count without the list.
  const response = await fetch("/api/notifications?limit=0", { headers: { accept: "application/json" } });
  if (!response.ok) throw new Error(`The unread count could not be read (${response.status}).`);
  const body = (await response.json()) as { unread: number };
  return body.unread;
}

/**
 * The member's unread notification count: starts from the server's figure, re-reads it every
 * `pollMs` while the page is visible and when the window regains focus.
 */
export function useUnreadCount(initialUnread: number, pollMs: number = UNREAD_POLL_MS): number {
  const queryClient = useQueryClient();
  const query = useQuery({
    queryKey: unreadKey,
    queryFn: fetchUnread,
    initialData: initialUnread,
    staleTime: Math.min(pollMs, 10_000),
    refetchInterval: pollMs,
    refetchIntervalInBackground: false,
    refetchOnWindowFocus: true,
  });
  // A fresh server render (router.refresh) carries a fresh count: take it.
  useEffect(() => {
    queryClient.setQueryData(unreadKey, initialUnread);
  }, [queryClient, initialUnread]);
  return query.data;
}

/** Sets the count after a change this page made (e.g. the `unread` a mark-read call returned). */
export function useSetUnreadCount(): (unread: number) => void {
  const queryClient = useQueryClient();
  return useCallback((unread: number) => queryClient.setQueryData(unreadKey, unread), [queryClient]);
}

import { useCallback, useEffect } from "react";
import { create } from "zustand";
import { UNREAD_POLL_MS } from "./poll";

// A small store, not a query cache: the count is in every page's header, and the header must not carry
// a data-fetching library into every page's first load.
const useUnreadStore = create<{ unread: number | null; set: (unread: number) => void }>((set) => ({
  unread: null,
  set: (unread) => set({ unread }),
}));

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
  const unread = useUnreadStore((state) => state.unread);
  const setUnread = useUnreadStore((state) => state.set);
  // A fresh server render (router.refresh, navigation) carries a fresh count: take it.
  useEffect(() => setUnread(initialUnread), [initialUnread, setUnread]);
  useEffect(() => {
    let live = true;
    const read = () => {
      if (document.visibilityState !== "visible") return;
      fetchUnread().then(
        (count) => live && setUnread(count),
        () => {}, // keep the last count; the next read may work
      );
    };
    const timer = setInterval(read, pollMs);
    window.addEventListener("focus", read);
    document.addEventListener("visibilitychange", read);
    return () => {
      live = false;
      clearInterval(timer);
      window.removeEventListener("focus", read);
      document.removeEventListener("visibilitychange", read);
    };
  }, [pollMs, setUnread]);
  return unread ?? initialUnread;
}

/** Sets the count after a change this page made (e.g. the `unread` a mark-read call returned). */
export function useSetUnreadCount(): (unread: number) => void {
  const setUnread = useUnreadStore((state) => state.set);
  return useCallback((unread: number) => setUnread(unread), [setUnread]);
}

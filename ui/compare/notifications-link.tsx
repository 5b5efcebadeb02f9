"use client";

import Link from "next/link";
import { UNREAD_POLL_MS } from "@/ui/notifications/poll";
import { useUnreadCount } from "@/ui/notifications/unread-count";

export interface NotificationsLinkProps {
  /** The unread count the server rendered the page with. */
  initialUnread: number;
  /** How often to re-read the count while the page is open (also re-read on window focus). */
  pollMs?: number;
}

/** The header's link to the notification list, with the unread count kept current (words for screen readers). */
export function NotificationsLink({ initialUnread, pollMs = UNREAD_POLL_MS }: NotificationsLinkProps) {
  const unread = useUnreadCount(initialUnread, pollMs);
  return (
    <Link
      href="/notifications"
      data-testid="notifications-link"
      data-unread={unread}
      className="relative inline-flex items-center gap-1.5 rounded-md px-2 py-1 text-sm font-medium text-white/90 hover:bg-river-light hover:text-white focus-visible:outline-2 focus-visible:outline-white print:hidden"
    >
      <svg aria-hidden="true" width="16" height="16" viewBox="0 0 24 24" fill="none" stroke="currentColor" strokeWidth="2" strokeLinecap="round" strokeLinejoin="round">
        <path d="M6 8a6 6 0 0 1 12 0c0 7 3 9 3 9H3s3-2 3-9" />
        <path d="M10.3 21a1.94 1.94 0 0 0 3.4 0" />
      </svg>
      <span>Notifications</span>
      {unread > 0 ? (
        <span className="num rounded-full bg-ember px-1.5 text-xs font-semibold text-white" data-testid="unread-count" aria-live="polite">
          {unread > 99 ? "99+" : unread}
          <span className="sr-only"> unread</span>
        </span>
      ) : null}
    </Link>
  );
}

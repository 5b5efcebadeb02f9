import Link from "next/link";

/** The header's link to the notification list, with the unread count (words for screen readers). */
export function NotificationsLink({ unread }: { unread: number }) {
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
        <span className="num rounded-full bg-ember px-1.5 text-xs font-semibold text-white" data-testid="unread-count">
          {unread > 99 ? "99+" : unread}
          <span className="sr-only"> unread</span>
        </span>
      ) : null}
    </Link>
  );
}

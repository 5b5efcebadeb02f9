"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useTransition } from "react";
import type { NotificationDto } from "@/server/notifications/store";
import { buttonClass } from "@/ui/button-class";
import { useSetUnreadCount } from "@/ui/notifications/unread-count";
import { reviewApi } from "./api";
import { dateText } from "./format";

const kindLabels: Record<NotificationDto["kind"], string> = {
  share: "Shared with you",
  mention: "Mentioned you",
  reply: "Reply",
  comment: "Comment",
  signoff: "Signed off",
  decline: "Declined",
};

/** The member's notifications: unread ones stand out; opening one or "Mark read" marks it read. */
export function NotificationList({ notifications, locale }: { notifications: NotificationDto[]; locale: string }) {
  const router = useRouter();
  const [pending, startTransition] = useTransition();
  const setUnreadCount = useSetUnreadCount();
  const unread = notifications.filter((item) => item.readAt === null);
  // The header's count follows at once from the answer (it carries the new unread count).
  const markRead = (body: { ids?: string[]; all?: boolean }) =>
    reviewApi.markRead(body).then(
      (result) => setUnreadCount(result.unread),
      () => undefined,
    );
  const mark = (body: { ids?: string[]; all?: boolean }) =>
    startTransition(async () => {
      await markRead(body);
      router.refresh();
    });

  if (notifications.length === 0) return <p className="text-sm text-slate-700">Nothing yet. When a planner shares a plan with you, or someone mentions you, it shows here.</p>;
  return (
    <div className="space-y-3">
      <div className="flex items-center justify-between">
        <p className="text-sm text-slate-700" aria-live="polite">
          {unread.length === 0 ? "All read." : `${unread.length} unread.`}
        </p>
        {unread.length > 0 ? (
          <button type="button" disabled={pending} onClick={() => mark({ all: true })} className={buttonClass("secondary", "py-1.5")}>
            Mark all read
          </button>
        ) : null}
      </div>
      <ul className="divide-y divide-slate-100" data-testid="notification-list">
        {notifications.map((item) => (
          <li key={item.id} data-testid="notification" data-unread={item.readAt === null} className={`flex flex-wrap items-start justify-between gap-3 py-3 ${item.readAt === null ? "border-l-4 border-shallows pl-3" : "pl-4"}`}>
            <div className="min-w-0 flex-1">
              <p className="text-xs text-slate-600">
                {kindLabels[item.kind]} · {dateText(item.createdAt, locale)}
                {item.readAt === null ? <strong className="ml-2 font-semibold text-shallows">Unread</strong> : null}
              </p>
              <Link
                href={item.link}
                onClick={() => {
                  if (item.readAt === null) void markRead({ ids: [item.id] });
                }}
                className={`text-sm hover:underline ${item.readAt === null ? "font-semibold text-river" : "text-slate-800"}`}
              >
                {item.title}
              </Link>
            </div>
            {item.readAt === null ? (
              <button type="button" disabled={pending} onClick={() => mark({ ids: [item.id] })} className={buttonClass("quiet", "px-0 py-0 text-xs")}>
                Mark read
              </button>
            ) : null}
          </li>
        ))}
      </ul>
    </div>
  );
}

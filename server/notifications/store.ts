import "server-only";
import { and, count, desc, eq, inArray, isNull } from "drizzle-orm";
import { db } from "@/db/client";
import { type NotificationKind, notifications, users } from "@/db/schema";
import type { DbExecutor } from "@/server/data/audit";

export type NotificationDto = {
  id: string;
  kind: NotificationKind;
  title: string;
  link: string;
  actorName: string | null;
  createdAt: string;
  readAt: string | null;
};

export type NewNotification = {
  workspaceId: string;
  userId: string;
  kind: NotificationKind;
  title: string;
  /** A path inside the app ("/compare/…"). */
  link: string;
  actorId: string | null;
};

/** Adds notifications (one per recipient); pass the transaction of the change they announce. */
export async function createNotifications(items: NewNotification[], tx: DbExecutor = db): Promise<void> {
  if (items.length === 0) return;
  await tx.insert(notifications).values(items.map((item) => ({ ...item, title: item.title.slice(0, 500) })));
}

/** A member's notifications in one workspace, newest first. */
export async function listNotificationsByUser(input: { workspaceId: string; userId: string; unreadOnly?: boolean; limit?: number }): Promise<NotificationDto[]> {
  const conditions = [eq(notifications.workspaceId, input.workspaceId), eq(notifications.userId, input.userId)];
  if (input.unreadOnly) conditions.push(isNull(notifications.readAt));
  const rows = await db
    .select({
      id: notifications.id,
      kind: notifications.kind,
      title: notifications.title,
      link: notifications.link,
      actorName: users.name,
      createdAt: notifications.createdAt,
      readAt: notifications.readAt,
    })
    .from(notifications)
    .leftJoin(users, eq(users.id, notifications.actorId))
    .where(and(...conditions))
    .orderBy(desc(notifications.createdAt), desc(notifications.id))
    .limit(Math.min(input.limit ?? 100, 500));
  return rows.map((row) => ({ ...row, createdAt: row.createdAt.toISOString(), readAt: row.readAt ? row.readAt.toISOString() : null }));
}

/** How many of a member's notifications in the workspace are unread (the header's count). */
export async function countUnreadNotifications(input: { workspaceId: string; userId: string }): Promise<number> {
  const [row] = await db
    .select({ unread: count() })
    .from(notifications)
    .where(and(eq(notifications.workspaceId, input.workspaceId), eq(notifications.userId, input.userId), isNull(notifications.readAt)));
  return Number(row?.unread ?? 0);
}

/**
 * Marks the given notifications (or all) of this member in this workspace read; ids of anyone
 * else's notifications are ignored. Returns how many changed.
 */
export async function markNotificationsRead(input: { workspaceId: string; userId: string; ids?: string[]; all?: boolean }): Promise<number> {
  const conditions = [eq(notifications.workspaceId, input.workspaceId), eq(notifications.userId, input.userId), isNull(notifications.readAt)];
  if (!input.all) {
    if (!input.ids || input.ids.length === 0) return 0;
    conditions.push(inArray(notifications.id, input.ids));
  }
  const changed = await db.update(notifications).set({ readAt: new Date() }).where(and(...conditions)).returning({ id: notifications.id });
  return changed.length;
}

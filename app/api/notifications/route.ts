import { apiRoute } from "@/server/http/route";
import { countUnreadNotifications, listNotificationsByUser } from "@/server/notifications/store";
import { listNotificationsQuerySchema } from "./schema";

/** The caller's notifications in this workspace, newest first, with the unread count (`limit=0`: the count only). */
export const GET = apiRoute({ query: listNotificationsQuerySchema }, async ({ actor, query }) => {
  const unreadOnly = query.unread === "1" || query.unread === "true";
  const who = { workspaceId: actor.workspaceId, userId: actor.userId };
  const [notifications, unread] = await Promise.all([
    query.limit === 0 ? Promise.resolve([]) : listNotificationsByUser({ ...who, unreadOnly, limit: query.limit }),
    countUnreadNotifications(who),
  ]);
  return { unread, notifications };
});

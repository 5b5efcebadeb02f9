import { z } from "zod";
import { apiRoute } from "@/server/http/route";
import { countUnreadNotifications, listNotificationsByUser } from "@/server/notifications/store";

const query = z.object({ unread: z.enum(["0", "1", "true", "false"]).optional() });

/** The caller's notifications in this workspace, newest first, with the unread count. */
export const GET = apiRoute({ query }, async ({ actor, query }) => {
  const unreadOnly = query.unread === "1" || query.unread === "true";
  const [notifications, unread] = await Promise.all([
    listNotificationsByUser({ workspaceId: actor.workspaceId, userId: actor.userId, unreadOnly }),
    countUnreadNotifications({ workspaceId: actor.workspaceId, userId: actor.userId }),
  ]);
  return { unread, notifications };
});

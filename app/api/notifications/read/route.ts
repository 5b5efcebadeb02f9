import { apiRoute } from "@/server/http/route";
import { countUnreadNotifications, markNotificationsRead } from "@/server/notifications/store";
import { markReadRequestSchema } from "./schema";

/** Marks the caller's notifications read (the given ids, or all); others' ids are ignored. */
export const POST = apiRoute({ body: markReadRequestSchema }, async ({ actor, body }) => {
  const marked = await markNotificationsRead({ workspaceId: actor.workspaceId, userId: actor.userId, ids: body.ids, all: body.all });
  return { marked, unread: await countUnreadNotifications({ workspaceId: actor.workspaceId, userId: actor.userId }) };
});

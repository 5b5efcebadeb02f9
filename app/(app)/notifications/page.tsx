import type { Metadata } from "next";
import { requirePageActor } from "@/server/authz";
import { listNotificationsByUser } from "@/server/notifications/store";
import { NotificationList } from "@/ui/compare/notification-list";
import { PageHeading, Section } from "@/ui/section";

export const metadata: Metadata = { title: "Notifications" };

export default async function NotificationsPage() {
  const actor = await requirePageActor();
  const notifications = await listNotificationsByUser({ workspaceId: actor.workspaceId, userId: actor.userId, limit: 200 });
  return (
    <div className="space-y-6">
      <PageHeading title="Notifications">Shares, mentions, replies and finance decisions in {actor.workspaceName}.</PageHeading>
      <Section title="Newest first">
        <NotificationList notifications={notifications} locale={actor.locale} />
      </Section>
    </div>
  );
}

import Link from "next/link";
import type { Metadata } from "next";
import { can, requirePageActor, roleDescriptions, roleLabels, roleNames } from "@/server/authz";
import { listPendingInvitations } from "@/server/data/invitations";
import { listMembersByWorkspaceId } from "@/server/data/members";
import { isLocalMailSink } from "@/server/mail/transport";
import { PageHeading, RoleBadge, Section } from "@/ui/section";
import { InviteForm, MemberRow, RevokeInvitationButton, WorkspaceForm } from "./settings-forms";
import { textLinkClass } from "@/ui/button-class";

export const metadata: Metadata = { title: "Settings" };

export default async function SettingsPage() {
  const actor = await requirePageActor("workspace:read");
  const isAdmin = can(actor, "workspace:admin");
  const [members, invitations] = isAdmin
    ? await Promise.all([listMembersByWorkspaceId(actor.workspaceId), listPendingInvitations(actor.workspaceId)])
    : [[], []];
  const options = roleNames.map((role) => ({ role, label: roleLabels[role], description: roleDescriptions[role] }));
  const date = new Intl.DateTimeFormat(actor.locale, { dateStyle: "medium", timeZone: "UTC" });

  return (
    <div className="flex flex-col gap-6">
      <PageHeading title="Settings">
        {actor.workspaceName} · {isAdmin ? "you administer this workspace" : "ask an admin to change roles or invite people"}
      </PageHeading>

      <Section id="account" title="Your account">
        <dl className="grid gap-x-6 gap-y-2 text-sm sm:grid-cols-[max-content_1fr]">
          <dt className="text-slate-600">Name</dt>
          <dd>{actor.name ?? "—"}</dd>
          <dt className="text-slate-600">E-mail</dt>
          <dd>{actor.email}</dd>
          <dt className="text-slate-600">Roles here</dt>
          <dd className="flex flex-wrap gap-1">
            {actor.roles.map((role) => (
              <RoleBadge key={role}>{roleLabels[role]}</RoleBadge>
            ))}
          </dd>
        </dl>
        <p className="mt-4 text-sm">
          <Link href="/settings/tokens" className={`font-medium ${textLinkClass}`}>
            API tokens
          </Link>{" "}
          — let scripts call Tributary&apos;s API with your roles.
        </p>
      </Section>

      <Section id="workspace-settings" title="Workspace" description="Every amount in this workspace is in its currency and shown in its number format.">
        {isAdmin ? (
          <WorkspaceForm name={actor.workspaceName} currency={actor.currency} locale={actor.locale} />
        ) : (
          <dl className="grid gap-x-6 gap-y-2 text-sm sm:grid-cols-[max-content_1fr]">
            <dt className="text-slate-600">Name</dt>
            <dd>{actor.workspaceName}</dd>
            <dt className="text-slate-600">Currency</dt>
            <dd>{actor.currency}</dd>
            <dt className="text-slate-600">Number format</dt>
            <dd>{actor.locale}</dd>
          </dl>
        )}
      </Section>

      {isAdmin ? (
        <>
          <Section id="members" title="Members and roles" description="A member may hold several roles. The last admin cannot be removed or lose the admin role.">
            <ul className="flex flex-col divide-y divide-slate-100">
              {members.map((member) => (
                <MemberRow key={member.userId} member={member} options={options} isSelf={member.userId === actor.userId} />
              ))}
            </ul>
          </Section>

          <div className="grid gap-6 md:grid-cols-2">
            <Section id="invite" title="Invite a member" description="They get an e-mail with a one-time link, valid for 7 days, to set a password and join.">
              <InviteForm options={options} />
            </Section>
            <Section id="invitations" title="Pending invitations">
              {invitations.length === 0 ? (
                <p className="text-sm text-slate-700">No pending invitations.</p>
              ) : (
                <ul className="flex flex-col divide-y divide-slate-100 text-sm">
                  {invitations.map((invitation) => (
                    <li key={invitation.id} className="flex items-start justify-between gap-3 py-2">
                      <span>
                        <span className="font-medium">{invitation.email}</span>
                        <span className="block text-xs text-slate-600">
                          {invitation.roles.map((role) => roleLabels[role]).join(" · ")} · expires {date.format(invitation.expiresAt)}
                          {invitation.invitedByName ? ` · invited by ${invitation.invitedByName}` : ""}
                        </span>
                      </span>
                      <RevokeInvitationButton invitationId={invitation.id} email={invitation.email} />
                    </li>
                  ))}
                </ul>
              )}
            </Section>
          </div>

          {isLocalMailSink() && can(actor, "mail:outbox") ? (
            <Section id="outbox" title="Local mail outbox" description="This copy of Tributary sends e-mail to a local sink instead of delivering it.">
              <Link href="/settings/outbox" className={`text-sm font-medium ${textLinkClass}`}>
                Open the outbox
              </Link>
            </Section>
          ) : null}
        </>
      ) : null}
    </div>
  );
}

import Link from "next/link";
import type { Metadata } from "next";
import { can, requirePageActor, roleDescriptions, roleLabels } from "@/server/authz";
import { listAuditEventsByWorkspaceId } from "@/server/data/audit";
import { listMembersByWorkspaceId } from "@/server/data/members";
import { listFitsByWorkspaceId } from "@/server/fits/store";
import { listApprovedFits, listScenariosByWorkspace } from "@/server/scenarios/store";
import { listScenarioSignoffSummaries } from "@/server/signoffs/summary";
import { SignoffSummary } from "@/ui/compare/signoff-summary";
import { FitStatusBadge } from "@/ui/fits/status";
import { QueueList } from "@/ui/home/queue-list";
import { Section, RoleBadge } from "@/ui/section";
import { describeAuditEvent } from "@/ui/audit-event";
import { textLinkClass } from "@/ui/button-class";

export const metadata: Metadata = { title: "Home" };

export default async function HomePage() {
  const actor = await requirePageActor("workspace:read");
  const [events, members, approvedFits, scenarios, signoffs, inReview, unfinished] = await Promise.all([
    listAuditEventsByWorkspaceId({ workspaceId: actor.workspaceId, limit: 10, excludeObjectTypes: ["api_token"] }),
    listMembersByWorkspaceId(actor.workspaceId),
    can(actor, "fit:read") ? listApprovedFits(actor.workspaceId) : null,
    can(actor, "scenario:read") ? listScenariosByWorkspace({ workspaceId: actor.workspaceId }) : null,
    can(actor, "scenario:read") ? listScenarioSignoffSummaries(actor.workspaceId) : null,
    can(actor, "fit:review") ? listFitsByWorkspaceId({ workspaceId: actor.workspaceId, statuses: ["in_review"] }) : null,
    can(actor, "fit:create") ? listFitsByWorkspaceId({ workspaceId: actor.workspaceId, statuses: ["changes_requested", "draft", "in_review"] }) : null,
  ]);
  // Analysts' own unfinished fits: sent back first, then drafts, then those waiting for a reviewer.
  const statusOrder = { changes_requested: 0, draft: 1, in_review: 2 } as Record<string, number>;
  const myFits = unfinished
    ? unfinished.filter((fit) => fit.authorId === actor.userId).sort((a, b) => statusOrder[a.status] - statusOrder[b.status] || b.updatedAt.getTime() - a.updatedAt.getTime())
    : null;
  // Reviewers' queue: fits sent for review, the longest-waiting first.
  const awaitingReview = inReview
    ? [...inReview].sort((a, b) => (a.submittedAt?.getTime() ?? 0) - (b.submittedAt?.getTime() ?? 0))
    : null;
  // Finance's queue: latest versions shared and not yet decided (a newer version starts undecided).
  const awaiting =
    scenarios && signoffs && can(actor, "signoff:decide")
      ? scenarios.flatMap((scenario) => {
          const summary = signoffs.get(scenario.id);
          return summary?.state === "awaiting" ? [{ scenario, summary }] : [];
        })
      : null;
  const firstName = (actor.name ?? actor.email).split(" ")[0];
  const when = new Intl.DateTimeFormat(actor.locale, { dateStyle: "medium", timeStyle: "short", timeZone: "UTC" });
  const day = new Intl.DateTimeFormat(actor.locale, { dateStyle: "medium", timeZone: "UTC" });

  const nextSteps = [
    can(actor, "dataset:upload") && { href: "/datasets", text: "Upload a spend history and build a fit" },
    can(actor, "fit:review") && { href: "/fits", text: "Review fits waiting for approval" },
    can(actor, "scenario:write") && { href: "/scenarios", text: "Move budget between channels on an approved fit" },
    can(actor, "signoff:decide") && { href: "/compare", text: "Compare scenario versions side by side and sign off" },
    can(actor, "workspace:admin") && { href: "/settings", text: "Invite members and manage their roles" },
  ].filter((step): step is { href: string; text: string } => Boolean(step));

  return (
    <div className="flex flex-col gap-6">
      <div>
        <h1 className="text-2xl font-semibold text-river">Welcome, {firstName}</h1>
        <p className="mt-1 text-slate-700">
          You work in <strong>{actor.workspaceName}</strong> as{" "}
          {actor.roles.map((role, i) => (
            <span key={role}>
              {i > 0 ? (i === actor.roles.length - 1 ? " and " : ", ") : ""}
              {roleLabels[role].toLowerCase()}
            </span>
          ))}
          . Amounts are in {actor.currency}.
        </p>
      </div>

      <div className="grid gap-6 md:grid-cols-2">
        <Section id="roles" title="Your roles">
          <ul className="flex flex-col gap-3">
            {actor.roles.map((role) => (
              <li key={role} className="flex flex-col gap-1">
                <span>
                  <RoleBadge>{roleLabels[role]}</RoleBadge>
                </span>
                <span className="text-sm text-slate-700">{roleDescriptions[role]}</span>
              </li>
            ))}
          </ul>
          {nextSteps.length > 0 ? (
            <>
              <h3 className="mt-5 text-sm font-semibold text-slate-800">Where to start</h3>
              <ul className="mt-2 flex flex-col gap-1 text-sm">
                {nextSteps.map((step) => (
                  <li key={step.href}>
                    <Link href={step.href} className={textLinkClass}>
                      {step.text}
                    </Link>
                  </li>
                ))}
              </ul>
            </>
          ) : null}
        </Section>

        <Section id="workspace" title="Workspace" description={`${members.length} member${members.length === 1 ? "" : "s"}`}>
          <ul className="flex flex-col divide-y divide-slate-100 text-sm">
            {members.slice(0, 8).map((member) => (
              <li key={member.userId} className="flex flex-wrap items-center justify-between gap-2 py-1.5">
                <span>{member.name ?? member.email}</span>
                <span className="text-xs text-slate-600">{member.roles.map((role) => roleLabels[role]).join(" · ")}</span>
              </li>
            ))}
          </ul>
          {members.length > 8 ? (
            <p className="mt-2 text-sm text-slate-600">
              and {members.length - 8} more
              {can(actor, "workspace:admin") ? (
                <>
                  {" · "}
                  <Link href="/settings#members" className={textLinkClass}>
                    all members
                  </Link>
                </>
              ) : null}
            </p>
          ) : null}
        </Section>
      </div>

      {myFits && myFits.length > 0 ? (
        <Section id="my-fits" title="Your fits in progress" description="Fits you built that are not approved yet: those a reviewer sent back first.">
          <QueueList
            empty=""
            items={myFits.map((fit) => ({
              key: fit.id,
              href: `/fits/${fit.id}`,
              title: fit.name,
              detail: `${fit.outcome} on ${fit.termCount} terms · changed ${day.format(fit.updatedAt)}`,
              aside: <FitStatusBadge status={fit.status} />,
              data: { "data-testid": "home-my-fit", "data-fit": fit.id, "data-status": fit.status },
            }))}
          />
        </Section>
      ) : null}

      {awaitingReview ? (
        <Section id="awaiting-review" title="Awaiting review" description="Fits sent for review, the longest-waiting first. A fit is approved by someone other than the person who built it.">
          <QueueList
            empty="No fit is waiting for review."
            items={awaitingReview.map((fit) => ({
              key: fit.id,
              href: `/fits/${fit.id}`,
              title: fit.name,
              detail: `${fit.outcome} on ${fit.termCount} terms · ${fit.authorName ?? "someone"}${fit.authorId === actor.userId ? " (you built it: another reviewer decides)" : ""}`,
              aside: <span className="num text-xs text-slate-600">{fit.submittedAt ? `sent ${day.format(fit.submittedAt)}` : null}</span>,
              data: { "data-testid": "home-awaiting-review", "data-fit": fit.id },
            }))}
          />
        </Section>
      ) : null}

      {awaiting ? (
        <Section id="awaiting-signoff" title="Awaiting sign-off" description="Latest scenario versions shared with finance that no one has signed off or declined yet.">
          <QueueList
            empty="Nothing is waiting for a decision."
            items={awaiting.map(({ scenario, summary }) => ({
              key: scenario.id,
              href: `/scenarios/${scenario.id}`,
              title: scenario.name,
              detail: `on ${scenario.fitName}${scenario.ownerName ? ` · ${scenario.ownerName}` : ""}`,
              aside: <SignoffSummary summary={summary} />,
              data: { "data-testid": "home-awaiting", "data-scenario": scenario.id },
            }))}
          />
        </Section>
      ) : null}

      {approvedFits || scenarios ? (
        <div className="grid gap-6 md:grid-cols-2">
          {approvedFits ? (
            <Section id="approved-fits" title="Approved fits" description="What planners can plan on, newest approval first.">
              {approvedFits.length === 0 ? (
                <p className="text-sm text-slate-700">
                  No approved fits yet.{can(actor, "fit:create") ? " Build one from a spend history and send it for review." : ""}
                </p>
              ) : (
                <ul className="flex flex-col divide-y divide-slate-100 text-sm">
                  {approvedFits.slice(0, 5).map((fit) => (
                    <li key={fit.id} className="flex flex-wrap justify-between gap-2 py-1.5">
                      <Link href={`/fits/${fit.id}`} className={textLinkClass}>
                        {fit.name}
                      </Link>
                      {fit.approvedAt ? <span className="num text-slate-600">approved {day.format(new Date(fit.approvedAt))}</span> : null}
                    </li>
                  ))}
                </ul>
              )}
            </Section>
          ) : null}
          {scenarios ? (
            <Section id="scenarios" title="Scenarios" description="Budget plans on approved fits, newest first.">
              {scenarios.length === 0 ? (
                <p className="text-sm text-slate-700">
                  No scenarios yet.{can(actor, "scenario:write") ? " Start one from an approved fit." : ""}
                </p>
              ) : (
                <ul className="flex flex-col divide-y divide-slate-100 text-sm">
                  {scenarios.slice(0, 5).map((scenario) => (
                    <li key={scenario.id} className="flex justify-between gap-3 py-2" data-testid="home-scenario" data-scenario={scenario.id}>
                      <span className="flex min-w-0 flex-col items-start gap-1">
                        <Link href={`/scenarios/${scenario.id}`} className={textLinkClass}>
                          {scenario.name}
                        </Link>
                        <span className="text-xs text-slate-600">on {scenario.fitName}{scenario.ownerName ? ` · ${scenario.ownerName}` : ""}</span>
                        {scenario.latestVersion && signoffs?.get(scenario.id) ? <SignoffSummary summary={signoffs.get(scenario.id)!} /> : null}
                      </span>
                      <span className="num shrink-0 text-right text-slate-600">
                        {scenario.latestVersion ? `v${scenario.latestVersion}` : "no version saved"}
                        {scenario.latestSavedAt ? <span className="block text-xs">{day.format(new Date(scenario.latestSavedAt))}</span> : null}
                      </span>
                    </li>
                  ))}
                </ul>
              )}
            </Section>
          ) : null}
        </div>
      ) : null}

      <Section id="activity" title="Recent activity" description="The latest changes in this workspace, newest first.">
        {events.length === 0 ? (
          <p className="text-sm text-slate-700">No activity yet.</p>
        ) : (
          <ol className="flex flex-col divide-y divide-slate-100 text-sm">
            {events.map((event) => (
              <li key={event.id} className="flex flex-wrap justify-between gap-2 py-2">
                <span>
                  <strong className="font-medium">{event.actorName ?? event.actorEmail ?? "Someone"}</strong> {describeAuditEvent(event)}
                </span>
                <time className="num text-slate-600" dateTime={event.at.toISOString()}>
                  {when.format(event.at)} UTC
                </time>
              </li>
            ))}
          </ol>
        )}
      </Section>
    </div>
  );
}

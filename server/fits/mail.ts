import "server-only";
import { listMembersByWorkspaceId } from "@/server/data/members";
import { getUserById } from "@/server/data/users";
import { escapeHtml } from "@/server/mail/html";
import { absoluteLink } from "@/server/mail/links";
import { sendMail, type OutgoingMail } from "@/server/mail/transport";
import type { FitStatus } from "./types";

export type FitTransition = "submitted" | "approved" | "changes_requested" | "retired";

const headlines: Record<FitTransition, (name: string, actor: string) => string> = {
  submitted: (name, actor) => `${actor} sent the fit “${name}” for review.`,
  approved: (name, actor) => `${actor} approved the fit “${name}”. It is now frozen and planners can use it.`,
  changes_requested: (name, actor) => `${actor} asked for changes to the fit “${name}”.`,
  retired: (name, actor) => `${actor} retired the fit “${name}”. Planners can no longer start scenarios on it.`,
};

const subjects: Record<FitTransition, (name: string) => string> = {
  submitted: (name) => `Fit to review: ${name}`,
  approved: (name) => `Fit approved: ${name}`,
  changes_requested: (name) => `Changes requested on fit: ${name}`,
  retired: (name) => `Fit retired: ${name}`,
};

export function fitTransitionMail(input: {
  to: string[];
  transition: FitTransition;
  fitName: string;
  actorName: string;
  workspaceName: string;
  comment: string | null;
  link: string;
}): OutgoingMail {
  const headline = headlines[input.transition](input.fitName, input.actorName);
  const text = [
    headline,
    ...(input.comment ? ["", "Comment:", input.comment] : []),
    "",
    `Open the fit in ${input.workspaceName}:`,
    input.link,
  ].join("\n");
  const html = `<p>${escapeHtml(headline)}</p>${
    input.comment ? `<blockquote style="border-left:3px solid #2a727b;margin:0;padding-left:10px">${escapeHtml(input.comment).replace(/\n/g, "<br>")}</blockquote>` : ""
  }<p><a href="${escapeHtml(input.link)}">Open the fit</a> in ${escapeHtml(input.workspaceName)}.</p>`;
  return { to: input.to, subject: subjects[input.transition](input.fitName), text, html };
}

/**
 * Tells the author and the workspace's reviewers (not the person who acted) about a transition.
 * A mail failure is logged and never undoes the transition, which is already committed.
 */
export async function notifyFitTransition(input: {
  workspaceId: string;
  workspaceName: string;
  fitId: string;
  fitName: string;
  authorId: string | null;
  actorUserId: string;
  actorName: string;
  transition: FitTransition;
  comment: string | null;
}): Promise<{ to: string[] }> {
  try {
    const members = await listMembersByWorkspaceId(input.workspaceId);
    const recipients = new Set<string>();
    for (const member of members) {
      if (member.userId === input.actorUserId) continue;
      if (member.roles.includes("reviewer") || member.userId === input.authorId) recipients.add(member.email);
    }
    if (input.authorId && input.authorId !== input.actorUserId && !members.some((m) => m.userId === input.authorId)) {
      const author = await getUserById(input.authorId);
      if (author) recipients.add(author.email);
    }
    const to = [...recipients];
    if (to.length === 0) return { to };
    await sendMail(
      fitTransitionMail({
        to,
        transition: input.transition,
        fitName: input.fitName,
        actorName: input.actorName,
        workspaceName: input.workspaceName,
        comment: input.comment,
        link: await absoluteLink(`/fits/${input.fitId}`),
      }),
    );
    return { to };
  } catch (error) {
    console.error(`[fits] could not send the ${input.transition} e-mail for fit ${input.fitId}: ${error instanceof Error ? error.message : String(error)}`);
    return { to: [] };
  }
}

export const transitionOf: Record<Exclude<FitStatus, "draft">, FitTransition> = {
  in_review: "submitted",
  approved: "approved",
  changes_requested: "changes_requested",
  retired: "retired",
};

import "server-only";
import type { Role } from "@/db/schema";
import { roleLabels } from "@/server/authz/roles";
import { escapeHtml } from "@/server/mail/html";
import type { OutgoingMail } from "@/server/mail/transport";

function listRoles(roles: Role[]): string {
  const labels = roles.map((role) => roleLabels[role].toLowerCase());
  return labels.length <= 1 ? labels.join("") : `${labels.slice(0, -1).join(", ")} and ${labels[labels.length - 1]}`;
}

export function invitationMail(input: {
  to: string;
  workspaceName: string;
  inviterName: string | null;
  roles: Role[];
  link: string;
  expiresAt: Date;
}): OutgoingMail {
  const who = input.inviterName ?? "An admin";
  const expires = input.expiresAt.toLocaleDateString("en-GB", { day: "numeric", month: "long", year: "numeric", timeZone: "UTC" });
  const roles = listRoles(input.roles);
  const text = [
    `${who} invited you to ${input.workspaceName} on Tributary as ${roles}.`,
    "",
    "Open this link to choose your password and join (it works once, until " + expires + "):",
    input.link,
    "",
    "If you did not expect this invitation, ignore this message.",
  ].join("\n");
  const html = `<p>${escapeHtml(who)} invited you to <strong>${escapeHtml(input.workspaceName)}</strong> on Tributary as ${escapeHtml(roles)}.</p>
<p><a href="${escapeHtml(input.link)}">Accept the invitation</a> — the link works once, until ${escapeHtml(expires)}.</p>
<p style="color:#555">If you did not expect this invitation, ignore this message.</p>`;
  return { to: input.to, subject: `You are invited to ${input.workspaceName} on Tributary`, text, html };
}

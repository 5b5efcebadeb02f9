import "server-only";
import { escapeHtml } from "@/server/mail/html";
import { absoluteLink } from "@/server/mail/links";
import { sendMail } from "@/server/mail/transport";

export type ReviewMail = {
  to: string;
  subject: string;
  /** The first sentence ("Priya Nair shared …"). */
  headline: string;
  /** Quoted text under it (a comment, a note), if any. */
  quote?: string | null;
  /** More plain sentences (an acknowledgement of warnings). */
  extra?: string[];
  /** App path the link opens. */
  path: string;
  linkLabel: string;
  workspaceName: string;
};

/** The message of a share or a mention: a headline, the quoted words, and a link into the workspace. */
export async function reviewMailMessage(mail: ReviewMail) {
  const link = await absoluteLink(mail.path);
  const text = [
    mail.headline,
    ...(mail.quote ? ["", ...mail.quote.split("\n").map((line) => `> ${line}`)] : []),
    ...(mail.extra?.length ? ["", ...mail.extra] : []),
    "",
    `${mail.linkLabel} in ${mail.workspaceName}:`,
    link,
  ].join("\n");
  const html = `<p>${escapeHtml(mail.headline)}</p>${
    mail.quote ? `<blockquote style="border-left:3px solid #2a727b;margin:0;padding-left:10px">${escapeHtml(mail.quote).replace(/\n/g, "<br>")}</blockquote>` : ""
  }${(mail.extra ?? []).map((line) => `<p>${escapeHtml(line)}</p>`).join("")}<p><a href="${escapeHtml(link)}">${escapeHtml(mail.linkLabel)}</a> in ${escapeHtml(mail.workspaceName)}.</p>`;
  return { to: mail.to, subject: mail.subject, text, html, link };
}

/**
 * Sends each message; a failure is logged and never undoes what the mail announces (already
 * committed). Returns the addresses that were accepted by the SMTP server.
 */
export async function sendReviewMails(mails: ReviewMail[], context: string): Promise<string[]> {
  const sent: string[] = [];
  for (const mail of mails) {
    try {
      const message = await reviewMailMessage(mail);
      await sendMail({ to: message.to, subject: message.subject, text: message.text, html: message.html });
      sent.push(mail.to);
    } catch (error) {
      console.error(`[${context}] could not send an e-mail: ${error instanceof Error ? error.message : String(error)}`);
    }
  }
  return sent;
}

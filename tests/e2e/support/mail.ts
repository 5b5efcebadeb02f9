// Reading what the app sent: the test mail sink stores every message in the `local_mail` table.
import postgres from "postgres";
import { e2e } from "./env";

export interface SinkMail {
  receivedAt: Date;
  mailFrom: string;
  rcptTo: string[];
  subject: string;
  raw: string;
}

/** Waits until a message to `to` (and matching `subject`, received after `since`) is in the sink. */
export async function waitForMail(criteria: { to: string; subject?: string | RegExp; since?: Date; timeoutMs?: number }): Promise<SinkMail> {
  const sql = postgres(e2e.databaseUrl, { max: 1, onnotice: () => {} });
  const deadline = Date.now() + (criteria.timeoutMs ?? 15_000);
  try {
    for (;;) {
      const rows = await sql<SinkMail[]>`
        select received_at as "receivedAt", mail_from as "mailFrom", rcpt_to as "rcptTo", subject, raw
        from local_mail
        where ${criteria.to.toLowerCase()} = any (select lower(r) from unnest(rcpt_to) r)
          and received_at >= ${criteria.since ?? new Date(0)}
        order by received_at desc`;
      const subject = criteria.subject;
      const match = rows.find((row) =>
        subject === undefined ? true : typeof subject === "string" ? row.subject.includes(subject) : subject.test(row.subject),
      );
      if (match) return match;
      if (Date.now() > deadline) {
        throw new Error(`no mail to ${criteria.to}${subject ? ` with subject ${String(subject)}` : ""} within ${criteria.timeoutMs ?? 15_000} ms`);
      }
      await new Promise((resolve) => setTimeout(resolve, 250));
    }
  } finally {
    await sql.end({ timeout: 1 });
  }
}

/** The http(s) links of a raw message, with quoted-printable soft breaks and escapes undone. */
export function linksIn(raw: string): string[] {
  const text = raw.replace(/=\r?\n/g, "").replace(/=([0-9A-F]{2})/g, (_m, hex: string) => String.fromCharCode(parseInt(hex, 16)));
  return [...new Set(text.match(/https?:\/\/[^\s"'<>)\]]+/g) ?? [])];
}

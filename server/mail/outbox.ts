import "server-only";
import { desc } from "drizzle-orm";
import { db } from "@/db/client";
import { localMail } from "@/db/schema";

export type LocalMailDto = { id: string; receivedAt: Date; from: string; to: string[]; subject: string; text: string };

function decodeQuotedPrintable(body: string): string {
  const bytes: number[] = [];
  const soft = body.replace(/=\r?\n/g, "");
  for (let i = 0; i < soft.length; i++) {
    const hex = soft.slice(i + 1, i + 3);
    if (soft[i] === "=" && /^[0-9A-Fa-f]{2}$/.test(hex)) {
      bytes.push(parseInt(hex, 16));
      i += 2;
    } else {
      bytes.push(...Buffer.from(soft[i], "utf8"));
    }
  }
  return Buffer.from(bytes).toString("utf8");
}

function splitHead(part: string): { headers: string; body: string } {
  const at = part.search(/\r?\n\r?\n/);
  if (at < 0) return { headers: part, body: "" };
  return { headers: part.slice(0, at), body: part.slice(at).replace(/^\r?\n\r?\n/, "") };
}

function header(headers: string, name: string): string {
  const unfolded = headers.replace(/\r?\n[ \t]+/g, " ");
  return new RegExp(`^${name}:\\s*(.*)$`, "im").exec(unfolded)?.[1]?.trim() ?? "";
}

function decodeBody(headers: string, body: string): string {
  const encoding = header(headers, "Content-Transfer-Encoding").toLowerCase();
  if (encoding === "quoted-printable") return decodeQuotedPrintable(body);
  if (encoding === "base64") return Buffer.from(body.replace(/\s+/g, ""), "base64").toString("utf8");
  return body;
}

/**
 * The readable text of a raw message: its text/plain part (decoded), else the whole body. Enough for
 * the messages Tributary sends; not a general MIME parser.
 */
export function plainTextOf(raw: string): string {
  const { headers, body } = splitHead(raw);
  const type = header(headers, "Content-Type");
  const boundary = /boundary="?([^";]+)"?/i.exec(type)?.[1];
  if (!boundary) return decodeBody(headers, body).trim();
  for (const part of body.split(`--${boundary}`)) {
    const { headers: partHeaders, body: partBody } = splitHead(part.replace(/^\r?\n/, ""));
    const partType = header(partHeaders, "Content-Type").toLowerCase();
    if (partType.startsWith("text/plain")) return decodeBody(partHeaders, partBody).trim();
    if (partType.startsWith("multipart/")) return plainTextOf(part.replace(/^\r?\n/, ""));
  }
  return body.trim();
}

/** The newest messages the local sink received (table local_mail, written by scripts/mail-sink.ts). */
export async function listLocalMail(limit = 50): Promise<LocalMailDto[]> {
  const rows = await db.select().from(localMail).orderBy(desc(localMail.receivedAt)).limit(limit);
  return rows.map((row) => ({
    id: row.id,
    receivedAt: row.receivedAt,
    from: row.mailFrom,
    to: row.rcptTo,
    subject: row.subject,
    text: plainTextOf(row.raw),
  }));
}

// The local mail sink: an SMTP server on 127.0.0.1 that stands in for a hosted mail service. Every message
// it receives is stored in the `local_mail` table (listed on the admin page in local mode).
//
//   node --import tsx scripts/mail-sink.ts      (started by `npm start` / `npm test`; env SMTP_HOST, SMTP_PORT, DATABASE_URL)
//
// Tests can run one in-process with `startMailSink({ port: 0, databaseUrl })`.
import type { AddressInfo } from "node:net";
import { drizzle } from "drizzle-orm/postgres-js";
import postgres from "postgres";
import { SMTPServer } from "smtp-server";
import { localMail } from "../db/schema/mail";

export interface ReceivedMail {
  mailFrom: string;
  rcptTo: string[];
  subject: string;
  raw: string;
}

export interface MailSink {
  host: string;
  port: number;
  close(): Promise<void>;
}

export interface MailSinkOptions {
  host?: string;
  /** 0 picks a free port (see the returned `port`). */
  port: number;
  databaseUrl: string;
  /** Called after a message is stored. */
  onMessage?: (mail: ReceivedMail) => void;
  /** Largest accepted message in bytes (default 25 MB). */
  maxBytes?: number;
}

export async function startMailSink(options: MailSinkOptions): Promise<MailSink> {
  const host = options.host ?? "127.0.0.1";
  const sql = postgres(options.databaseUrl, { max: 2, onnotice: () => {} });
  const db = drizzle(sql);
  const server = new SMTPServer({
    authOptional: true,
    // Accept AUTH without TLS and any credentials, so SMTP_USER/SMTP_PASS set for a real service still work here.
    allowInsecureAuth: true,
    onAuth: (auth, _session, callback) => callback(null, { user: auth.username ?? "local" }),
    disabledCommands: ["STARTTLS"],
    size: options.maxBytes ?? 25 * 1024 * 1024,
    logger: false,
    banner: "Tributary local mail sink",
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on("data", (chunk: Buffer) => chunks.push(chunk));
      stream.on("error", callback);
      stream.on("end", () => {
        if ((stream as unknown as { sizeExceeded?: boolean }).sizeExceeded) {
          callback(Object.assign(new Error("Message too large"), { responseCode: 552 }));
          return;
        }
        const raw = Buffer.concat(chunks).toString("utf8");
        const mail: ReceivedMail = {
          mailFrom: session.envelope.mailFrom ? session.envelope.mailFrom.address : "",
          rcptTo: session.envelope.rcptTo.map((r) => r.address),
          subject: subjectOf(raw),
          raw,
        };
        db.insert(localMail)
          .values(mail)
          .then(() => {
            options.onMessage?.(mail);
            callback();
          })
          .catch((error: unknown) => {
            console.error(`could not store a message: ${error instanceof Error ? error.message : String(error)}`);
            callback(Object.assign(new Error("Temporary failure storing the message"), { responseCode: 451 }));
          });
      });
    },
  });
  server.on("error", (error) => console.error(`SMTP error: ${error.message}`));
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(options.port, host, () => {
      server.off("error", reject);
      resolve();
    });
  });
  const port = ((server.server.address() as AddressInfo | null)?.port ?? options.port) as number;
  return {
    host,
    port,
    close: async () => {
      await new Promise<void>((resolve) => server.close(() => resolve()));
      await sql.end({ timeout: 5 });
    },
  };
}

/** The decoded Subject header of a raw RFC 5322 message ("" when there is none). */
export function subjectOf(raw: string): string {
  const end = raw.search(/\r?\n\r?\n/);
  const headers = (end === -1 ? raw : raw.slice(0, end)).replace(/\r?\n[ \t]+/g, " ");
  const match = /^subject:[ \t]*(.*)$/im.exec(headers);
  return match ? decodeEncodedWords(match[1].trim()) : "";
}

/** Decodes RFC 2047 encoded words (=?charset?B|Q?text?=); whitespace between adjacent words is dropped. */
export function decodeEncodedWords(value: string): string {
  const word = /=\?([^?\s]+)\?([BbQq])\?([^?\s]*)\?=/g;
  return value.replace(/(=\?[^?\s]+\?[BbQq]\?[^?\s]*\?=)\s+(?==\?)/g, "$1").replace(word, (whole, charset: string, encoding: string, text: string) => {
    try {
      const bytes =
        encoding.toUpperCase() === "B"
          ? Buffer.from(text, "base64")
          : Buffer.from(
              text.replace(/_/g, " ").replace(/=([0-9A-Fa-f]{2})/g, (_m, hex: string) => String.fromCharCode(parseInt(hex, 16))),
              "latin1",
            );
      return new TextDecoder(charset.split("*")[0]).decode(bytes);
    } catch {
      return whole;
    }
  });
}

async function main() {
  const host = process.env.SMTP_HOST || "127.0.0.1";
  const port = Number(process.env.SMTP_PORT || 2525);
  const databaseUrl = process.env.DATABASE_URL;
  if (!databaseUrl) throw new Error("DATABASE_URL is not set (see .env.example)");
  const sink = await startMailSink({
    host,
    port,
    databaseUrl,
    onMessage: (mail) => console.log(`received "${mail.subject}" from ${mail.mailFrom || "<>"} to ${mail.rcptTo.join(", ")}`),
  });
  console.log(`listening on ${sink.host}:${sink.port}; messages are kept in the local_mail table`);
  const stop = () => {
    void sink.close().then(() => process.exit(0));
  };
  process.on("SIGINT", stop);
  process.on("SIGTERM", stop);
}

if (/mail-sink\.[cm]?[jt]s$/.test(process.argv[1] ?? "")) {
  main().catch((error: unknown) => {
    console.error(`mail sink: ${error instanceof Error ? error.message : String(error)}`);
    process.exit(1);
  });
}

// The local mail sink stores what nodemailer sends into local_mail (DATABASE_URL: a migrated database).
import { randomBytes } from "node:crypto";
import nodemailer from "nodemailer";
import postgres from "postgres";
import { afterAll, beforeAll, expect, test } from "vitest";
import { startMailSink, type MailSink } from "@/scripts/mail-sink";

const databaseUrl = process.env.DATABASE_URL ?? "";
let sink: MailSink;
const sql = postgres(databaseUrl, { max: 1, onnotice: () => {} });

beforeAll(async () => {
  sink = await startMailSink({ port: 0, databaseUrl });
});

afterAll(async () => {
  await sink?.close();
  await sql.end();
});

test("a message sent with nodemailer lands in local_mail with envelope and decoded subject", async () => {
  const to = `sink-${randomBytes(4).toString("hex")}@test.example`;
  const transport = nodemailer.createTransport({ host: sink.host, port: sink.port, secure: false, ignoreTLS: true });
  const info = await transport.sendMail({
    from: "Tributary <no-reply@tributary.localhost>",
    to: [to, "second@test.example"],
    subject: "Einladung für Tributary",
    text: "Open http://localhost:3100/invite/token to join.",
  });
  expect(info.accepted).toEqual([to, "second@test.example"]);

  const rows = await sql`select mail_from, rcpt_to, subject, raw from local_mail where ${to} = any (rcpt_to)`;
  expect(rows).toHaveLength(1);
  expect(rows[0].mail_from).toBe("no-reply@tributary.localhost");
  expect(rows[0].rcpt_to).toEqual([to, "second@test.example"]);
  expect(rows[0].subject).toBe("Einladung für Tributary");
  expect(rows[0].raw).toContain("invite/token");
  await sql`delete from local_mail where ${to} = any (rcpt_to)`;
});

test("credentials are accepted without TLS, so SMTP_USER/SMTP_PASS settings work against the sink", async () => {
  const transport = nodemailer.createTransport({ host: sink.host, port: sink.port, secure: false, ignoreTLS: true, auth: { user: "u", pass: "p" } });
  const info = await transport.sendMail({ from: "a@test.example", to: "auth-check@test.example", subject: "auth", text: "x" });
  expect(info.accepted).toEqual(["auth-check@test.example"]);
  await sql`delete from local_mail where 'auth-check@test.example' = any (rcpt_to)`;
});

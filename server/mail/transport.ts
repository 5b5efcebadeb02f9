import "server-only";
import nodemailer, { type Transporter } from "nodemailer";

export type OutgoingMail = { to: string | string[]; subject: string; text: string; html?: string };

const globalForMail = globalThis as unknown as { tributaryMailer?: Transporter };

/**
 * SMTP settings come from the environment: SMTP_HOST (default 127.0.0.1), SMTP_PORT (default 2525,
 * the local sink of `npm start`), optional SMTP_USER / SMTP_PASS, SMTP_SECURE=true for implicit
 * TLS. The local sink speaks plain SMTP on loopback, so STARTTLS is not required there.
 */
function transporter(): Transporter {
  if (!globalForMail.tributaryMailer) {
    const host = process.env.SMTP_HOST ?? "127.0.0.1";
    const loopback = host === "127.0.0.1" || host === "localhost" || host === "::1";
    globalForMail.tributaryMailer = nodemailer.createTransport({
      host,
      port: Number(process.env.SMTP_PORT ?? 2525),
      secure: process.env.SMTP_SECURE === "true",
      ignoreTLS: loopback,
      auth: process.env.SMTP_USER ? { user: process.env.SMTP_USER, pass: process.env.SMTP_PASS ?? "" } : undefined,
      connectionTimeout: 5_000,
      greetingTimeout: 5_000,
      socketTimeout: 10_000,
    });
  }
  return globalForMail.tributaryMailer;
}

export const mailFrom = () => process.env.MAIL_FROM ?? "Tributary <no-reply@tributary.localhost>";

/** Sends one message; throws when the SMTP server refuses or cannot be reached. */
export async function sendMail(mail: OutgoingMail): Promise<void> {
  await transporter().sendMail({ from: mailFrom(), ...mail });
}

/** The local outbox page and its table exist only when the app runs with the local mail sink. */
export const isLocalMailSink = () => process.env.MAIL_SINK === "local";

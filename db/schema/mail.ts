import { index, pgTable, text, timestamp, uuid } from "drizzle-orm/pg-core";

/** Messages received by the local SMTP sink (scripts/mail-sink.ts) when MAIL_SINK=local. */
export const localMail = pgTable(
  "local_mail",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    receivedAt: timestamp("received_at", { withTimezone: true }).notNull().defaultNow(),
    /** Envelope sender ("" for a null sender). */
    mailFrom: text("mail_from").notNull(),
    /** Envelope recipients. */
    rcptTo: text("rcpt_to").array().notNull(),
    subject: text("subject").notNull().default(""),
    /** The whole message as received (headers and body). */
    raw: text("raw").notNull(),
  },
  (table) => [index("local_mail_received_at_idx").on(table.receivedAt)],
);

export type LocalMail = typeof localMail.$inferSelect;

CREATE TABLE "local_mail" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"received_at" timestamp with time zone DEFAULT now() NOT NULL,
	"mail_from" text NOT NULL,
	"rcpt_to" text[] NOT NULL,
	"subject" text DEFAULT '' NOT NULL,
	"raw" text NOT NULL
);
--> statement-breakpoint
CREATE INDEX "local_mail_received_at_idx" ON "local_mail" USING btree ("received_at");
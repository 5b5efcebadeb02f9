CREATE TABLE "comments" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"workspace_id" uuid NOT NULL,
	"scenario_id" uuid NOT NULL,
	"version_number" integer NOT NULL,
	"parent_id" uuid,
	"comparison_id" uuid,
	"author_id" text,
	"body" text NOT NULL,
	"mentions" text[] DEFAULT '{}'::text[] NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "comments_body_check" CHECK (length(trim("comments"."body")) between 1 and 4000)
);
--> statement-breakpoint
CREATE TABLE "comparison_versions" (
	"comparison_id" uuid NOT NULL,
	"position" integer NOT NULL,
	"scenario_id" uuid NOT NULL,
	"version_number" integer NOT NULL,
	CONSTRAINT "comparison_versions_pkey" PRIMARY KEY("comparison_id","position"),
	CONSTRAINT "comparison_versions_position_check" CHECK ("comparison_versions"."position" between 0 and 3)
);
--> statement-breakpoint
CREATE TABLE "comparisons" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"workspace_id" uuid NOT NULL,
	"name" text NOT NULL,
	"baseline_position" integer DEFAULT 0 NOT NULL,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "comparisons_name_check" CHECK (length(trim("comparisons"."name")) between 1 and 200),
	CONSTRAINT "comparisons_baseline_check" CHECK ("comparisons"."baseline_position" between 0 and 3)
);
--> statement-breakpoint
CREATE TABLE "notifications" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"workspace_id" uuid NOT NULL,
	"user_id" text NOT NULL,
	"kind" text NOT NULL,
	"title" text NOT NULL,
	"link" text NOT NULL,
	"actor_id" text,
	"read_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "notifications_kind_check" CHECK ("notifications"."kind" in ('share', 'mention', 'reply', 'comment', 'signoff', 'decline')),
	CONSTRAINT "notifications_link_check" CHECK ("notifications"."link" like '/%')
);
--> statement-breakpoint
CREATE TABLE "share_recipients" (
	"share_id" uuid NOT NULL,
	"user_id" text NOT NULL,
	CONSTRAINT "share_recipients_pkey" PRIMARY KEY("share_id","user_id")
);
--> statement-breakpoint
CREATE TABLE "shares" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"workspace_id" uuid NOT NULL,
	"object_type" text NOT NULL,
	"scenario_id" uuid,
	"version_number" integer,
	"comparison_id" uuid,
	"note" text DEFAULT '' NOT NULL,
	"acknowledgement" text,
	"shared_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "shares_object_check" CHECK (("shares"."object_type" = 'scenario' and "shares"."scenario_id" is not null and "shares"."version_number" is not null and "shares"."comparison_id" is null)
        or ("shares"."object_type" = 'comparison' and "shares"."comparison_id" is not null and "shares"."scenario_id" is null and "shares"."version_number" is null)),
	CONSTRAINT "shares_text_check" CHECK (length("shares"."note") <= 2000 and ("shares"."acknowledgement" is null or length("shares"."acknowledgement") <= 2000))
);
--> statement-breakpoint
CREATE TABLE "signoffs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"workspace_id" uuid NOT NULL,
	"scenario_id" uuid NOT NULL,
	"version_number" integer NOT NULL,
	"decision" text NOT NULL,
	"reason" text DEFAULT '' NOT NULL,
	"decided_by" text,
	"decided_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "signoffs_decision_check" CHECK ("signoffs"."decision" in ('signed_off', 'declined')),
	CONSTRAINT "signoffs_reason_check" CHECK ("signoffs"."decision" <> 'declined' or length(trim("signoffs"."reason")) > 0),
	CONSTRAINT "signoffs_reason_length_check" CHECK (length("signoffs"."reason") <= 4000)
);
--> statement-breakpoint
ALTER TABLE "comments" ADD CONSTRAINT "comments_workspace_id_workspaces_id_fk" FOREIGN KEY ("workspace_id") REFERENCES "public"."workspaces"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "comments" ADD CONSTRAINT "comments_parent_id_comments_id_fk" FOREIGN KEY ("parent_id") REFERENCES "public"."comments"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "comments" ADD CONSTRAINT "comments_comparison_id_comparisons_id_fk" FOREIGN KEY ("comparison_id") REFERENCES "public"."comparisons"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "comments" ADD CONSTRAINT "comments_author_id_user_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "comments" ADD CONSTRAINT "comments_version_fkey" FOREIGN KEY ("scenario_id","version_number") REFERENCES "public"."scenario_versions"("scenario_id","number") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "comparison_versions" ADD CONSTRAINT "comparison_versions_comparison_id_comparisons_id_fk" FOREIGN KEY ("comparison_id") REFERENCES "public"."comparisons"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "comparison_versions" ADD CONSTRAINT "comparison_versions_version_fkey" FOREIGN KEY ("scenario_id","version_number") REFERENCES "public"."scenario_versions"("scenario_id","number") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "comparisons" ADD CONSTRAINT "comparisons_workspace_id_workspaces_id_fk" FOREIGN KEY ("workspace_id") REFERENCES "public"."workspaces"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "comparisons" ADD CONSTRAINT "comparisons_created_by_user_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "notifications" ADD CONSTRAINT "notifications_workspace_id_workspaces_id_fk" FOREIGN KEY ("workspace_id") REFERENCES "public"."workspaces"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "notifications" ADD CONSTRAINT "notifications_user_id_user_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "notifications" ADD CONSTRAINT "notifications_actor_id_user_id_fk" FOREIGN KEY ("actor_id") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "share_recipients" ADD CONSTRAINT "share_recipients_share_id_shares_id_fk" FOREIGN KEY ("share_id") REFERENCES "public"."shares"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "share_recipients" ADD CONSTRAINT "share_recipients_user_id_user_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "shares" ADD CONSTRAINT "shares_workspace_id_workspaces_id_fk" FOREIGN KEY ("workspace_id") REFERENCES "public"."workspaces"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "shares" ADD CONSTRAINT "shares_scenario_id_scenarios_id_fk" FOREIGN KEY ("scenario_id") REFERENCES "public"."scenarios"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "shares" ADD CONSTRAINT "shares_comparison_id_comparisons_id_fk" FOREIGN KEY ("comparison_id") REFERENCES "public"."comparisons"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "shares" ADD CONSTRAINT "shares_shared_by_user_id_fk" FOREIGN KEY ("shared_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "signoffs" ADD CONSTRAINT "signoffs_workspace_id_workspaces_id_fk" FOREIGN KEY ("workspace_id") REFERENCES "public"."workspaces"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "signoffs" ADD CONSTRAINT "signoffs_decided_by_user_id_fk" FOREIGN KEY ("decided_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "signoffs" ADD CONSTRAINT "signoffs_version_fkey" FOREIGN KEY ("scenario_id","version_number") REFERENCES "public"."scenario_versions"("scenario_id","number") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "comments_version_idx" ON "comments" USING btree ("scenario_id","version_number","created_at");--> statement-breakpoint
CREATE INDEX "comparisons_workspace_idx" ON "comparisons" USING btree ("workspace_id","created_at");--> statement-breakpoint
CREATE INDEX "notifications_user_idx" ON "notifications" USING btree ("user_id","workspace_id","created_at");--> statement-breakpoint
CREATE INDEX "share_recipients_user_idx" ON "share_recipients" USING btree ("user_id");--> statement-breakpoint
CREATE INDEX "shares_workspace_idx" ON "shares" USING btree ("workspace_id","created_at");--> statement-breakpoint
CREATE INDEX "signoffs_version_idx" ON "signoffs" USING btree ("scenario_id","version_number","decided_at");
CREATE TABLE "fits" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"workspace_id" uuid NOT NULL,
	"dataset_id" uuid NOT NULL,
	"name" text NOT NULL,
	"status" text DEFAULT 'draft' NOT NULL,
	"specification" jsonb NOT NULL,
	"input" jsonb NOT NULL,
	"covariance_type" text NOT NULL,
	"newey_west_lag" integer,
	"confidence_level" double precision NOT NULL,
	"record" jsonb NOT NULL,
	"report" jsonb NOT NULL,
	"record_checksum" text NOT NULL,
	"author_id" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"submitted_at" timestamp with time zone,
	"approved_at" timestamp with time zone,
	"approved_by" text,
	"retired_at" timestamp with time zone,
	"retired_by" text,
	CONSTRAINT "fits_status_check" CHECK ("fits"."status" in ('draft', 'in_review', 'changes_requested', 'approved', 'retired')),
	CONSTRAINT "fits_covariance_check" CHECK ("fits"."covariance_type" in ('classical', 'hc3', 'newey-west')),
	CONSTRAINT "fits_level_check" CHECK ("fits"."confidence_level" > 0 and "fits"."confidence_level" < 1),
	CONSTRAINT "fits_checksum_check" CHECK ("fits"."record" ->> 'checksum' = "fits"."record_checksum"),
	CONSTRAINT "fits_not_self_approved_check" CHECK ("fits"."approved_by" is null or "fits"."author_id" is null or "fits"."approved_by" <> "fits"."author_id"),
	CONSTRAINT "fits_approved_has_approver_check" CHECK ("fits"."status" <> 'approved' or ("fits"."approved_by" is not null and "fits"."approved_at" is not null)),
	CONSTRAINT "fits_retired_has_time_check" CHECK ("fits"."status" <> 'retired' or "fits"."retired_at" is not null)
);
--> statement-breakpoint
ALTER TABLE "fits" ADD CONSTRAINT "fits_workspace_id_workspaces_id_fk" FOREIGN KEY ("workspace_id") REFERENCES "public"."workspaces"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "fits" ADD CONSTRAINT "fits_dataset_id_datasets_id_fk" FOREIGN KEY ("dataset_id") REFERENCES "public"."datasets"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "fits" ADD CONSTRAINT "fits_author_id_user_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "fits" ADD CONSTRAINT "fits_approved_by_user_id_fk" FOREIGN KEY ("approved_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "fits" ADD CONSTRAINT "fits_retired_by_user_id_fk" FOREIGN KEY ("retired_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "fits_workspace_status_idx" ON "fits" USING btree ("workspace_id","status","updated_at");--> statement-breakpoint
CREATE INDEX "fits_dataset_idx" ON "fits" USING btree ("dataset_id");
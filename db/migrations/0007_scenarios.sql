CREATE TABLE "scenario_versions" (
	"scenario_id" uuid NOT NULL,
	"number" integer NOT NULL,
	"allocation" jsonb NOT NULL,
	"settings" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"mode" text NOT NULL,
	"total_cents" bigint NOT NULL,
	"ceiling_cents" bigint,
	"horizon_periods" integer NOT NULL,
	"controls" jsonb NOT NULL,
	"prediction" jsonb NOT NULL,
	"warnings" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"fit_checksum" text NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"author_id" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"based_on" integer,
	"restored_from" integer,
	CONSTRAINT "scenario_versions_pkey" PRIMARY KEY("scenario_id","number"),
	CONSTRAINT "scenario_versions_number_check" CHECK ("scenario_versions"."number" >= 1),
	CONSTRAINT "scenario_versions_based_on_check" CHECK ("scenario_versions"."based_on" is null or ("scenario_versions"."based_on" >= 1 and "scenario_versions"."based_on" < "scenario_versions"."number")),
	CONSTRAINT "scenario_versions_restored_from_check" CHECK ("scenario_versions"."restored_from" is null or ("scenario_versions"."restored_from" >= 1 and "scenario_versions"."restored_from" < "scenario_versions"."number")),
	CONSTRAINT "scenario_versions_mode_check" CHECK ("scenario_versions"."mode" in ('fixed', 'growing')),
	CONSTRAINT "scenario_versions_total_check" CHECK ("scenario_versions"."total_cents" >= 0),
	CONSTRAINT "scenario_versions_ceiling_check" CHECK (("scenario_versions"."mode" = 'fixed' and "scenario_versions"."ceiling_cents" is null) or ("scenario_versions"."mode" = 'growing' and "scenario_versions"."ceiling_cents" >= "scenario_versions"."total_cents")),
	CONSTRAINT "scenario_versions_horizon_check" CHECK ("scenario_versions"."horizon_periods" between 1 and 520)
);
--> statement-breakpoint
CREATE TABLE "scenarios" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"workspace_id" uuid NOT NULL,
	"fit_id" uuid NOT NULL,
	"name" text NOT NULL,
	"owner_id" text,
	"horizon_periods" integer NOT NULL,
	"baseline" jsonb NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "scenarios_horizon_check" CHECK ("scenarios"."horizon_periods" between 1 and 520),
	CONSTRAINT "scenarios_name_check" CHECK (length(trim("scenarios"."name")) between 1 and 200)
);
--> statement-breakpoint
ALTER TABLE "scenario_versions" ADD CONSTRAINT "scenario_versions_scenario_id_scenarios_id_fk" FOREIGN KEY ("scenario_id") REFERENCES "public"."scenarios"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scenario_versions" ADD CONSTRAINT "scenario_versions_author_id_user_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scenarios" ADD CONSTRAINT "scenarios_workspace_id_workspaces_id_fk" FOREIGN KEY ("workspace_id") REFERENCES "public"."workspaces"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scenarios" ADD CONSTRAINT "scenarios_fit_id_fits_id_fk" FOREIGN KEY ("fit_id") REFERENCES "public"."fits"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "scenarios" ADD CONSTRAINT "scenarios_owner_id_user_id_fk" FOREIGN KEY ("owner_id") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "scenarios_workspace_fit_idx" ON "scenarios" USING btree ("workspace_id","fit_id","created_at");
CREATE TABLE "dataset_columns" (
	"dataset_id" uuid NOT NULL,
	"position" integer NOT NULL,
	"name" text NOT NULL,
	"kind" text NOT NULL,
	"role" text,
	"unit" text,
	"numeric_count" integer NOT NULL,
	"text_count" integer NOT NULL,
	"missing_count" integer NOT NULL,
	"min" double precision,
	"max" double precision,
	"mean" double precision,
	"std" double precision,
	"first_period" text,
	"last_period" text,
	"sample" text[] DEFAULT '{}'::text[] NOT NULL,
	CONSTRAINT "dataset_columns_pkey" PRIMARY KEY("dataset_id","position"),
	CONSTRAINT "dataset_columns_kind_check" CHECK ("dataset_columns"."kind" in ('numeric', 'period', 'text')),
	CONSTRAINT "dataset_columns_role_check" CHECK ("dataset_columns"."role" is null or "dataset_columns"."role" in ('outcome', 'spend', 'control', 'period', 'ignored'))
);
--> statement-breakpoint
CREATE TABLE "dataset_files" (
	"dataset_id" uuid NOT NULL,
	"seq" integer NOT NULL,
	"bytes" "bytea" NOT NULL,
	CONSTRAINT "dataset_files_pkey" PRIMARY KEY("dataset_id","seq")
);
--> statement-breakpoint
CREATE TABLE "dataset_rows" (
	"dataset_id" uuid NOT NULL,
	"row_number" integer NOT NULL,
	"line" integer NOT NULL,
	"numbers" double precision[] NOT NULL,
	"texts" text[],
	CONSTRAINT "dataset_rows_pkey" PRIMARY KEY("dataset_id","row_number")
);
--> statement-breakpoint
CREATE TABLE "datasets" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"workspace_id" uuid NOT NULL,
	"name" text NOT NULL,
	"original_filename" text NOT NULL,
	"byte_size" bigint NOT NULL,
	"sha256" text NOT NULL,
	"row_count" integer NOT NULL,
	"column_count" integer NOT NULL,
	"delimiter" text NOT NULL,
	"has_bom" boolean NOT NULL,
	"line_ending" text NOT NULL,
	"status" text NOT NULL,
	"missing_policy" text DEFAULT 'reject' NOT NULL,
	"dropped_row_count" integer DEFAULT 0 NOT NULL,
	"min_rows" integer,
	"date_order" text DEFAULT 'YMD' NOT NULL,
	"uploaded_by" text,
	"uploaded_at" timestamp with time zone DEFAULT now() NOT NULL,
	"roles_assigned_by" text,
	"roles_assigned_at" timestamp with time zone,
	CONSTRAINT "datasets_status_check" CHECK ("datasets"."status" in ('needs-roles', 'ready')),
	CONSTRAINT "datasets_missing_policy_check" CHECK ("datasets"."missing_policy" in ('reject', 'drop-incomplete-rows')),
	CONSTRAINT "datasets_sha256_check" CHECK ("datasets"."sha256" ~ '^[0-9a-f]{64}$'),
	CONSTRAINT "datasets_delimiter_check" CHECK ("datasets"."delimiter" in (',', chr(59), chr(9)))
);
--> statement-breakpoint
ALTER TABLE "dataset_columns" ADD CONSTRAINT "dataset_columns_dataset_id_datasets_id_fk" FOREIGN KEY ("dataset_id") REFERENCES "public"."datasets"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dataset_files" ADD CONSTRAINT "dataset_files_dataset_id_datasets_id_fk" FOREIGN KEY ("dataset_id") REFERENCES "public"."datasets"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "datasets" ADD CONSTRAINT "datasets_workspace_id_workspaces_id_fk" FOREIGN KEY ("workspace_id") REFERENCES "public"."workspaces"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "datasets" ADD CONSTRAINT "datasets_uploaded_by_user_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "datasets" ADD CONSTRAINT "datasets_roles_assigned_by_user_id_fk" FOREIGN KEY ("roles_assigned_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "datasets_workspace_uploaded_idx" ON "datasets" USING btree ("workspace_id","uploaded_at");--> statement-breakpoint
CREATE INDEX "datasets_workspace_sha256_idx" ON "datasets" USING btree ("workspace_id","sha256");
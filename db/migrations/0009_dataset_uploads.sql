CREATE TABLE "dataset_upload_chunks" (
	"upload_id" uuid NOT NULL,
	"seq" integer NOT NULL,
	"bytes" "bytea" NOT NULL,
	CONSTRAINT "dataset_upload_chunks_pkey" PRIMARY KEY("upload_id","seq")
);
--> statement-breakpoint
CREATE TABLE "dataset_uploads" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"workspace_id" uuid NOT NULL,
	"created_by" text,
	"original_filename" text NOT NULL,
	"name" text,
	"options" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"declared_bytes" bigint,
	"received_bytes" bigint DEFAULT 0 NOT NULL,
	"chunk_count" integer DEFAULT 0 NOT NULL,
	"state" text DEFAULT 'receiving' NOT NULL,
	"abort_reason" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "dataset_uploads_state_check" CHECK ("dataset_uploads"."state" in ('receiving', 'received', 'aborted'))
);
--> statement-breakpoint
ALTER TABLE "dataset_upload_chunks" ADD CONSTRAINT "dataset_upload_chunks_upload_id_dataset_uploads_id_fk" FOREIGN KEY ("upload_id") REFERENCES "public"."dataset_uploads"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dataset_uploads" ADD CONSTRAINT "dataset_uploads_workspace_id_workspaces_id_fk" FOREIGN KEY ("workspace_id") REFERENCES "public"."workspaces"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dataset_uploads" ADD CONSTRAINT "dataset_uploads_created_by_user_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."user"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "dataset_uploads_updated_idx" ON "dataset_uploads" USING btree ("updated_at");--> statement-breakpoint
-- Staged bytes are stored uncompressed, like dataset_files (pglz gains little on CSV and costs seconds).
ALTER TABLE "dataset_upload_chunks" ALTER COLUMN "bytes" SET STORAGE EXTERNAL;

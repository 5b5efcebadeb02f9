-- Staged uploads are transient (the ingest deletes them whatever happens; an upload in flight when the
-- server crashes has failed anyway): no WAL for them. That halves what a large upload writes to WAL
-- (its bytes are logged once, as the dataset's original file). After a crash PostgreSQL empties
-- unlogged tables, which only removes uploads nobody can finish. The chunks reference the uploads, so
-- the chunks go first (a logged table may not reference an unlogged one).
ALTER TABLE "dataset_upload_chunks" SET UNLOGGED;
--> statement-breakpoint
ALTER TABLE "dataset_uploads" SET UNLOGGED;

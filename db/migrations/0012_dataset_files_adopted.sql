-- A large upload now writes its bytes once, straight into dataset_files under the upload's id, and the
-- dataset its ingest creates takes that id: the original file is adopted instead of copied from a
-- staging table (one pass of the file less; the ingest's transaction no longer copies it at the end).
DROP TABLE "dataset_upload_chunks" CASCADE;--> statement-breakpoint
-- Chunks of an upload in progress have no dataset yet, so dataset_files cannot reference datasets.
ALTER TABLE "dataset_files" DROP CONSTRAINT "dataset_files_dataset_id_datasets_id_fk";--> statement-breakpoint
-- What the foreign key's ON DELETE CASCADE did, now by the trigger that already deletes a dataset's
-- rows (also when a workspace deletion cascades to its datasets).
CREATE OR REPLACE FUNCTION "datasets_delete_rows"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  DELETE FROM "dataset_rows" WHERE "dataset_id" = OLD."id";
  DELETE FROM "dataset_files" WHERE "dataset_id" = OLD."id";
  RETURN OLD;
END
$$;

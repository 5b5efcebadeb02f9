-- Approved fits are frozen, and so is the data they were fitted on. The API refuses these changes
-- first with a clear 409; these triggers make the database refuse them too, whoever connects.
-- SQLSTATE 23001 (restrict_violation) with a message that says what is refused and why.

CREATE OR REPLACE FUNCTION fits_freeze_guard() RETURNS trigger
LANGUAGE plpgsql AS $$
DECLARE
  changed text[];
BEGIN
  IF TG_OP = 'DELETE' THEN
    IF OLD.status IN ('approved', 'retired') THEN
      RAISE EXCEPTION 'fit % is %: approved and retired fits cannot be deleted', OLD.id, OLD.status
        USING ERRCODE = 'restrict_violation', HINT = 'Retire an approved fit instead of deleting it.';
    END IF;
    RETURN OLD;
  END IF;

  IF OLD.status = 'retired' THEN
    RAISE EXCEPTION 'fit % is retired: a retired fit cannot be changed', OLD.id
      USING ERRCODE = 'restrict_violation';
  END IF;

  IF OLD.status = 'approved' THEN
    SELECT array_agg(key ORDER BY key) INTO changed
    FROM jsonb_each(to_jsonb(NEW)) AS n(key, value)
    WHERE key NOT IN ('status', 'retired_at', 'retired_by', 'updated_at')
      AND n.value IS DISTINCT FROM (to_jsonb(OLD) -> key);
    IF changed IS NOT NULL THEN
      RAISE EXCEPTION 'fit % is approved: its numbers and data are frozen (refused change to %)', OLD.id, array_to_string(changed, ', ')
        USING ERRCODE = 'restrict_violation', HINT = 'Build a new fit instead; an approved fit can only be retired.';
    END IF;
    IF NEW.status <> 'approved' AND NEW.status <> 'retired' THEN
      RAISE EXCEPTION 'fit % is approved: it can only move to retired (not %)', OLD.id, NEW.status
        USING ERRCODE = 'restrict_violation';
    END IF;
    IF NEW.status = 'approved' AND (NEW.retired_at IS DISTINCT FROM OLD.retired_at OR NEW.retired_by IS DISTINCT FROM OLD.retired_by) THEN
      RAISE EXCEPTION 'fit % is approved: retired_at and retired_by change only when it is retired', OLD.id
        USING ERRCODE = 'restrict_violation';
    END IF;
  END IF;
  RETURN NEW;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER fits_freeze BEFORE UPDATE OR DELETE ON fits
  FOR EACH ROW EXECUTE FUNCTION fits_freeze_guard();
--> statement-breakpoint
CREATE OR REPLACE FUNCTION fits_no_truncate() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  IF EXISTS (SELECT 1 FROM fits WHERE status IN ('approved', 'retired')) THEN
    RAISE EXCEPTION 'fits holds approved or retired fits, which cannot be deleted (TRUNCATE refused)'
      USING ERRCODE = 'restrict_violation';
  END IF;
  RETURN NULL;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER fits_no_truncate BEFORE TRUNCATE ON fits
  FOR EACH STATEMENT EXECUTE FUNCTION fits_no_truncate();
--> statement-breakpoint

-- The data of a dataset used by an approved (or retired) fit: the dataset row, its original file,
-- its column roles and units, and its rows.
CREATE OR REPLACE FUNCTION dataset_frozen_by_fit(p_dataset_id uuid) RETURNS uuid
LANGUAGE sql STABLE AS $$
  SELECT id FROM fits WHERE dataset_id = p_dataset_id AND status IN ('approved', 'retired') ORDER BY approved_at NULLS LAST LIMIT 1
$$;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION datasets_freeze_guard() RETURNS trigger
LANGUAGE plpgsql AS $$
DECLARE
  target uuid;
  fit uuid;
BEGIN
  IF TG_TABLE_NAME = 'datasets' THEN
    target := OLD.id;
  ELSIF TG_OP = 'INSERT' THEN
    target := NEW.dataset_id;
  ELSE
    target := OLD.dataset_id;
  END IF;
  fit := dataset_frozen_by_fit(target);
  IF fit IS NOT NULL THEN
    RAISE EXCEPTION 'dataset % is used by approved fit %: its rows, columns and file are frozen (% on % refused)', target, fit, TG_OP, TG_TABLE_NAME
      USING ERRCODE = 'restrict_violation', HINT = 'Upload the changed data as a new spend history.';
  END IF;
  IF TG_OP = 'DELETE' THEN
    RETURN OLD;
  END IF;
  RETURN NEW;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER datasets_freeze BEFORE UPDATE OR DELETE ON datasets
  FOR EACH ROW EXECUTE FUNCTION datasets_freeze_guard();
--> statement-breakpoint
CREATE TRIGGER dataset_columns_freeze BEFORE INSERT OR UPDATE OR DELETE ON dataset_columns
  FOR EACH ROW EXECUTE FUNCTION datasets_freeze_guard();
--> statement-breakpoint
CREATE TRIGGER dataset_files_freeze BEFORE INSERT OR UPDATE OR DELETE ON dataset_files
  FOR EACH ROW EXECUTE FUNCTION datasets_freeze_guard();
--> statement-breakpoint
-- dataset_rows can hold millions of rows per dataset, so it is checked once per statement over the
-- changed rows (transition tables) rather than once per row. INSERT is not checked: rows are only
-- written in the transaction that creates their dataset, which no fit can have used yet, and a
-- per-row or transition-table check would slow every large upload's COPY.
CREATE OR REPLACE FUNCTION dataset_rows_freeze_guard() RETURNS trigger
LANGUAGE plpgsql AS $$
DECLARE
  target uuid;
  fit uuid;
BEGIN
  SELECT f.dataset_id, f.id INTO target, fit
  FROM fits f
  WHERE f.status IN ('approved', 'retired')
    AND f.dataset_id IN (SELECT DISTINCT dataset_id FROM changed_rows)
  LIMIT 1;
  IF fit IS NOT NULL THEN
    RAISE EXCEPTION 'dataset % is used by approved fit %: its rows, columns and file are frozen (% on dataset_rows refused)', target, fit, TG_OP
      USING ERRCODE = 'restrict_violation', HINT = 'Upload the changed data as a new spend history.';
  END IF;
  RETURN NULL;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER dataset_rows_freeze_update AFTER UPDATE ON dataset_rows
  REFERENCING OLD TABLE AS changed_rows FOR EACH STATEMENT EXECUTE FUNCTION dataset_rows_freeze_guard();
--> statement-breakpoint
CREATE TRIGGER dataset_rows_freeze_delete AFTER DELETE ON dataset_rows
  REFERENCING OLD TABLE AS changed_rows FOR EACH STATEMENT EXECUTE FUNCTION dataset_rows_freeze_guard();
--> statement-breakpoint
CREATE OR REPLACE FUNCTION datasets_no_truncate() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  IF EXISTS (SELECT 1 FROM fits WHERE status IN ('approved', 'retired')) THEN
    RAISE EXCEPTION '% holds data of approved fits, which is frozen (TRUNCATE refused)', TG_TABLE_NAME
      USING ERRCODE = 'restrict_violation';
  END IF;
  RETURN NULL;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER datasets_no_truncate BEFORE TRUNCATE ON datasets FOR EACH STATEMENT EXECUTE FUNCTION datasets_no_truncate();
--> statement-breakpoint
CREATE TRIGGER dataset_columns_no_truncate BEFORE TRUNCATE ON dataset_columns FOR EACH STATEMENT EXECUTE FUNCTION datasets_no_truncate();
--> statement-breakpoint
CREATE TRIGGER dataset_files_no_truncate BEFORE TRUNCATE ON dataset_files FOR EACH STATEMENT EXECUTE FUNCTION datasets_no_truncate();
--> statement-breakpoint
CREATE TRIGGER dataset_rows_no_truncate BEFORE TRUNCATE ON dataset_rows FOR EACH STATEMENT EXECUTE FUNCTION datasets_no_truncate();

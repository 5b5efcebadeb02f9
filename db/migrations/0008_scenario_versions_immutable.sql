-- Scenario versions are immutable: a saved version is what was planned, predicted and possibly
-- shared or signed off. Changes are new versions (a restore copies an old one). The API never
-- updates or deletes them; this trigger makes the database refuse it too, whoever connects.
-- SQLSTATE 23001 (restrict_violation) with a message that says what is refused and why.

CREATE OR REPLACE FUNCTION scenario_versions_immutable_guard() RETURNS trigger
LANGUAGE plpgsql AS $$
BEGIN
  RAISE EXCEPTION 'scenario version % of scenario % is immutable: % refused', OLD.number, OLD.scenario_id, lower(TG_OP)
    USING ERRCODE = 'restrict_violation', HINT = 'Save a new version instead (restore copies an old one).';
END;
$$;
--> statement-breakpoint
CREATE TRIGGER scenario_versions_immutable
  BEFORE UPDATE OR DELETE ON scenario_versions
  FOR EACH ROW EXECUTE FUNCTION scenario_versions_immutable_guard();

-- A saved revision is an immutable snapshot: its number, content, hash, results and message never change.
-- Only the review state moves, and once approved nothing about it changes. A user's deletion may still set
-- author_id / approved_by to NULL (the foreign keys' ON DELETE SET NULL). docs/decisions/005-revisions.md.
CREATE OR REPLACE FUNCTION diagram_revisions_guard() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF NEW.diagram_id IS DISTINCT FROM OLD.diagram_id OR NEW.number IS DISTINCT FROM OLD.number
     OR NEW.content IS DISTINCT FROM OLD.content OR NEW.content_hash IS DISTINCT FROM OLD.content_hash
     OR NEW.results_summary IS DISTINCT FROM OLD.results_summary OR NEW.message IS DISTINCT FROM OLD.message
     OR NEW.restored_from IS DISTINCT FROM OLD.restored_from OR NEW.created_at IS DISTINCT FROM OLD.created_at
     OR (NEW.author_id IS DISTINCT FROM OLD.author_id AND NEW.author_id IS NOT NULL) THEN
    RAISE EXCEPTION 'diagram revisions are immutable (revision % of diagram %)', OLD.number, OLD.diagram_id USING ERRCODE = 'check_violation';
  END IF;
  IF OLD.state = 'approved' AND (NEW.state IS DISTINCT FROM OLD.state OR NEW.approved_at IS DISTINCT FROM OLD.approved_at
     OR (NEW.approved_by IS DISTINCT FROM OLD.approved_by AND NEW.approved_by IS NOT NULL)) THEN
    RAISE EXCEPTION 'revision % of diagram % is approved and locked', OLD.number, OLD.diagram_id USING ERRCODE = 'check_violation';
  END IF;
  RETURN NEW;
END;
$$;
--> statement-breakpoint
CREATE TRIGGER diagram_revisions_guard BEFORE UPDATE ON diagram_revisions FOR EACH ROW EXECUTE FUNCTION diagram_revisions_guard();

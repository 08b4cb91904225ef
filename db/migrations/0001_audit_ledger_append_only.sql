-- The audit ledger is append-only (21 CFR 11.10(e), EU GMP Annex 11 §9): refuse edits and deletions.
CREATE TRIGGER audit_events_no_update BEFORE UPDATE ON audit_events
BEGIN
  SELECT RAISE(ABORT, 'audit events are append-only');
END;
--> statement-breakpoint
CREATE TRIGGER audit_events_no_delete BEFORE DELETE ON audit_events
BEGIN
  SELECT RAISE(ABORT, 'audit events are append-only');
END;
--> statement-breakpoint
-- Signatures and archived reports are evidence too: never rewritten in place.
CREATE TRIGGER signatures_no_update BEFORE UPDATE ON signatures
BEGIN
  SELECT RAISE(ABORT, 'signatures cannot be changed');
END;
--> statement-breakpoint
CREATE TRIGGER signatures_no_delete BEFORE DELETE ON signatures
BEGIN
  SELECT RAISE(ABORT, 'signatures cannot be deleted');
END;
--> statement-breakpoint
CREATE TRIGGER reports_no_update BEFORE UPDATE ON reports
BEGIN
  SELECT RAISE(ABORT, 'archived reports cannot be changed');
END;
--> statement-breakpoint
CREATE TRIGGER reports_no_delete BEFORE DELETE ON reports
BEGIN
  SELECT RAISE(ABORT, 'archived reports cannot be deleted');
END;

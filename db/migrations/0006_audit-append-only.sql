-- The audit log is append-only: the database itself refuses to change or remove an entry (issue 11 §4).
-- Projects are archived, never deleted, and accounts are disabled, never removed, so no cascade reaches it.
CREATE TRIGGER `audit_log_no_update` BEFORE UPDATE ON `audit_log`
BEGIN
  SELECT RAISE(ABORT, 'audit_log is append-only: entries cannot be changed');
END;--> statement-breakpoint
CREATE TRIGGER `audit_log_no_delete` BEFORE DELETE ON `audit_log`
BEGIN
  SELECT RAISE(ABORT, 'audit_log is append-only: entries cannot be deleted');
END;

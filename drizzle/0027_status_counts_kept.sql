CREATE TABLE "tool_state_counts" (
	"base_status" text NOT NULL,
	"cal_next_due" date,
	"cal_result" text,
	"usage_exhausted" boolean NOT NULL,
	"usage_warn" boolean NOT NULL,
	"n" integer NOT NULL
);
--> statement-breakpoint
-- The home pages' and the register's counts by status (docs/decisions/027-status-counts-kept.md): how many tools
-- stand at each combination of the columns the date-dependent status reads, kept from tool_states by statement
-- triggers in the same transaction. Each statement adds one signed piece per combination it changed; nothing is
-- updated in place, so two transactions never wait on each other's counts (nor deadlock on them).
CREATE OR REPLACE FUNCTION tool_state_counts_after_write() RETURNS trigger
LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
BEGIN
  IF TG_OP = 'INSERT' THEN
    INSERT INTO tool_state_counts (base_status, cal_next_due, cal_result, usage_exhausted, usage_warn, n)
    SELECT base_status, cal_next_due, cal_result, usage_exhausted, usage_warn, count(*)
    FROM new_rows GROUP BY 1, 2, 3, 4, 5;
  ELSIF TG_OP = 'DELETE' THEN
    INSERT INTO tool_state_counts (base_status, cal_next_due, cal_result, usage_exhausted, usage_warn, n)
    SELECT base_status, cal_next_due, cal_result, usage_exhausted, usage_warn, -count(*)
    FROM old_rows GROUP BY 1, 2, 3, 4, 5;
  ELSE
    -- A tool whose combination did not change (a check-out, a new custodian) nets to nothing and adds no piece.
    INSERT INTO tool_state_counts (base_status, cal_next_due, cal_result, usage_exhausted, usage_warn, n)
    SELECT base_status, cal_next_due, cal_result, usage_exhausted, usage_warn, sum(d)
    FROM (
      SELECT o.base_status, o.cal_next_due, o.cal_result, o.usage_exhausted, o.usage_warn, -1 AS d FROM old_rows o
      UNION ALL
      SELECT w.base_status, w.cal_next_due, w.cal_result, w.usage_exhausted, w.usage_warn, 1 AS d FROM new_rows w
    ) x
    GROUP BY 1, 2, 3, 4, 5
    HAVING sum(d) <> 0;
  END IF;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER tool_state_counts_ins AFTER INSERT ON tool_states REFERENCING NEW TABLE AS new_rows
  FOR EACH STATEMENT EXECUTE FUNCTION tool_state_counts_after_write();
--> statement-breakpoint
CREATE TRIGGER tool_state_counts_upd AFTER UPDATE ON tool_states REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows
  FOR EACH STATEMENT EXECUTE FUNCTION tool_state_counts_after_write();
--> statement-breakpoint
CREATE TRIGGER tool_state_counts_del AFTER DELETE ON tool_states REFERENCING OLD TABLE AS old_rows
  FOR EACH STATEMENT EXECUTE FUNCTION tool_state_counts_after_write();
--> statement-breakpoint
-- Replaces the pieces with one sum per combination (dropping combinations that sum to nothing). One fold at a time
-- (a second caller returns at once); pieces added meanwhile by transactions not yet committed are not seen by the
-- delete and stay as they are, so every piece is counted once, before or after. Readers see the pieces before the
-- fold or the sums after it, never a mix: the delete and the insert are one statement.
CREATE OR REPLACE FUNCTION tool_state_counts_fold() RETURNS void
LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
BEGIN
  IF NOT pg_try_advisory_xact_lock(7220452) THEN
    RETURN;
  END IF;
  WITH gone AS (DELETE FROM tool_state_counts RETURNING *)
  INSERT INTO tool_state_counts (base_status, cal_next_due, cal_result, usage_exhausted, usage_warn, n)
  SELECT base_status, cal_next_due, cal_result, usage_exhausted, usage_warn, sum(n)
  FROM gone GROUP BY 1, 2, 3, 4, 5 HAVING sum(n) <> 0;
END $$;
--> statement-breakpoint
-- The tools already on record (the table is new and empty; the migration runs in one transaction).
INSERT INTO tool_state_counts (base_status, cal_next_due, cal_result, usage_exhausted, usage_warn, n)
SELECT base_status, cal_next_due, cal_result, usage_exhausted, usage_warn, count(*)
FROM tool_states GROUP BY 1, 2, 3, 4, 5;

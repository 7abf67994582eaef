-- Indexed tool status (docs/decisions/013-indexed-status.md): tool_states holds, per tool, the inputs of
-- shared/tools/tool-status.ts as of every event recorded so far and the part of the status that does not
-- depend on the date. One refresh function computes a set of tools' rows; statement triggers with
-- transition tables call it in the transaction of every write that changes an input, so set-based
-- writes (imports, the bench filler) keep it right too and no service can forget it.

-- The inputs of deriveToolStatus "now" (every event so far), the same selections as
-- server/modules/tools/tool-status.service.ts statusesFor with no instant to cut them at.
CREATE OR REPLACE FUNCTION tenthwise_refresh_tool_states(ids uuid[]) RETURNS void
LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
BEGIN
  IF ids IS NULL OR cardinality(ids) = 0 THEN
    RETURN;
  END IF;
  -- The tool's own row lock (the one lockTool takes): concurrent writes about one tool refresh one after
  -- another, and the statement below (a fresh snapshot) reads what the earlier one committed.
  PERFORM 1 FROM tools t WHERE t.id = ANY(ids) ORDER BY t.id FOR NO KEY UPDATE;

  INSERT INTO tool_states AS ts (
    tool_id, lifecycle, calibration_required, usage_limit,
    cal_id, cal_performed_at, cal_result, cal_next_due, cal_limited_min, cal_limited_max, cal_limited_note,
    pending_performed_at, pending_lab, uses_since_cal, failed_check_at, failed_check_deviation,
    hold_since, hold_reason, lab_since, lab_name, lab_expected_back,
    custody_checkout_id, custody_user_id, custody_since, custody_due_back,
    settled_at, base_status, usage_exhausted, usage_warn)
  SELECT g.tool_id, g.lifecycle, g.calibration_required, g.usage_limit,
    g.cal_id, g.cal_performed_at, g.cal_result, g.cal_next_due, g.cal_limited_min, g.cal_limited_max, g.cal_limited_note,
    g.pending_performed_at, g.pending_lab, g.uses, g.failed_check_at, g.failed_check_deviation,
    g.hold_since, g.hold_reason, g.lab_since, g.lab_name, g.lab_expected_back,
    g.custody_checkout_id, g.custody_user_id, g.custody_since, g.custody_due_back,
    g.settled_at,
    -- deriveToolStatus's rules in its order, down to the ones the date decides.
    CASE
      WHEN g.lifecycle = 'retired' THEN 'retired'
      WHEN g.lifecycle = 'lost' THEN 'lost'
      WHEN g.lab_since IS NOT NULL THEN 'at_calibration'
      WHEN g.hold_since IS NOT NULL THEN 'quarantined'
      WHEN g.failed_check_at IS NOT NULL THEN 'out_of_tolerance'
      WHEN g.cal_result = 'fail' THEN 'out_of_tolerance'
      WHEN g.lifecycle = 'inactive' THEN 'inactive'
      WHEN NOT g.calibration_required THEN 'reference_only'
      WHEN g.cal_id IS NULL THEN 'never_calibrated'
      ELSE 'calibrated'
    END,
    g.cal_id IS NOT NULL AND g.usage_limit IS NOT NULL AND g.uses >= g.usage_limit,
    -- The last tenth of a usage limit (common practice, no source), as deriveToolStatus warns.
    g.cal_id IS NOT NULL AND g.usage_limit IS NOT NULL AND greatest(0, g.usage_limit - g.uses) * 10 <= g.usage_limit
  FROM (
    SELECT t.id AS tool_id, t.calibration_required, t.usage_limit,
      coalesce(le.lifecycle, 'active') AS lifecycle,
      cal.id AS cal_id, cal.performed_at AS cal_performed_at, cal.result AS cal_result, cal.next_due_at AS cal_next_due,
      CASE WHEN cal.limited_min IS NOT NULL AND cal.limited_max IS NOT NULL THEN cal.limited_min END AS cal_limited_min,
      CASE WHEN cal.limited_min IS NOT NULL AND cal.limited_max IS NOT NULL THEN cal.limited_max END AS cal_limited_max,
      cal.limited_note AS cal_limited_note,
      CASE WHEN cal.id IS NULL OR pend.performed_at > cal.performed_at THEN pend.performed_at END AS pending_performed_at,
      CASE WHEN cal.id IS NULL OR pend.performed_at > cal.performed_at THEN pend.lab END AS pending_lab,
      coalesce(uses.n, 0) AS uses,
      CASE WHEN cal.id IS NULL OR chk.performed_at > cal.performed_at THEN chk.performed_at END AS failed_check_at,
      CASE WHEN cal.id IS NULL OR chk.performed_at > cal.performed_at THEN chk.deviation END AS failed_check_deviation,
      hold.placed_at AS hold_since, hold.reason AS hold_reason,
      trip.shipped_at AS lab_since, trip.lab AS lab_name, trip.expected_back_at AS lab_expected_back,
      cust.id AS custody_checkout_id, cust.user_id AS custody_user_id, cust.issued_at AS custody_since, cust.due_back_at AS custody_due_back,
      greatest(le.at, ev.cal_at, ev.review_at, ev.check_at, ev.hold_at, ev.trip_at, ev.checkout_at) AS settled_at
    FROM tools t
    LEFT JOIN LATERAL (
      SELECT e.lifecycle, e.at FROM tool_lifecycle_events e WHERE e.tool_id = t.id ORDER BY e.at DESC LIMIT 1
    ) le ON true
    LEFT JOIN LATERAL (
      SELECT c.id, c.performed_at, c.result, c.next_due_at, c.limited_min, c.limited_max, c.limited_note
      FROM calibrations c
      WHERE c.tool_id = t.id
        AND NOT EXISTS (SELECT 1 FROM calibrations s WHERE s.supersedes_id = c.id)
        AND (c.source = 'in_house' OR EXISTS (SELECT 1 FROM calibration_reviews r WHERE r.calibration_id = c.id AND r.accepted))
      ORDER BY c.performed_at DESC LIMIT 1
    ) cal ON true
    LEFT JOIN LATERAL (
      SELECT c.performed_at, coalesce(l.name, 'outside lab') AS lab
      FROM calibrations c LEFT JOIN labs l ON l.id = c.lab_id
      WHERE c.tool_id = t.id AND c.source = 'outside_lab'
        AND NOT EXISTS (SELECT 1 FROM calibration_reviews r WHERE r.calibration_id = c.id)
        AND NOT EXISTS (SELECT 1 FROM calibrations s WHERE s.supersedes_id = c.id)
      ORDER BY c.performed_at DESC LIMIT 1
    ) pend ON true
    LEFT JOIN LATERAL (
      SELECT k.performed_at, k.deviation FROM intermediate_checks k
      WHERE k.tool_id = t.id AND NOT k.passed ORDER BY k.performed_at DESC LIMIT 1
    ) chk ON true
    LEFT JOIN LATERAL (
      SELECT h.placed_at, h.reason FROM holds h WHERE h.tool_id = t.id AND h.released_at IS NULL ORDER BY h.placed_at DESC LIMIT 1
    ) hold ON true
    LEFT JOIN LATERAL (
      SELECT s.shipped_at, s.expected_back_at, l.name AS lab FROM lab_shipments s JOIN labs l ON l.id = s.lab_id
      WHERE s.tool_id = t.id AND s.received_at IS NULL ORDER BY s.shipped_at DESC LIMIT 1
    ) trip ON true
    LEFT JOIN LATERAL (
      SELECT c.id, c.user_id, c.issued_at, c.due_back_at FROM checkouts c JOIN users u ON u.id = c.user_id
      WHERE c.tool_id = t.id AND c.returned_at IS NULL ORDER BY c.issued_at DESC LIMIT 1
    ) cust ON true
    -- Uses: check-outs after the latest calibration of any kind (as statusesFor counts them).
    LEFT JOIN LATERAL (
      SELECT count(*)::int AS n FROM checkouts c
      WHERE c.tool_id = t.id
        AND c.issued_at > coalesce((SELECT max(x.performed_at) FROM calibrations x WHERE x.tool_id = t.id), '-infinity'::timestamptz)
    ) uses ON true
    LEFT JOIN LATERAL (
      SELECT
        (SELECT max(c.performed_at) FROM calibrations c WHERE c.tool_id = t.id) AS cal_at,
        (SELECT max(r.reviewed_at) FROM calibration_reviews r JOIN calibrations c ON c.id = r.calibration_id WHERE c.tool_id = t.id) AS review_at,
        (SELECT max(k.performed_at) FROM intermediate_checks k WHERE k.tool_id = t.id) AS check_at,
        (SELECT max(greatest(h.placed_at, h.released_at)) FROM holds h WHERE h.tool_id = t.id) AS hold_at,
        (SELECT max(greatest(s.shipped_at, s.received_at)) FROM lab_shipments s WHERE s.tool_id = t.id) AS trip_at,
        (SELECT max(greatest(c.issued_at, c.returned_at)) FROM checkouts c WHERE c.tool_id = t.id) AS checkout_at
    ) ev ON true
    WHERE t.id = ANY(ids)
  ) g
  ON CONFLICT (tool_id) DO UPDATE SET
    lifecycle = excluded.lifecycle, calibration_required = excluded.calibration_required, usage_limit = excluded.usage_limit,
    cal_id = excluded.cal_id, cal_performed_at = excluded.cal_performed_at, cal_result = excluded.cal_result,
    cal_next_due = excluded.cal_next_due, cal_limited_min = excluded.cal_limited_min, cal_limited_max = excluded.cal_limited_max,
    cal_limited_note = excluded.cal_limited_note, pending_performed_at = excluded.pending_performed_at, pending_lab = excluded.pending_lab,
    uses_since_cal = excluded.uses_since_cal, failed_check_at = excluded.failed_check_at, failed_check_deviation = excluded.failed_check_deviation,
    hold_since = excluded.hold_since, hold_reason = excluded.hold_reason, lab_since = excluded.lab_since, lab_name = excluded.lab_name,
    lab_expected_back = excluded.lab_expected_back, custody_checkout_id = excluded.custody_checkout_id, custody_user_id = excluded.custody_user_id,
    custody_since = excluded.custody_since, custody_due_back = excluded.custody_due_back, settled_at = excluded.settled_at,
    base_status = excluded.base_status, usage_exhausted = excluded.usage_exhausted, usage_warn = excluded.usage_warn
  -- Unchanged rows are not rewritten.
  WHERE (ts.*) IS DISTINCT FROM (excluded.*);
END;
$$;
--> statement-breakpoint
-- Which tools a statement touched, from its transition tables; then one refresh for all of them.
-- (Not named tenthwise_*: that prefix marks the evidence guards, which tests/api/evidence-protection finds by it.)
CREATE OR REPLACE FUNCTION tool_states_after_write() RETURNS trigger
LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
DECLARE
  ids uuid[];
BEGIN
  IF TG_TABLE_NAME = 'tools' THEN
    IF TG_OP = 'INSERT' THEN
      SELECT array_agg(n.id) INTO ids FROM new_rows n;
    ELSIF TG_OP = 'UPDATE' THEN
      SELECT array_agg(n.id) INTO ids FROM new_rows n JOIN old_rows o ON o.id = n.id
      WHERE (n.calibration_required, n.usage_limit) IS DISTINCT FROM (o.calibration_required, o.usage_limit);
    END IF;
  ELSIF TG_TABLE_NAME = 'calibration_reviews' THEN
    IF TG_OP = 'INSERT' THEN
      SELECT array_agg(DISTINCT c.tool_id) INTO ids FROM new_rows n JOIN calibrations c ON c.id = n.calibration_id;
    ELSIF TG_OP = 'UPDATE' THEN
      SELECT array_agg(DISTINCT c.tool_id) INTO ids FROM (SELECT calibration_id FROM new_rows UNION SELECT calibration_id FROM old_rows) n JOIN calibrations c ON c.id = n.calibration_id;
    ELSE
      SELECT array_agg(DISTINCT c.tool_id) INTO ids FROM old_rows n JOIN calibrations c ON c.id = n.calibration_id;
    END IF;
  ELSIF TG_TABLE_NAME = 'labs' THEN
    -- A lab renamed: the tools whose open trip or awaited certificate names it.
    SELECT array_agg(DISTINCT x.tool_id) INTO ids FROM (
      SELECT s.tool_id FROM lab_shipments s JOIN new_rows n ON n.id = s.lab_id WHERE s.received_at IS NULL
      UNION SELECT c.tool_id FROM calibrations c JOIN new_rows n ON n.id = c.lab_id WHERE c.source = 'outside_lab'
    ) x;
  ELSE
    IF TG_OP = 'INSERT' THEN
      SELECT array_agg(DISTINCT n.tool_id) INTO ids FROM new_rows n;
    ELSIF TG_OP = 'UPDATE' THEN
      SELECT array_agg(DISTINCT x.tool_id) INTO ids FROM (SELECT tool_id FROM new_rows UNION SELECT tool_id FROM old_rows) x;
    ELSE
      SELECT array_agg(DISTINCT o.tool_id) INTO ids FROM old_rows o;
    END IF;
  END IF;
  PERFORM tenthwise_refresh_tool_states(ids);
  RETURN NULL;
END;
$$;
--> statement-breakpoint
DO $$
DECLARE
  tbl text;
BEGIN
  FOREACH tbl IN ARRAY ARRAY['tools', 'calibrations', 'calibration_reviews', 'intermediate_checks', 'holds', 'lab_shipments', 'tool_lifecycle_events', 'checkouts'] LOOP
    EXECUTE format('CREATE TRIGGER %I AFTER INSERT ON %I REFERENCING NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION tool_states_after_write()', tbl || '_states_ins', tbl);
    EXECUTE format('CREATE TRIGGER %I AFTER UPDATE ON %I REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION tool_states_after_write()', tbl || '_states_upd', tbl);
    IF tbl <> 'tools' THEN
      EXECUTE format('CREATE TRIGGER %I AFTER DELETE ON %I REFERENCING OLD TABLE AS old_rows FOR EACH STATEMENT EXECUTE FUNCTION tool_states_after_write()', tbl || '_states_del', tbl);
    END IF;
  END LOOP;
END $$;
--> statement-breakpoint
CREATE TRIGGER labs_states_upd AFTER UPDATE ON labs REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows
  FOR EACH STATEMENT EXECUTE FUNCTION tool_states_after_write();
--> statement-breakpoint
-- The rows of the tools already registered.
SELECT tenthwise_refresh_tool_states(coalesce((SELECT array_agg(id) FROM tools), '{}'));
--> statement-breakpoint
-- The app reads tool_states; only the refresh function (as the owner) writes it.
DO $$
BEGIN
  IF EXISTS (SELECT 1 FROM pg_roles WHERE rolname = 'tenthwise_runtime') THEN
    REVOKE INSERT, UPDATE, DELETE, TRUNCATE ON tool_states FROM tenthwise_runtime;
    GRANT SELECT ON tool_states TO tenthwise_runtime;
  END IF;
END $$;
--> statement-breakpoint
-- Each check sheet's latest reading (home pages, lists of sheets) from an index, not a walk of all readings.
CREATE INDEX IF NOT EXISTS readings_job_taken_idx ON readings (job_id, taken_at);
--> statement-breakpoint
-- Free-text search of the register (?q=): trigram index over the searched columns, joined by a separator
-- nobody types, so a match never spans two columns.
CREATE EXTENSION IF NOT EXISTS pg_trgm;
--> statement-breakpoint
CREATE OR REPLACE FUNCTION tenthwise_tool_search_text(asset_tag text, description text, serial_number text, maker text, model text, location text, owner_name text)
RETURNS text LANGUAGE sql IMMUTABLE PARALLEL SAFE AS $$
  SELECT lower(asset_tag || E'\x1f' || description || E'\x1f' || serial_number || E'\x1f' || coalesce(maker, '') || E'\x1f' ||
    coalesce(model, '') || E'\x1f' || coalesce(location, '') || E'\x1f' || coalesce(owner_name, ''))
$$;
--> statement-breakpoint
CREATE INDEX IF NOT EXISTS tools_search_trgm_idx ON tools
  USING gin (tenthwise_tool_search_text(asset_tag, description, serial_number, maker, model, location, owner_name) gin_trgm_ops);

-- A reading's place is guarded in the statement that writes the reading, so that a reading is one statement and not a
-- transaction of five (begin, the sheet's and the place's locks, the place's check, the write, commit): the reading's
-- job_id is given by this function, which PostgreSQL calls before the row goes in.
--
-- It takes the sheet's lock (shared: readings of other places go on side by side; a sign-off, FOR UPDATE, waits for
-- them and they for it) and the place's lock (a transaction-level advisory lock keyed by the place, the same key the
-- app took before), then looks at the place afresh: a volatile function reads what was committed up to each of its
-- queries, so a reading that waited for another at the same place sees it. It refuses, with the message naming the
-- refusal and the detail the record in the way:
--   sheet_signed        the sheet is signed (a new reading; a correction may be made on a signed sheet);
--   reading_exists      the place already holds a current reading (detail: its id);
--   reading_superseded  the reading being corrected was corrected meanwhile (detail: the correction's id).
CREATE OR REPLACE FUNCTION tenthwise_reading_place(p_job uuid, p_item text, p_index integer, p_supersedes uuid, p_on_signed boolean)
RETURNS uuid LANGUAGE plpgsql VOLATILE SET search_path = public, pg_temp AS $$
DECLARE
  holder uuid;
BEGIN
  PERFORM 1 FROM jobs WHERE id = p_job FOR SHARE;
  PERFORM pg_advisory_xact_lock(hashtextextended('reading-place:' || p_job::text || ':' || p_item || ':' || p_index::text, 0));
  IF NOT p_on_signed AND EXISTS (
    SELECT 1 FROM job_activity a
    WHERE a.job_id = p_job AND a.last_signed_at IS NOT NULL AND (a.last_reading_at IS NULL OR a.last_reading_at <= a.last_signed_at)
  ) THEN
    RAISE EXCEPTION 'sheet_signed';
  END IF;
  IF p_supersedes IS NULL THEN
    SELECT r.id INTO holder FROM readings r
    WHERE r.job_id = p_job AND r.item_key = p_item AND r.index = p_index
      AND NOT EXISTS (SELECT 1 FROM readings s WHERE s.supersedes_id = r.id)
    ORDER BY r.taken_at DESC LIMIT 1;
    IF holder IS NOT NULL THEN
      RAISE EXCEPTION 'reading_exists' USING DETAIL = holder::text;
    END IF;
  ELSE
    SELECT s.id INTO holder FROM readings s WHERE s.supersedes_id = p_supersedes LIMIT 1;
    IF holder IS NOT NULL THEN
      RAISE EXCEPTION 'reading_superseded' USING DETAIL = holder::text;
    END IF;
  END IF;
  RETURN p_job;
END $$;

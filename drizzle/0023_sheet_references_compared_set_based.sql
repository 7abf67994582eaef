-- The shared records' version (migration 0021) moved only when a named column changed, found by joining the rows
-- before and after an UPDATE on their id. Transition tables carry no statistics, so the planner could join them
-- row by row: an UPDATE of all 20,000 tools took 142 s in that trigger (0.7 s without it). The rows before and after
-- are now compared as sets, on the id and the named columns only (plain column comparison, hashed): 28 ms for the
-- same 20,000 rows. The columns come from the trigger's arguments, so the comparison is built as text; each name is
-- quoted as an identifier.
CREATE OR REPLACE FUNCTION sheet_references_moved() RETURNS trigger
LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
DECLARE
  cols text;
  changed boolean;
BEGIN
  IF TG_NARGS = 0 THEN
    UPDATE sheet_references SET version = version + 1 WHERE id = 1;
    RETURN NULL;
  END IF;
  SELECT 'id, ' || string_agg(quote_ident(c), ', ') INTO cols FROM unnest(TG_ARGV) c;
  EXECUTE format('SELECT EXISTS (SELECT %s FROM new_rows EXCEPT SELECT %s FROM old_rows)', cols, cols) INTO changed;
  IF changed THEN
    UPDATE sheet_references SET version = version + 1 WHERE id = 1;
  END IF;
  RETURN NULL;
END $$;

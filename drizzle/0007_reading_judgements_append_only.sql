-- A reading's judgement under a version of the rules is a record of how it was judged: never rewritten. Re-judging
-- under new rules adds rows (one per reading and rules version); the readings themselves are never touched.
-- Uses the refusing function of migration 0001 (append-only evidence).
DROP TRIGGER IF EXISTS reading_judgements_append_only ON reading_judgements;
--> statement-breakpoint
CREATE TRIGGER reading_judgements_append_only BEFORE UPDATE OR DELETE ON reading_judgements FOR EACH ROW EXECUTE FUNCTION tenthwise_refuse_change();

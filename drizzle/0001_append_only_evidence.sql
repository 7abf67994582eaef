-- Evidence is append-only (calibrations, points, reviews, intermediate checks,
-- readings, sign-offs, dispositions, audit trail): the database itself refuses
-- UPDATE and DELETE, so no code path or console session can rewrite a record.
-- Corrections are new rows that supersede, with a reason.
CREATE OR REPLACE FUNCTION tenthwise_refuse_change() RETURNS trigger AS $$
BEGIN
  RAISE EXCEPTION 'record_signed: % rows are evidence and cannot be changed or deleted; record a correction that supersedes it', TG_TABLE_NAME
    USING ERRCODE = 'P0001';
END;
$$ LANGUAGE plpgsql;
--> statement-breakpoint
CREATE TRIGGER calibrations_append_only BEFORE UPDATE OR DELETE ON calibrations FOR EACH ROW EXECUTE FUNCTION tenthwise_refuse_change();
--> statement-breakpoint
CREATE TRIGGER calibration_points_append_only BEFORE UPDATE OR DELETE ON calibration_points FOR EACH ROW EXECUTE FUNCTION tenthwise_refuse_change();
--> statement-breakpoint
CREATE TRIGGER calibration_standards_append_only BEFORE UPDATE OR DELETE ON calibration_standards FOR EACH ROW EXECUTE FUNCTION tenthwise_refuse_change();
--> statement-breakpoint
CREATE TRIGGER calibration_reviews_append_only BEFORE UPDATE OR DELETE ON calibration_reviews FOR EACH ROW EXECUTE FUNCTION tenthwise_refuse_change();
--> statement-breakpoint
CREATE TRIGGER intermediate_checks_append_only BEFORE UPDATE OR DELETE ON intermediate_checks FOR EACH ROW EXECUTE FUNCTION tenthwise_refuse_change();
--> statement-breakpoint
CREATE TRIGGER readings_append_only BEFORE UPDATE OR DELETE ON readings FOR EACH ROW EXECUTE FUNCTION tenthwise_refuse_change();
--> statement-breakpoint
CREATE TRIGGER reading_tools_append_only BEFORE UPDATE OR DELETE ON reading_tools FOR EACH ROW EXECUTE FUNCTION tenthwise_refuse_change();
--> statement-breakpoint
CREATE TRIGGER job_signoffs_append_only BEFORE UPDATE OR DELETE ON job_signoffs FOR EACH ROW EXECUTE FUNCTION tenthwise_refuse_change();
--> statement-breakpoint
CREATE TRIGGER dispositions_append_only BEFORE UPDATE OR DELETE ON dispositions FOR EACH ROW EXECUTE FUNCTION tenthwise_refuse_change();
--> statement-breakpoint
CREATE TRIGGER audit_events_append_only BEFORE UPDATE OR DELETE ON audit_events FOR EACH ROW EXECUTE FUNCTION tenthwise_refuse_change();
--> statement-breakpoint
CREATE TRIGGER tool_lifecycle_events_append_only BEFORE UPDATE OR DELETE ON tool_lifecycle_events FOR EACH ROW EXECUTE FUNCTION tenthwise_refuse_change();

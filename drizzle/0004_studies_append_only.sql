-- Gauge studies are evidence from set-up on: the study with its parts, appraisers and run order, every value
-- taken on the bench with the tools it was taken with, and every result as reported. The database refuses UPDATE
-- and DELETE on them (tenthwise_refuse_change comes from the first evidence migration); a corrected value is a new
-- row that supersedes, with a reason, and a corrected study writes a new result row.
DROP TRIGGER IF EXISTS gauge_studies_append_only ON gauge_studies;
--> statement-breakpoint
CREATE TRIGGER gauge_studies_append_only BEFORE UPDATE OR DELETE ON gauge_studies FOR EACH ROW EXECUTE FUNCTION tenthwise_refuse_change();
--> statement-breakpoint
DROP TRIGGER IF EXISTS gauge_study_parts_append_only ON gauge_study_parts;
--> statement-breakpoint
CREATE TRIGGER gauge_study_parts_append_only BEFORE UPDATE OR DELETE ON gauge_study_parts FOR EACH ROW EXECUTE FUNCTION tenthwise_refuse_change();
--> statement-breakpoint
DROP TRIGGER IF EXISTS gauge_study_appraisers_append_only ON gauge_study_appraisers;
--> statement-breakpoint
CREATE TRIGGER gauge_study_appraisers_append_only BEFORE UPDATE OR DELETE ON gauge_study_appraisers FOR EACH ROW EXECUTE FUNCTION tenthwise_refuse_change();
--> statement-breakpoint
DROP TRIGGER IF EXISTS gauge_study_values_append_only ON gauge_study_values;
--> statement-breakpoint
CREATE TRIGGER gauge_study_values_append_only BEFORE UPDATE OR DELETE ON gauge_study_values FOR EACH ROW EXECUTE FUNCTION tenthwise_refuse_change();
--> statement-breakpoint
DROP TRIGGER IF EXISTS gauge_study_value_tools_append_only ON gauge_study_value_tools;
--> statement-breakpoint
CREATE TRIGGER gauge_study_value_tools_append_only BEFORE UPDATE OR DELETE ON gauge_study_value_tools FOR EACH ROW EXECUTE FUNCTION tenthwise_refuse_change();
--> statement-breakpoint
DROP TRIGGER IF EXISTS gauge_study_results_append_only ON gauge_study_results;
--> statement-breakpoint
CREATE TRIGGER gauge_study_results_append_only BEFORE UPDATE OR DELETE ON gauge_study_results FOR EACH ROW EXECUTE FUNCTION tenthwise_refuse_change();

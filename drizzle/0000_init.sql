CREATE TABLE "users" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"email" text NOT NULL,
	"name" text NOT NULL,
	"role" text NOT NULL,
	"password_hash" text NOT NULL,
	"active" boolean DEFAULT true NOT NULL,
	"badge_code" text,
	"certificate_number" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"deactivated_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "settings" (
	"key" text PRIMARY KEY NOT NULL,
	"value" jsonb NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_by" uuid
);
--> statement-breakpoint
CREATE TABLE "audit_events" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"actor_id" uuid,
	"action" text NOT NULL,
	"entity_type" text NOT NULL,
	"entity_id" text NOT NULL,
	"before" jsonb,
	"after" jsonb
);
--> statement-breakpoint
CREATE TABLE "families" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"kind" text NOT NULL,
	"unit" text NOT NULL,
	"default_interval_days" integer NOT NULL,
	"mpe" numeric,
	"check_points" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"usage_limit" integer,
	"resolution" numeric,
	"check_tolerance" numeric,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "holds" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"tool_id" uuid NOT NULL,
	"placed_at" timestamp with time zone NOT NULL,
	"placed_by" uuid,
	"reason" text NOT NULL,
	"released_at" timestamp with time zone,
	"released_by" uuid,
	"release_reason" text
);
--> statement-breakpoint
CREATE TABLE "set_elements" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"tool_id" uuid NOT NULL,
	"label" text NOT NULL,
	"nominal" numeric NOT NULL,
	"grade" text,
	"certified_deviation" numeric,
	"rejected_at" timestamp with time zone,
	"rejected_reason" text
);
--> statement-breakpoint
CREATE TABLE "tool_lifecycle_events" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"tool_id" uuid NOT NULL,
	"at" timestamp with time zone NOT NULL,
	"by_user_id" uuid,
	"lifecycle" text NOT NULL,
	"reason" text NOT NULL
);
--> statement-breakpoint
CREATE TABLE "tools" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"asset_tag" text NOT NULL,
	"family_id" uuid NOT NULL,
	"description" text NOT NULL,
	"maker" text,
	"model" text,
	"serial_number" text NOT NULL,
	"unit" text NOT NULL,
	"range_min" numeric NOT NULL,
	"range_max" numeric NOT NULL,
	"resolution" numeric NOT NULL,
	"interval_days" integer NOT NULL,
	"usage_limit" integer,
	"location" text,
	"owner_type" text DEFAULT 'shop' NOT NULL,
	"owner_user_id" uuid,
	"owner_name" text,
	"calibration_required" boolean DEFAULT true NOT NULL,
	"acceptance_use" boolean DEFAULT true NOT NULL,
	"lifecycle" text DEFAULT 'active' NOT NULL,
	"photo_key" text,
	"notes" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "labs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"accreditation_body" text,
	"accreditation_number" text,
	"scope" text,
	"accreditation_expires_at" date,
	"contact" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "standard_certificates" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"standard_id" uuid NOT NULL,
	"number" text NOT NULL,
	"lab_id" uuid,
	"lab_name" text NOT NULL,
	"accreditation_body" text,
	"scope" text,
	"national_institute" text,
	"issued_at" date NOT NULL,
	"due_at" date NOT NULL,
	"expanded_uncertainty" numeric NOT NULL,
	"coverage_factor" numeric NOT NULL,
	"certified_value" numeric,
	"element_values" jsonb,
	"file_key" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "standards" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"asset_tag" text NOT NULL,
	"name" text NOT NULL,
	"kind" text NOT NULL,
	"unit" text NOT NULL,
	"nominal" numeric,
	"grade" text,
	"location" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "calibration_points" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"calibration_id" uuid NOT NULL,
	"seq" integer NOT NULL,
	"element_id" uuid,
	"nominal" numeric NOT NULL,
	"reference" numeric NOT NULL,
	"as_found" numeric NOT NULL,
	"as_left" numeric,
	"error_as_found" numeric NOT NULL,
	"error_as_left" numeric,
	"mpe" numeric NOT NULL,
	"uncertainty" numeric,
	"tur" numeric,
	"as_found_in_tolerance" boolean NOT NULL,
	"verdict" text NOT NULL
);
--> statement-breakpoint
CREATE TABLE "calibration_reviews" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"calibration_id" uuid NOT NULL,
	"reviewed_by" uuid,
	"reviewed_at" timestamp with time zone NOT NULL,
	"accepted" boolean NOT NULL,
	"findings" text NOT NULL
);
--> statement-breakpoint
CREATE TABLE "calibration_standards" (
	"calibration_id" uuid NOT NULL,
	"standard_id" uuid NOT NULL,
	CONSTRAINT "calibration_standards_calibration_id_standard_id_pk" PRIMARY KEY("calibration_id","standard_id")
);
--> statement-breakpoint
CREATE TABLE "calibrations" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"tool_id" uuid NOT NULL,
	"performed_at" timestamp with time zone NOT NULL,
	"performed_by" uuid,
	"performed_by_name" text,
	"source" text DEFAULT 'in_house' NOT NULL,
	"lab_id" uuid,
	"certificate_number" text,
	"certificate_file_key" text,
	"temperature_c" numeric,
	"humidity_pct" numeric,
	"decision_rule" text NOT NULL,
	"result" text NOT NULL,
	"as_found_in_tolerance" boolean NOT NULL,
	"interval_days" integer NOT NULL,
	"next_due_at" date NOT NULL,
	"limited_min" numeric,
	"limited_max" numeric,
	"limited_note" text,
	"notes" text,
	"supersedes_id" uuid,
	"supersede_reason" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "intermediate_checks" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"tool_id" uuid NOT NULL,
	"performed_at" timestamp with time zone NOT NULL,
	"performed_by" uuid,
	"standard_id" uuid,
	"nominal" numeric NOT NULL,
	"reading" numeric NOT NULL,
	"deviation" numeric NOT NULL,
	"tolerance" numeric NOT NULL,
	"passed" boolean NOT NULL,
	"context" text DEFAULT 'pre_use' NOT NULL,
	"note" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "checkout_refusals" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"tool_id" uuid NOT NULL,
	"user_id" uuid,
	"refused_by" uuid,
	"at" timestamp with time zone NOT NULL,
	"code" text NOT NULL,
	"reason" text NOT NULL
);
--> statement-breakpoint
CREATE TABLE "checkouts" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"tool_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"issued_by" uuid,
	"issued_at" timestamp with time zone NOT NULL,
	"due_back_at" timestamp with time zone NOT NULL,
	"work_order" text,
	"engine_serial" text,
	"returned_at" timestamp with time zone,
	"returned_by" uuid,
	"return_condition" text,
	"return_note" text,
	"return_photo_key" text
);
--> statement-breakpoint
CREATE TABLE "lab_shipments" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"tool_id" uuid NOT NULL,
	"lab_id" uuid NOT NULL,
	"shipped_at" timestamp with time zone NOT NULL,
	"shipped_by" uuid,
	"purchase_order" text,
	"expected_back_at" date,
	"received_at" timestamp with time zone,
	"received_by" uuid,
	"calibration_id" uuid
);
--> statement-breakpoint
CREATE TABLE "limit_items" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"limit_table_id" uuid NOT NULL,
	"seq" integer NOT NULL,
	"key" text NOT NULL,
	"label" text NOT NULL,
	"section" text,
	"kind" text NOT NULL,
	"min" numeric,
	"max" numeric,
	"serviceable_min" numeric,
	"serviceable_max" numeric,
	"bore_key" text,
	"journal_key" text,
	"directions" integer DEFAULT 2 NOT NULL,
	"repeat" integer DEFAULT 1 NOT NULL,
	"tool_kinds" jsonb,
	"radial" boolean DEFAULT false NOT NULL,
	"note" text
);
--> statement-breakpoint
CREATE TABLE "limit_tables" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"engine_model" text NOT NULL,
	"unit" text NOT NULL,
	"source_document" text NOT NULL,
	"source_revision" text NOT NULL,
	"version" integer DEFAULT 1 NOT NULL,
	"supersedes_id" uuid,
	"is_demo" boolean DEFAULT false NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "job_signoffs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"job_id" uuid NOT NULL,
	"inspector_id" uuid NOT NULL,
	"certificate_number" text NOT NULL,
	"signed_at" timestamp with time zone NOT NULL,
	"note" text
);
--> statement-breakpoint
CREATE TABLE "jobs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"limit_table_id" uuid NOT NULL,
	"engine_serial" text NOT NULL,
	"engine_model" text NOT NULL,
	"work_order" text,
	"opened_by" uuid,
	"opened_at" timestamp with time zone NOT NULL
);
--> statement-breakpoint
CREATE TABLE "reading_tools" (
	"reading_id" uuid NOT NULL,
	"tool_id" uuid NOT NULL,
	"position" integer NOT NULL,
	"status_at_reading" text NOT NULL,
	"due_at_reading" date,
	"taken_at" timestamp with time zone NOT NULL,
	CONSTRAINT "reading_tools_reading_id_tool_id_pk" PRIMARY KEY("reading_id","tool_id")
);
--> statement-breakpoint
CREATE TABLE "readings" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"job_id" uuid NOT NULL,
	"item_key" text NOT NULL,
	"index" integer DEFAULT 1 NOT NULL,
	"values" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"unit" text NOT NULL,
	"size" numeric,
	"out_of_round" numeric,
	"go_entered" boolean,
	"no_go_entered" boolean,
	"go_leaf_id" uuid,
	"no_go_leaf_id" uuid,
	"visual_result" text,
	"finding" text,
	"verdict" text NOT NULL,
	"flags" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"temperature_c" numeric,
	"part_material" text,
	"taken_by" uuid,
	"taken_at" timestamp with time zone NOT NULL,
	"supersedes_id" uuid,
	"supersede_reason" text,
	"override_reason" text,
	"override_by" uuid
);
--> statement-breakpoint
CREATE TABLE "dispositions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"investigation_item_id" uuid NOT NULL,
	"kind" text NOT NULL,
	"rationale" text NOT NULL,
	"decided_by" uuid NOT NULL,
	"decided_at" timestamp with time zone NOT NULL,
	"notified_whom" text,
	"notified_how" text,
	"notified_at" timestamp with time zone,
	"remeasure_reading_id" uuid
);
--> statement-breakpoint
CREATE TABLE "investigation_items" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"investigation_id" uuid NOT NULL,
	"reading_id" uuid,
	"calibration_id" uuid,
	"tool_id" uuid,
	"verdict_could_change" boolean NOT NULL,
	"basis" text NOT NULL,
	"margin_before" numeric,
	"margin_after" numeric,
	"corrected_value" numeric
);
--> statement-breakpoint
CREATE TABLE "investigations" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"tool_id" uuid,
	"standard_id" uuid,
	"trigger" text NOT NULL,
	"calibration_id" uuid,
	"check_id" uuid,
	"opened_at" timestamp with time zone NOT NULL,
	"opened_by" uuid,
	"window_start" timestamp with time zone,
	"window_end" timestamp with time zone NOT NULL,
	"finding" jsonb,
	"status" text DEFAULT 'open' NOT NULL,
	"closed_at" timestamp with time zone,
	"closed_by" uuid,
	"closing_summary" text
);
--> statement-breakpoint
CREATE TABLE "notification_preferences" (
	"user_id" uuid PRIMARY KEY NOT NULL,
	"digests" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "reminder_log" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"tool_id" uuid NOT NULL,
	"due_at" date NOT NULL,
	"stage" text NOT NULL,
	"recipient_id" uuid NOT NULL,
	"run_id" uuid,
	"status" text NOT NULL,
	"attempts" integer DEFAULT 0 NOT NULL,
	"claimed_at" timestamp with time zone NOT NULL,
	"sent_at" timestamp with time zone,
	"last_error" text
);
--> statement-breakpoint
CREATE TABLE "reminder_runs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"trigger" text NOT NULL,
	"started_at" timestamp with time zone NOT NULL,
	"finished_at" timestamp with time zone,
	"status" text NOT NULL,
	"sent" integer DEFAULT 0 NOT NULL,
	"skipped" integer DEFAULT 0 NOT NULL,
	"failed" integer DEFAULT 0 NOT NULL,
	"error" text
);
--> statement-breakpoint
CREATE TABLE "interval_decisions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"family_id" uuid NOT NULL,
	"decided_by" uuid NOT NULL,
	"decided_at" timestamp with time zone NOT NULL,
	"previous_interval_days" integer NOT NULL,
	"new_interval_days" integer NOT NULL,
	"method" text NOT NULL,
	"rationale" text NOT NULL,
	"data" jsonb NOT NULL
);
--> statement-breakpoint
ALTER TABLE "settings" ADD CONSTRAINT "settings_updated_by_users_id_fk" FOREIGN KEY ("updated_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "audit_events" ADD CONSTRAINT "audit_events_actor_id_users_id_fk" FOREIGN KEY ("actor_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "holds" ADD CONSTRAINT "holds_tool_id_tools_id_fk" FOREIGN KEY ("tool_id") REFERENCES "public"."tools"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "holds" ADD CONSTRAINT "holds_placed_by_users_id_fk" FOREIGN KEY ("placed_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "holds" ADD CONSTRAINT "holds_released_by_users_id_fk" FOREIGN KEY ("released_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "set_elements" ADD CONSTRAINT "set_elements_tool_id_tools_id_fk" FOREIGN KEY ("tool_id") REFERENCES "public"."tools"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "tool_lifecycle_events" ADD CONSTRAINT "tool_lifecycle_events_tool_id_tools_id_fk" FOREIGN KEY ("tool_id") REFERENCES "public"."tools"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "tool_lifecycle_events" ADD CONSTRAINT "tool_lifecycle_events_by_user_id_users_id_fk" FOREIGN KEY ("by_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "tools" ADD CONSTRAINT "tools_family_id_families_id_fk" FOREIGN KEY ("family_id") REFERENCES "public"."families"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "tools" ADD CONSTRAINT "tools_owner_user_id_users_id_fk" FOREIGN KEY ("owner_user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "standard_certificates" ADD CONSTRAINT "standard_certificates_standard_id_standards_id_fk" FOREIGN KEY ("standard_id") REFERENCES "public"."standards"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "standard_certificates" ADD CONSTRAINT "standard_certificates_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "calibration_points" ADD CONSTRAINT "calibration_points_calibration_id_calibrations_id_fk" FOREIGN KEY ("calibration_id") REFERENCES "public"."calibrations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "calibration_points" ADD CONSTRAINT "calibration_points_element_id_set_elements_id_fk" FOREIGN KEY ("element_id") REFERENCES "public"."set_elements"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "calibration_reviews" ADD CONSTRAINT "calibration_reviews_calibration_id_calibrations_id_fk" FOREIGN KEY ("calibration_id") REFERENCES "public"."calibrations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "calibration_reviews" ADD CONSTRAINT "calibration_reviews_reviewed_by_users_id_fk" FOREIGN KEY ("reviewed_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "calibration_standards" ADD CONSTRAINT "calibration_standards_calibration_id_calibrations_id_fk" FOREIGN KEY ("calibration_id") REFERENCES "public"."calibrations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "calibration_standards" ADD CONSTRAINT "calibration_standards_standard_id_standards_id_fk" FOREIGN KEY ("standard_id") REFERENCES "public"."standards"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "calibrations" ADD CONSTRAINT "calibrations_tool_id_tools_id_fk" FOREIGN KEY ("tool_id") REFERENCES "public"."tools"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "calibrations" ADD CONSTRAINT "calibrations_performed_by_users_id_fk" FOREIGN KEY ("performed_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "calibrations" ADD CONSTRAINT "calibrations_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "intermediate_checks" ADD CONSTRAINT "intermediate_checks_tool_id_tools_id_fk" FOREIGN KEY ("tool_id") REFERENCES "public"."tools"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "intermediate_checks" ADD CONSTRAINT "intermediate_checks_performed_by_users_id_fk" FOREIGN KEY ("performed_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "intermediate_checks" ADD CONSTRAINT "intermediate_checks_standard_id_standards_id_fk" FOREIGN KEY ("standard_id") REFERENCES "public"."standards"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "checkout_refusals" ADD CONSTRAINT "checkout_refusals_tool_id_tools_id_fk" FOREIGN KEY ("tool_id") REFERENCES "public"."tools"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "checkout_refusals" ADD CONSTRAINT "checkout_refusals_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "checkout_refusals" ADD CONSTRAINT "checkout_refusals_refused_by_users_id_fk" FOREIGN KEY ("refused_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "checkouts" ADD CONSTRAINT "checkouts_tool_id_tools_id_fk" FOREIGN KEY ("tool_id") REFERENCES "public"."tools"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "checkouts" ADD CONSTRAINT "checkouts_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "checkouts" ADD CONSTRAINT "checkouts_issued_by_users_id_fk" FOREIGN KEY ("issued_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "checkouts" ADD CONSTRAINT "checkouts_returned_by_users_id_fk" FOREIGN KEY ("returned_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lab_shipments" ADD CONSTRAINT "lab_shipments_tool_id_tools_id_fk" FOREIGN KEY ("tool_id") REFERENCES "public"."tools"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lab_shipments" ADD CONSTRAINT "lab_shipments_lab_id_labs_id_fk" FOREIGN KEY ("lab_id") REFERENCES "public"."labs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lab_shipments" ADD CONSTRAINT "lab_shipments_shipped_by_users_id_fk" FOREIGN KEY ("shipped_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lab_shipments" ADD CONSTRAINT "lab_shipments_received_by_users_id_fk" FOREIGN KEY ("received_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "lab_shipments" ADD CONSTRAINT "lab_shipments_calibration_id_calibrations_id_fk" FOREIGN KEY ("calibration_id") REFERENCES "public"."calibrations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "limit_items" ADD CONSTRAINT "limit_items_limit_table_id_limit_tables_id_fk" FOREIGN KEY ("limit_table_id") REFERENCES "public"."limit_tables"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "limit_tables" ADD CONSTRAINT "limit_tables_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job_signoffs" ADD CONSTRAINT "job_signoffs_job_id_jobs_id_fk" FOREIGN KEY ("job_id") REFERENCES "public"."jobs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job_signoffs" ADD CONSTRAINT "job_signoffs_inspector_id_users_id_fk" FOREIGN KEY ("inspector_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "jobs" ADD CONSTRAINT "jobs_limit_table_id_limit_tables_id_fk" FOREIGN KEY ("limit_table_id") REFERENCES "public"."limit_tables"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "jobs" ADD CONSTRAINT "jobs_opened_by_users_id_fk" FOREIGN KEY ("opened_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reading_tools" ADD CONSTRAINT "reading_tools_reading_id_readings_id_fk" FOREIGN KEY ("reading_id") REFERENCES "public"."readings"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reading_tools" ADD CONSTRAINT "reading_tools_tool_id_tools_id_fk" FOREIGN KEY ("tool_id") REFERENCES "public"."tools"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "readings" ADD CONSTRAINT "readings_job_id_jobs_id_fk" FOREIGN KEY ("job_id") REFERENCES "public"."jobs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "readings" ADD CONSTRAINT "readings_go_leaf_id_set_elements_id_fk" FOREIGN KEY ("go_leaf_id") REFERENCES "public"."set_elements"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "readings" ADD CONSTRAINT "readings_no_go_leaf_id_set_elements_id_fk" FOREIGN KEY ("no_go_leaf_id") REFERENCES "public"."set_elements"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "readings" ADD CONSTRAINT "readings_taken_by_users_id_fk" FOREIGN KEY ("taken_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "readings" ADD CONSTRAINT "readings_override_by_users_id_fk" FOREIGN KEY ("override_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dispositions" ADD CONSTRAINT "dispositions_investigation_item_id_investigation_items_id_fk" FOREIGN KEY ("investigation_item_id") REFERENCES "public"."investigation_items"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dispositions" ADD CONSTRAINT "dispositions_decided_by_users_id_fk" FOREIGN KEY ("decided_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dispositions" ADD CONSTRAINT "dispositions_remeasure_reading_id_readings_id_fk" FOREIGN KEY ("remeasure_reading_id") REFERENCES "public"."readings"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "investigation_items" ADD CONSTRAINT "investigation_items_investigation_id_investigations_id_fk" FOREIGN KEY ("investigation_id") REFERENCES "public"."investigations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "investigation_items" ADD CONSTRAINT "investigation_items_reading_id_readings_id_fk" FOREIGN KEY ("reading_id") REFERENCES "public"."readings"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "investigation_items" ADD CONSTRAINT "investigation_items_calibration_id_calibrations_id_fk" FOREIGN KEY ("calibration_id") REFERENCES "public"."calibrations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "investigation_items" ADD CONSTRAINT "investigation_items_tool_id_tools_id_fk" FOREIGN KEY ("tool_id") REFERENCES "public"."tools"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "investigations" ADD CONSTRAINT "investigations_tool_id_tools_id_fk" FOREIGN KEY ("tool_id") REFERENCES "public"."tools"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "investigations" ADD CONSTRAINT "investigations_standard_id_standards_id_fk" FOREIGN KEY ("standard_id") REFERENCES "public"."standards"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "investigations" ADD CONSTRAINT "investigations_calibration_id_calibrations_id_fk" FOREIGN KEY ("calibration_id") REFERENCES "public"."calibrations"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "investigations" ADD CONSTRAINT "investigations_check_id_intermediate_checks_id_fk" FOREIGN KEY ("check_id") REFERENCES "public"."intermediate_checks"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "investigations" ADD CONSTRAINT "investigations_opened_by_users_id_fk" FOREIGN KEY ("opened_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "investigations" ADD CONSTRAINT "investigations_closed_by_users_id_fk" FOREIGN KEY ("closed_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "notification_preferences" ADD CONSTRAINT "notification_preferences_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reminder_log" ADD CONSTRAINT "reminder_log_tool_id_tools_id_fk" FOREIGN KEY ("tool_id") REFERENCES "public"."tools"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reminder_log" ADD CONSTRAINT "reminder_log_recipient_id_users_id_fk" FOREIGN KEY ("recipient_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reminder_log" ADD CONSTRAINT "reminder_log_run_id_reminder_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."reminder_runs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "interval_decisions" ADD CONSTRAINT "interval_decisions_family_id_families_id_fk" FOREIGN KEY ("family_id") REFERENCES "public"."families"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "interval_decisions" ADD CONSTRAINT "interval_decisions_decided_by_users_id_fk" FOREIGN KEY ("decided_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "users_email_key" ON "users" USING btree ("email");--> statement-breakpoint
CREATE UNIQUE INDEX "users_badge_code_key" ON "users" USING btree ("badge_code");--> statement-breakpoint
CREATE INDEX "users_role_idx" ON "users" USING btree ("role");--> statement-breakpoint
CREATE INDEX "audit_events_entity_idx" ON "audit_events" USING btree ("entity_type","entity_id");--> statement-breakpoint
CREATE INDEX "audit_events_actor_idx" ON "audit_events" USING btree ("actor_id");--> statement-breakpoint
CREATE INDEX "audit_events_at_idx" ON "audit_events" USING btree ("at");--> statement-breakpoint
CREATE UNIQUE INDEX "families_name_key" ON "families" USING btree ("name");--> statement-breakpoint
CREATE INDEX "holds_tool_idx" ON "holds" USING btree ("tool_id","placed_at");--> statement-breakpoint
CREATE INDEX "holds_placed_by_idx" ON "holds" USING btree ("placed_by");--> statement-breakpoint
CREATE INDEX "holds_released_by_idx" ON "holds" USING btree ("released_by");--> statement-breakpoint
CREATE INDEX "set_elements_tool_idx" ON "set_elements" USING btree ("tool_id");--> statement-breakpoint
CREATE UNIQUE INDEX "set_elements_tool_label_key" ON "set_elements" USING btree ("tool_id","label");--> statement-breakpoint
CREATE INDEX "tool_lifecycle_events_tool_at_idx" ON "tool_lifecycle_events" USING btree ("tool_id","at");--> statement-breakpoint
CREATE INDEX "tool_lifecycle_events_by_idx" ON "tool_lifecycle_events" USING btree ("by_user_id");--> statement-breakpoint
CREATE UNIQUE INDEX "tools_asset_tag_key" ON "tools" USING btree ("asset_tag");--> statement-breakpoint
CREATE INDEX "tools_family_idx" ON "tools" USING btree ("family_id");--> statement-breakpoint
CREATE INDEX "tools_owner_user_idx" ON "tools" USING btree ("owner_user_id");--> statement-breakpoint
CREATE INDEX "tools_location_idx" ON "tools" USING btree ("location");--> statement-breakpoint
CREATE INDEX "tools_lifecycle_idx" ON "tools" USING btree ("lifecycle");--> statement-breakpoint
CREATE INDEX "tools_serial_idx" ON "tools" USING btree ("serial_number");--> statement-breakpoint
CREATE UNIQUE INDEX "labs_name_key" ON "labs" USING btree ("name");--> statement-breakpoint
CREATE INDEX "standard_certificates_standard_idx" ON "standard_certificates" USING btree ("standard_id","due_at");--> statement-breakpoint
CREATE INDEX "standard_certificates_lab_idx" ON "standard_certificates" USING btree ("lab_id");--> statement-breakpoint
CREATE UNIQUE INDEX "standards_asset_tag_key" ON "standards" USING btree ("asset_tag");--> statement-breakpoint
CREATE INDEX "calibration_points_calibration_idx" ON "calibration_points" USING btree ("calibration_id","seq");--> statement-breakpoint
CREATE INDEX "calibration_points_element_idx" ON "calibration_points" USING btree ("element_id");--> statement-breakpoint
CREATE INDEX "calibration_reviews_calibration_idx" ON "calibration_reviews" USING btree ("calibration_id");--> statement-breakpoint
CREATE INDEX "calibration_reviews_by_idx" ON "calibration_reviews" USING btree ("reviewed_by");--> statement-breakpoint
CREATE INDEX "calibration_standards_standard_idx" ON "calibration_standards" USING btree ("standard_id");--> statement-breakpoint
CREATE INDEX "calibrations_tool_performed_idx" ON "calibrations" USING btree ("tool_id","performed_at");--> statement-breakpoint
CREATE INDEX "calibrations_performed_by_idx" ON "calibrations" USING btree ("performed_by");--> statement-breakpoint
CREATE INDEX "calibrations_lab_idx" ON "calibrations" USING btree ("lab_id");--> statement-breakpoint
CREATE INDEX "calibrations_supersedes_idx" ON "calibrations" USING btree ("supersedes_id");--> statement-breakpoint
CREATE INDEX "calibrations_next_due_idx" ON "calibrations" USING btree ("next_due_at");--> statement-breakpoint
CREATE INDEX "intermediate_checks_tool_idx" ON "intermediate_checks" USING btree ("tool_id","performed_at");--> statement-breakpoint
CREATE INDEX "intermediate_checks_by_idx" ON "intermediate_checks" USING btree ("performed_by");--> statement-breakpoint
CREATE INDEX "intermediate_checks_standard_idx" ON "intermediate_checks" USING btree ("standard_id");--> statement-breakpoint
CREATE INDEX "checkout_refusals_tool_idx" ON "checkout_refusals" USING btree ("tool_id");--> statement-breakpoint
CREATE INDEX "checkout_refusals_user_idx" ON "checkout_refusals" USING btree ("user_id");--> statement-breakpoint
CREATE INDEX "checkout_refusals_by_idx" ON "checkout_refusals" USING btree ("refused_by");--> statement-breakpoint
CREATE UNIQUE INDEX "checkouts_one_open_per_tool" ON "checkouts" USING btree ("tool_id") WHERE "checkouts"."returned_at" is null;--> statement-breakpoint
CREATE INDEX "checkouts_tool_issued_idx" ON "checkouts" USING btree ("tool_id","issued_at");--> statement-breakpoint
CREATE INDEX "checkouts_user_idx" ON "checkouts" USING btree ("user_id");--> statement-breakpoint
CREATE INDEX "checkouts_issued_by_idx" ON "checkouts" USING btree ("issued_by");--> statement-breakpoint
CREATE INDEX "checkouts_returned_by_idx" ON "checkouts" USING btree ("returned_by");--> statement-breakpoint
CREATE INDEX "checkouts_open_due_idx" ON "checkouts" USING btree ("due_back_at") WHERE "checkouts"."returned_at" is null;--> statement-breakpoint
CREATE UNIQUE INDEX "lab_shipments_one_open_per_tool" ON "lab_shipments" USING btree ("tool_id") WHERE "lab_shipments"."received_at" is null;--> statement-breakpoint
CREATE INDEX "lab_shipments_tool_idx" ON "lab_shipments" USING btree ("tool_id","shipped_at");--> statement-breakpoint
CREATE INDEX "lab_shipments_lab_idx" ON "lab_shipments" USING btree ("lab_id");--> statement-breakpoint
CREATE INDEX "lab_shipments_shipped_by_idx" ON "lab_shipments" USING btree ("shipped_by");--> statement-breakpoint
CREATE INDEX "lab_shipments_received_by_idx" ON "lab_shipments" USING btree ("received_by");--> statement-breakpoint
CREATE INDEX "lab_shipments_calibration_idx" ON "lab_shipments" USING btree ("calibration_id");--> statement-breakpoint
CREATE UNIQUE INDEX "limit_items_table_key" ON "limit_items" USING btree ("limit_table_id","key");--> statement-breakpoint
CREATE INDEX "limit_items_table_seq_idx" ON "limit_items" USING btree ("limit_table_id","seq");--> statement-breakpoint
CREATE INDEX "limit_tables_engine_model_idx" ON "limit_tables" USING btree ("engine_model");--> statement-breakpoint
CREATE INDEX "limit_tables_supersedes_idx" ON "limit_tables" USING btree ("supersedes_id");--> statement-breakpoint
CREATE INDEX "limit_tables_created_by_idx" ON "limit_tables" USING btree ("created_by");--> statement-breakpoint
CREATE INDEX "job_signoffs_job_idx" ON "job_signoffs" USING btree ("job_id");--> statement-breakpoint
CREATE INDEX "job_signoffs_inspector_idx" ON "job_signoffs" USING btree ("inspector_id");--> statement-breakpoint
CREATE INDEX "jobs_limit_table_idx" ON "jobs" USING btree ("limit_table_id");--> statement-breakpoint
CREATE INDEX "jobs_engine_serial_idx" ON "jobs" USING btree ("engine_serial");--> statement-breakpoint
CREATE INDEX "jobs_opened_by_idx" ON "jobs" USING btree ("opened_by");--> statement-breakpoint
CREATE INDEX "jobs_opened_at_idx" ON "jobs" USING btree ("opened_at");--> statement-breakpoint
CREATE INDEX "reading_tools_tool_taken_idx" ON "reading_tools" USING btree ("tool_id","taken_at");--> statement-breakpoint
CREATE INDEX "readings_job_item_idx" ON "readings" USING btree ("job_id","item_key","index");--> statement-breakpoint
CREATE INDEX "readings_taken_at_idx" ON "readings" USING btree ("taken_at");--> statement-breakpoint
CREATE INDEX "readings_taken_by_idx" ON "readings" USING btree ("taken_by");--> statement-breakpoint
CREATE INDEX "readings_supersedes_idx" ON "readings" USING btree ("supersedes_id");--> statement-breakpoint
CREATE INDEX "readings_go_leaf_idx" ON "readings" USING btree ("go_leaf_id");--> statement-breakpoint
CREATE INDEX "readings_no_go_leaf_idx" ON "readings" USING btree ("no_go_leaf_id");--> statement-breakpoint
CREATE INDEX "readings_override_by_idx" ON "readings" USING btree ("override_by");--> statement-breakpoint
CREATE INDEX "dispositions_item_idx" ON "dispositions" USING btree ("investigation_item_id");--> statement-breakpoint
CREATE INDEX "dispositions_decided_by_idx" ON "dispositions" USING btree ("decided_by");--> statement-breakpoint
CREATE INDEX "dispositions_remeasure_idx" ON "dispositions" USING btree ("remeasure_reading_id");--> statement-breakpoint
CREATE INDEX "investigation_items_investigation_idx" ON "investigation_items" USING btree ("investigation_id");--> statement-breakpoint
CREATE INDEX "investigation_items_reading_idx" ON "investigation_items" USING btree ("reading_id");--> statement-breakpoint
CREATE INDEX "investigation_items_calibration_idx" ON "investigation_items" USING btree ("calibration_id");--> statement-breakpoint
CREATE INDEX "investigation_items_tool_idx" ON "investigation_items" USING btree ("tool_id");--> statement-breakpoint
CREATE INDEX "investigations_tool_idx" ON "investigations" USING btree ("tool_id");--> statement-breakpoint
CREATE INDEX "investigations_standard_idx" ON "investigations" USING btree ("standard_id");--> statement-breakpoint
CREATE INDEX "investigations_calibration_idx" ON "investigations" USING btree ("calibration_id");--> statement-breakpoint
CREATE INDEX "investigations_check_idx" ON "investigations" USING btree ("check_id");--> statement-breakpoint
CREATE INDEX "investigations_status_idx" ON "investigations" USING btree ("status","opened_at");--> statement-breakpoint
CREATE INDEX "investigations_opened_by_idx" ON "investigations" USING btree ("opened_by");--> statement-breakpoint
CREATE INDEX "investigations_closed_by_idx" ON "investigations" USING btree ("closed_by");--> statement-breakpoint
CREATE UNIQUE INDEX "reminder_log_once_key" ON "reminder_log" USING btree ("tool_id","due_at","stage","recipient_id");--> statement-breakpoint
CREATE INDEX "reminder_log_recipient_idx" ON "reminder_log" USING btree ("recipient_id");--> statement-breakpoint
CREATE INDEX "reminder_log_run_idx" ON "reminder_log" USING btree ("run_id");--> statement-breakpoint
CREATE INDEX "reminder_log_status_idx" ON "reminder_log" USING btree ("status");--> statement-breakpoint
CREATE INDEX "reminder_runs_started_idx" ON "reminder_runs" USING btree ("started_at");--> statement-breakpoint
CREATE INDEX "interval_decisions_family_idx" ON "interval_decisions" USING btree ("family_id","decided_at");--> statement-breakpoint
CREATE INDEX "interval_decisions_by_idx" ON "interval_decisions" USING btree ("decided_by");
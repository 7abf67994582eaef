CREATE TABLE "tool_states" (
	"tool_id" uuid PRIMARY KEY NOT NULL,
	"lifecycle" text NOT NULL,
	"calibration_required" boolean NOT NULL,
	"usage_limit" integer,
	"cal_id" uuid,
	"cal_performed_at" timestamp with time zone,
	"cal_result" text,
	"cal_next_due" date,
	"cal_limited_min" numeric,
	"cal_limited_max" numeric,
	"cal_limited_note" text,
	"pending_performed_at" timestamp with time zone,
	"pending_lab" text,
	"uses_since_cal" integer DEFAULT 0 NOT NULL,
	"failed_check_at" timestamp with time zone,
	"failed_check_deviation" numeric,
	"hold_since" timestamp with time zone,
	"hold_reason" text,
	"lab_since" timestamp with time zone,
	"lab_name" text,
	"lab_expected_back" date,
	"custody_checkout_id" uuid,
	"custody_user_id" uuid,
	"custody_since" timestamp with time zone,
	"custody_due_back" timestamp with time zone,
	"settled_at" timestamp with time zone,
	"base_status" text NOT NULL,
	"usage_exhausted" boolean DEFAULT false NOT NULL,
	"usage_warn" boolean DEFAULT false NOT NULL
);
--> statement-breakpoint
ALTER TABLE "tool_states" ADD CONSTRAINT "tool_states_tool_id_tools_id_fk" FOREIGN KEY ("tool_id") REFERENCES "public"."tools"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "tool_states_base_due_idx" ON "tool_states" USING btree ("base_status","cal_next_due");--> statement-breakpoint
CREATE INDEX "tool_states_due_idx" ON "tool_states" USING btree ("cal_next_due");--> statement-breakpoint
CREATE INDEX "tool_states_usage_idx" ON "tool_states" USING btree ("tool_id") WHERE "tool_states"."usage_exhausted" or "tool_states"."usage_warn";--> statement-breakpoint
CREATE INDEX "tool_states_settled_idx" ON "tool_states" USING btree ("settled_at");--> statement-breakpoint
CREATE INDEX "tool_states_custody_user_idx" ON "tool_states" USING btree ("custody_user_id");
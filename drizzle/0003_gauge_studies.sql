CREATE TABLE "gauge_studies" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"number" integer GENERATED ALWAYS AS IDENTITY (sequence name "gauge_studies_number_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"limit_table_id" uuid NOT NULL,
	"table_root_id" uuid NOT NULL,
	"item_key" text NOT NULL,
	"family_id" uuid NOT NULL,
	"tool_id" uuid,
	"parts" integer NOT NULL,
	"appraisers" integer NOT NULL,
	"trials" integer NOT NULL,
	"alpha" double precision NOT NULL,
	"seed" text NOT NULL,
	"run_order" jsonb NOT NULL,
	"purpose" text,
	"is_demo" boolean DEFAULT false NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone NOT NULL
);
--> statement-breakpoint
CREATE TABLE "gauge_study_appraisers" (
	"study_id" uuid NOT NULL,
	"seq" integer NOT NULL,
	"user_id" uuid NOT NULL,
	CONSTRAINT "gauge_study_appraisers_study_id_seq_pk" PRIMARY KEY("study_id","seq")
);
--> statement-breakpoint
CREATE TABLE "gauge_study_parts" (
	"study_id" uuid NOT NULL,
	"seq" integer NOT NULL,
	"label" text NOT NULL,
	CONSTRAINT "gauge_study_parts_study_id_seq_pk" PRIMARY KEY("study_id","seq")
);
--> statement-breakpoint
CREATE TABLE "gauge_study_results" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"seq" integer GENERATED ALWAYS AS IDENTITY (sequence name "gauge_study_results_seq_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"study_id" uuid NOT NULL,
	"computed_at" timestamp with time zone NOT NULL,
	"verdict" text NOT NULL,
	"percent_grr" double precision,
	"ndc" integer,
	"pooled" boolean NOT NULL,
	"analysis" jsonb NOT NULL
);
--> statement-breakpoint
CREATE TABLE "gauge_study_value_tools" (
	"value_id" uuid NOT NULL,
	"tool_id" uuid NOT NULL,
	"position" integer NOT NULL,
	"status_at_reading" text NOT NULL,
	"due_at_reading" date,
	"taken_at" timestamp with time zone NOT NULL,
	CONSTRAINT "gauge_study_value_tools_value_id_tool_id_pk" PRIMARY KEY("value_id","tool_id")
);
--> statement-breakpoint
CREATE TABLE "gauge_study_values" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"seq" integer GENERATED ALWAYS AS IDENTITY (sequence name "gauge_study_values_seq_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"study_id" uuid NOT NULL,
	"appraiser_seq" integer NOT NULL,
	"part" integer NOT NULL,
	"trial" integer NOT NULL,
	"position" integer NOT NULL,
	"value" numeric NOT NULL,
	"unit" text NOT NULL,
	"taken_by" uuid NOT NULL,
	"taken_at" timestamp with time zone NOT NULL,
	"supersedes_id" uuid,
	"supersede_reason" text
);
--> statement-breakpoint
ALTER TABLE "gauge_studies" ADD CONSTRAINT "gauge_studies_limit_table_id_limit_tables_id_fk" FOREIGN KEY ("limit_table_id") REFERENCES "public"."limit_tables"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "gauge_studies" ADD CONSTRAINT "gauge_studies_table_root_id_limit_tables_id_fk" FOREIGN KEY ("table_root_id") REFERENCES "public"."limit_tables"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "gauge_studies" ADD CONSTRAINT "gauge_studies_family_id_families_id_fk" FOREIGN KEY ("family_id") REFERENCES "public"."families"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "gauge_studies" ADD CONSTRAINT "gauge_studies_tool_id_tools_id_fk" FOREIGN KEY ("tool_id") REFERENCES "public"."tools"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "gauge_studies" ADD CONSTRAINT "gauge_studies_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "gauge_study_appraisers" ADD CONSTRAINT "gauge_study_appraisers_study_id_gauge_studies_id_fk" FOREIGN KEY ("study_id") REFERENCES "public"."gauge_studies"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "gauge_study_appraisers" ADD CONSTRAINT "gauge_study_appraisers_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "gauge_study_parts" ADD CONSTRAINT "gauge_study_parts_study_id_gauge_studies_id_fk" FOREIGN KEY ("study_id") REFERENCES "public"."gauge_studies"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "gauge_study_results" ADD CONSTRAINT "gauge_study_results_study_id_gauge_studies_id_fk" FOREIGN KEY ("study_id") REFERENCES "public"."gauge_studies"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "gauge_study_value_tools" ADD CONSTRAINT "gauge_study_value_tools_value_id_gauge_study_values_id_fk" FOREIGN KEY ("value_id") REFERENCES "public"."gauge_study_values"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "gauge_study_value_tools" ADD CONSTRAINT "gauge_study_value_tools_tool_id_tools_id_fk" FOREIGN KEY ("tool_id") REFERENCES "public"."tools"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "gauge_study_values" ADD CONSTRAINT "gauge_study_values_study_id_gauge_studies_id_fk" FOREIGN KEY ("study_id") REFERENCES "public"."gauge_studies"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "gauge_study_values" ADD CONSTRAINT "gauge_study_values_taken_by_users_id_fk" FOREIGN KEY ("taken_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "gauge_studies_number_key" ON "gauge_studies" USING btree ("number");--> statement-breakpoint
CREATE INDEX "gauge_studies_characteristic_idx" ON "gauge_studies" USING btree ("table_root_id","item_key","family_id");--> statement-breakpoint
CREATE INDEX "gauge_studies_family_idx" ON "gauge_studies" USING btree ("family_id");--> statement-breakpoint
CREATE INDEX "gauge_studies_limit_table_idx" ON "gauge_studies" USING btree ("limit_table_id");--> statement-breakpoint
CREATE INDEX "gauge_studies_tool_idx" ON "gauge_studies" USING btree ("tool_id");--> statement-breakpoint
CREATE INDEX "gauge_studies_created_by_idx" ON "gauge_studies" USING btree ("created_by");--> statement-breakpoint
CREATE INDEX "gauge_studies_created_at_idx" ON "gauge_studies" USING btree ("created_at");--> statement-breakpoint
CREATE UNIQUE INDEX "gauge_study_appraisers_user_key" ON "gauge_study_appraisers" USING btree ("study_id","user_id");--> statement-breakpoint
CREATE INDEX "gauge_study_appraisers_user_idx" ON "gauge_study_appraisers" USING btree ("user_id");--> statement-breakpoint
CREATE UNIQUE INDEX "gauge_study_parts_label_key" ON "gauge_study_parts" USING btree ("study_id",upper("label"));--> statement-breakpoint
CREATE INDEX "gauge_study_results_study_idx" ON "gauge_study_results" USING btree ("study_id","seq");--> statement-breakpoint
CREATE INDEX "gauge_study_value_tools_tool_idx" ON "gauge_study_value_tools" USING btree ("tool_id","taken_at");--> statement-breakpoint
CREATE UNIQUE INDEX "gauge_study_values_place_key" ON "gauge_study_values" USING btree ("study_id","appraiser_seq","part","trial") WHERE "gauge_study_values"."supersedes_id" is null;--> statement-breakpoint
CREATE UNIQUE INDEX "gauge_study_values_supersedes_key" ON "gauge_study_values" USING btree ("supersedes_id") WHERE "gauge_study_values"."supersedes_id" is not null;--> statement-breakpoint
CREATE INDEX "gauge_study_values_study_idx" ON "gauge_study_values" USING btree ("study_id","seq");--> statement-breakpoint
CREATE INDEX "gauge_study_values_taken_by_idx" ON "gauge_study_values" USING btree ("taken_by");
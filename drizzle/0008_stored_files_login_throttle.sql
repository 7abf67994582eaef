CREATE TABLE "stored_files" (
	"key" text PRIMARY KEY NOT NULL,
	"purpose" text NOT NULL,
	"content_type" text NOT NULL,
	"size" integer NOT NULL,
	"file_name" text NOT NULL,
	"uploaded_by" uuid,
	"uploaded_at" timestamp with time zone NOT NULL,
	"claimed_by" text,
	"claimed_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "login_throttle" (
	"key" text PRIMARY KEY NOT NULL,
	"hits" integer NOT NULL,
	"reset_at" timestamp with time zone NOT NULL
);
--> statement-breakpoint
ALTER TABLE "stored_files" ADD CONSTRAINT "stored_files_uploaded_by_users_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "stored_files_uploaded_by_idx" ON "stored_files" USING btree ("uploaded_by");--> statement-breakpoint
CREATE INDEX "stored_files_purpose_idx" ON "stored_files" USING btree ("purpose","uploaded_at");--> statement-breakpoint
CREATE INDEX "login_throttle_reset_idx" ON "login_throttle" USING btree ("reset_at");
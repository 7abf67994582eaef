CREATE TABLE "job_people" (
	"job_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	CONSTRAINT "job_people_user_id_job_id_pk" PRIMARY KEY("user_id","job_id")
);
--> statement-breakpoint
ALTER TABLE "job_people" ADD CONSTRAINT "job_people_job_id_jobs_id_fk" FOREIGN KEY ("job_id") REFERENCES "public"."jobs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job_people" ADD CONSTRAINT "job_people_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
-- Kept by the database in the transaction of each reading: the first reading a person takes on a sheet adds the pair,
-- later ones find it there (no update, so no row is rewritten per reading). Security definer: the app only reads it.
CREATE OR REPLACE FUNCTION tenthwise_job_people_reading() RETURNS trigger
LANGUAGE plpgsql SECURITY DEFINER SET search_path = public, pg_temp AS $$
BEGIN
  IF NEW.taken_by IS NOT NULL THEN
    INSERT INTO job_people (job_id, user_id) VALUES (NEW.job_id, NEW.taken_by) ON CONFLICT DO NOTHING;
  END IF;
  RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER readings_job_people AFTER INSERT ON readings FOR EACH ROW EXECUTE FUNCTION tenthwise_job_people_reading();
--> statement-breakpoint
-- The readings already on record.
INSERT INTO job_people (job_id, user_id) SELECT DISTINCT job_id, taken_by FROM readings WHERE taken_by IS NOT NULL ON CONFLICT DO NOTHING;

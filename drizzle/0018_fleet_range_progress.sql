CREATE TYPE "public"."recompute_job_state" AS ENUM('running', 'done', 'failed');--> statement-breakpoint
CREATE TYPE "public"."recompute_reason" AS ENUM('calibration', 'aircraft');--> statement-breakpoint
ALTER TYPE "public"."calibration_source" ADD VALUE 'rangeEnd';--> statement-breakpoint
CREATE TABLE "recompute_jobs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"aircraft_id" uuid NOT NULL,
	"reason" "recompute_reason" NOT NULL,
	"state" "recompute_job_state" DEFAULT 'running' NOT NULL,
	"total" integer NOT NULL,
	"done" integer DEFAULT 0 NOT NULL,
	"started_by" text,
	"started_at" timestamp (3) with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp (3) with time zone DEFAULT now() NOT NULL,
	"finished_at" timestamp (3) with time zone
);
--> statement-breakpoint
ALTER TABLE "recompute_jobs" ADD CONSTRAINT "recompute_jobs_aircraft_id_aircraft_id_fk" FOREIGN KEY ("aircraft_id") REFERENCES "public"."aircraft"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "recompute_jobs" ADD CONSTRAINT "recompute_jobs_started_by_users_id_fk" FOREIGN KEY ("started_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "recompute_jobs_aircraft_id_started_at_index" ON "recompute_jobs" USING btree ("aircraft_id","started_at");
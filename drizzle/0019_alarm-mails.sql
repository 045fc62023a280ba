CREATE TABLE "alarm_mails" (
	"alarm_id" uuid NOT NULL,
	"user_id" text NOT NULL,
	"sent_at" timestamp (3) with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "alarm_mails_alarm_id_user_id_pk" PRIMARY KEY("alarm_id","user_id")
);
--> statement-breakpoint
ALTER TABLE "flight_alarms" ADD COLUMN "mailed_count" integer DEFAULT 0;--> statement-breakpoint
ALTER TABLE "alarm_mails" ADD CONSTRAINT "alarm_mails_alarm_id_flight_alarms_id_fk" FOREIGN KEY ("alarm_id") REFERENCES "public"."flight_alarms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "alarm_mails" ADD CONSTRAINT "alarm_mails_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "alarm_mails_user_id_index" ON "alarm_mails" USING btree ("user_id");--> statement-breakpoint
-- hand-written: alarms e-mailed before the count was kept: how many watchers got them is not known
-- (null), so the live page says nothing about their e-mails rather than "no watcher was e-mailed".
UPDATE "flight_alarms" SET "mailed_count" = NULL WHERE "emailed_at" IS NOT NULL;

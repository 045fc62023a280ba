ALTER TABLE "recorders" ADD COLUMN "flying_pilot_id" text;--> statement-breakpoint
ALTER TABLE "recorders" ADD COLUMN "flying_on" date;--> statement-breakpoint
ALTER TABLE "recorders" ADD CONSTRAINT "recorders_flying_pilot_id_users_id_fk" FOREIGN KEY ("flying_pilot_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;
ALTER TABLE "flights" ADD COLUMN "route" text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE "flights" ADD COLUMN "deleted_at" timestamp (3) with time zone;--> statement-breakpoint
ALTER TABLE "flights" ADD COLUMN "deleted_by" text;--> statement-breakpoint
ALTER TABLE "recorders" ADD COLUMN "flying_pilot_id" text;--> statement-breakpoint
ALTER TABLE "recorders" ADD COLUMN "flying_on" date;--> statement-breakpoint
ALTER TABLE "flights" ADD CONSTRAINT "flights_deleted_by_users_id_fk" FOREIGN KEY ("deleted_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "recorders" ADD CONSTRAINT "recorders_flying_pilot_id_users_id_fk" FOREIGN KEY ("flying_pilot_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;
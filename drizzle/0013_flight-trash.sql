ALTER TABLE "flights" ADD COLUMN "deleted_at" timestamp (3) with time zone;--> statement-breakpoint
ALTER TABLE "flights" ADD COLUMN "deleted_by" text;--> statement-breakpoint
ALTER TABLE "flights" ADD CONSTRAINT "flights_deleted_by_users_id_fk" FOREIGN KEY ("deleted_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;
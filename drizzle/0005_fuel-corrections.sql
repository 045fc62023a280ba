CREATE TYPE "public"."fuel_correction_kind" AS ENUM('declaration', 'eventAdded', 'eventRemoved');--> statement-breakpoint
CREATE TABLE "fuel_corrections" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"flight_id" uuid NOT NULL,
	"user_id" text,
	"kind" "fuel_correction_kind" NOT NULL,
	"before" jsonb,
	"after" jsonb,
	"reason" text DEFAULT '' NOT NULL,
	"at" timestamp (3) with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "fuel_corrections" ADD CONSTRAINT "fuel_corrections_flight_id_flights_id_fk" FOREIGN KEY ("flight_id") REFERENCES "public"."flights"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "fuel_corrections" ADD CONSTRAINT "fuel_corrections_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "fuel_corrections_flight_id_at_index" ON "fuel_corrections" USING btree ("flight_id","at");
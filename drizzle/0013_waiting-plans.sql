ALTER TABLE "fuel_plans" ADD COLUMN "expected_departure_at" timestamp (3) with time zone;--> statement-breakpoint
ALTER TABLE "fuel_plans" ADD COLUMN "pilot_id" text;--> statement-breakpoint
ALTER TABLE "fuel_plans" ADD CONSTRAINT "fuel_plans_pilot_id_users_id_fk" FOREIGN KEY ("pilot_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "fuel_plans_waiting_idx" ON "fuel_plans" USING btree ("aircraft_id","expected_departure_at") WHERE "fuel_plans"."flight_id" is null;--> statement-breakpoint
ALTER TABLE "fuel_plans" ADD CONSTRAINT "fuel_plans_flight_or_departure" CHECK ("fuel_plans"."flight_id" is not null or "fuel_plans"."expected_departure_at" is not null);
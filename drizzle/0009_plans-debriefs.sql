CREATE TYPE "public"."debrief_status" AS ENUM('draft', 'published');--> statement-breakpoint
CREATE TABLE "debrief_shares" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"flight_id" uuid NOT NULL,
	"token_hash" text NOT NULL,
	"created_by" text,
	"created_at" timestamp (3) with time zone DEFAULT now() NOT NULL,
	"expires_at" timestamp (3) with time zone NOT NULL,
	"revoked_at" timestamp (3) with time zone,
	CONSTRAINT "debrief_shares_tokenHash_unique" UNIQUE("token_hash")
);
--> statement-breakpoint
CREATE TABLE "debriefs" (
	"flight_id" uuid PRIMARY KEY NOT NULL,
	"status" "debrief_status" DEFAULT 'draft' NOT NULL,
	"summary" text DEFAULT '' NOT NULL,
	"signed_off_by" text,
	"signed_off_at" timestamp (3) with time zone,
	"published_at" timestamp (3) with time zone,
	"updated_at" timestamp (3) with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "fuel_plans" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"org_id" uuid NOT NULL,
	"aircraft_id" uuid NOT NULL,
	"flight_id" uuid,
	"start_on_board_l" double precision NOT NULL,
	"taxi_l" double precision DEFAULT 0 NOT NULL,
	"climb_l" double precision DEFAULT 0 NOT NULL,
	"reserve_rule" text NOT NULL,
	"reserve_custom_min" double precision,
	"reserve_flow_lph" double precision,
	"tolerance_percent" double precision NOT NULL,
	"legs" jsonb NOT NULL,
	"created_by" text,
	"created_at" timestamp (3) with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp (3) with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "flight_notes" ADD COLUMN "edited_at" timestamp (3) with time zone;--> statement-breakpoint
ALTER TABLE "debrief_shares" ADD CONSTRAINT "debrief_shares_flight_id_flights_id_fk" FOREIGN KEY ("flight_id") REFERENCES "public"."flights"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "debrief_shares" ADD CONSTRAINT "debrief_shares_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "debriefs" ADD CONSTRAINT "debriefs_flight_id_flights_id_fk" FOREIGN KEY ("flight_id") REFERENCES "public"."flights"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "debriefs" ADD CONSTRAINT "debriefs_signed_off_by_users_id_fk" FOREIGN KEY ("signed_off_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "fuel_plans" ADD CONSTRAINT "fuel_plans_org_id_organisations_id_fk" FOREIGN KEY ("org_id") REFERENCES "public"."organisations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "fuel_plans" ADD CONSTRAINT "fuel_plans_aircraft_id_aircraft_id_fk" FOREIGN KEY ("aircraft_id") REFERENCES "public"."aircraft"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "fuel_plans" ADD CONSTRAINT "fuel_plans_flight_id_flights_id_fk" FOREIGN KEY ("flight_id") REFERENCES "public"."flights"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "fuel_plans" ADD CONSTRAINT "fuel_plans_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "debrief_shares_flight_id_index" ON "debrief_shares" USING btree ("flight_id");--> statement-breakpoint
CREATE UNIQUE INDEX "fuel_plans_flight_id_index" ON "fuel_plans" USING btree ("flight_id");--> statement-breakpoint
CREATE INDEX "fuel_plans_aircraft_id_index" ON "fuel_plans" USING btree ("aircraft_id");
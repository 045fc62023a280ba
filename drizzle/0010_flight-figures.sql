CREATE TYPE "public"."flight_phase" AS ENUM('unknown', 'stopped', 'taxi', 'climb', 'cruise', 'descent');--> statement-breakpoint
CREATE TABLE "aircraft_burn_settings" (
	"aircraft_id" uuid PRIMARY KEY NOT NULL,
	"threshold_percent" double precision,
	"manual_taxi_lph" double precision,
	"manual_climb_lph" double precision,
	"manual_cruise_lph" double precision,
	"manual_descent_lph" double precision,
	"updated_by" text,
	"updated_at" timestamp (3) with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "flight_figures" (
	"flight_id" uuid PRIMARY KEY NOT NULL,
	"engine_time_s" double precision NOT NULL,
	"fuel_used_l" double precision NOT NULL,
	"fuel_per_engine_hour_lph" double precision,
	"cruise_specific_range_nm_per_l" double precision,
	"meter_factor" double precision NOT NULL,
	"gap_count" integer NOT NULL,
	"gap_time_s" double precision NOT NULL,
	"leaning_moments" integer NOT NULL
);
--> statement-breakpoint
CREATE TABLE "flight_phase_figures" (
	"flight_id" uuid NOT NULL,
	"phase" "flight_phase" NOT NULL,
	"time_s" double precision NOT NULL,
	"fuel_l" double precision NOT NULL,
	"distance_nm" double precision NOT NULL,
	"average_flow_lph" double precision,
	CONSTRAINT "flight_phase_figures_flight_id_phase_pk" PRIMARY KEY("flight_id","phase")
);
--> statement-breakpoint
CREATE TABLE "flight_unusual_marks" (
	"flight_id" uuid PRIMARY KEY NOT NULL,
	"reason" text DEFAULT '' NOT NULL,
	"marked_by" text,
	"marked_at" timestamp (3) with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "aircraft_burn_settings" ADD CONSTRAINT "aircraft_burn_settings_aircraft_id_aircraft_id_fk" FOREIGN KEY ("aircraft_id") REFERENCES "public"."aircraft"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "aircraft_burn_settings" ADD CONSTRAINT "aircraft_burn_settings_updated_by_users_id_fk" FOREIGN KEY ("updated_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "flight_figures" ADD CONSTRAINT "flight_figures_flight_id_flights_id_fk" FOREIGN KEY ("flight_id") REFERENCES "public"."flights"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "flight_phase_figures" ADD CONSTRAINT "flight_phase_figures_flight_id_flights_id_fk" FOREIGN KEY ("flight_id") REFERENCES "public"."flights"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "flight_unusual_marks" ADD CONSTRAINT "flight_unusual_marks_flight_id_flights_id_fk" FOREIGN KEY ("flight_id") REFERENCES "public"."flights"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "flight_unusual_marks" ADD CONSTRAINT "flight_unusual_marks_marked_by_users_id_fk" FOREIGN KEY ("marked_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;
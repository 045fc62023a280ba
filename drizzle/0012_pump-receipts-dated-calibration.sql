CREATE TYPE "public"."calibration_source" AS ENUM('reconciliation', 'hand', 'initial');--> statement-breakpoint
CREATE TABLE "pump_receipts" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"aircraft_id" uuid NOT NULL,
	"at" timestamp (3) with time zone NOT NULL,
	"airfield" text DEFAULT '' NOT NULL,
	"amount" double precision NOT NULL,
	"unit" "fuel_unit" NOT NULL,
	"amount_l" double precision NOT NULL,
	"filled_to_full" boolean NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"created_by" text,
	"created_at" timestamp (3) with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "calibrations" ALTER COLUMN "indicated_l" DROP NOT NULL;--> statement-breakpoint
ALTER TABLE "calibrations" ALTER COLUMN "pumped_l" DROP NOT NULL;--> statement-breakpoint
ALTER TABLE "calibrations" ADD COLUMN "source" "calibration_source" DEFAULT 'hand' NOT NULL;--> statement-breakpoint
ALTER TABLE "calibrations" ADD COLUMN "in_force_from" timestamp (3) with time zone;--> statement-breakpoint
ALTER TABLE "calibrations" ADD COLUMN "receipt_from_id" uuid;--> statement-breakpoint
ALTER TABLE "calibrations" ADD COLUMN "receipt_to_id" uuid;--> statement-breakpoint
ALTER TABLE "calibrations" ADD COLUMN "flights_recomputed" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "pump_receipts" ADD CONSTRAINT "pump_receipts_aircraft_id_aircraft_id_fk" FOREIGN KEY ("aircraft_id") REFERENCES "public"."aircraft"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "pump_receipts" ADD CONSTRAINT "pump_receipts_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "pump_receipts_aircraft_id_at_index" ON "pump_receipts" USING btree ("aircraft_id","at");--> statement-breakpoint
ALTER TABLE "calibrations" ADD CONSTRAINT "calibrations_receipt_from_id_pump_receipts_id_fk" FOREIGN KEY ("receipt_from_id") REFERENCES "public"."pump_receipts"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "calibrations" ADD CONSTRAINT "calibrations_receipt_to_id_pump_receipts_id_fk" FOREIGN KEY ("receipt_to_id") REFERENCES "public"."pump_receipts"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "calibrations_aircraft_id_in_force_from_index" ON "calibrations" USING btree ("aircraft_id","in_force_from");--> statement-breakpoint
-- Hand-written backfill: a calibration applied before dated history rewrote every flight, so it is
-- in force from the beginning; entries recorded without applying stay undated (recorded only).
UPDATE "calibrations" SET "in_force_from" = '1970-01-01T00:00:00Z'
	WHERE "meter_factor_new" <> "meter_factor_old" OR "k_factor_new" IS DISTINCT FROM "k_factor_old";

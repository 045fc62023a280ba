CREATE TABLE "pending_sign_ups" (
	"token_hash" text PRIMARY KEY NOT NULL,
	"email" text NOT NULL,
	"name" text NOT NULL,
	"password_hash" text NOT NULL,
	"next" text NOT NULL,
	"created_at" timestamp (3) with time zone DEFAULT now() NOT NULL,
	"expires_at" timestamp (3) with time zone NOT NULL
);
--> statement-breakpoint
CREATE TABLE "rate_limit_events" (
	"id" bigint PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "rate_limit_events_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 9223372036854775807 START WITH 1 CACHE 1),
	"bucket" text NOT NULL,
	"key" text NOT NULL,
	"at" timestamp (3) with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "sessions" ADD COLUMN "last_seen_at" timestamp (3) with time zone DEFAULT now() NOT NULL;--> statement-breakpoint
ALTER TABLE "sessions" ADD COLUMN "user_agent" text;--> statement-breakpoint
CREATE INDEX "pending_sign_ups_email_index" ON "pending_sign_ups" USING btree ("email");--> statement-breakpoint
CREATE INDEX "rate_limit_events_bucket_key_at_index" ON "rate_limit_events" USING btree ("bucket","key","at");--> statement-breakpoint
-- Hand-written (not generated): session ids are now the SHA-256 of the cookie's token, so ids
-- stored before this migration match no cookie. End them; everyone signs in once more.
DELETE FROM "sessions";

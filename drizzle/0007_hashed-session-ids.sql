ALTER TABLE "sessions" ADD COLUMN "last_seen_at" timestamp (3) with time zone DEFAULT now() NOT NULL;--> statement-breakpoint
ALTER TABLE "sessions" ADD COLUMN "user_agent" text;--> statement-breakpoint
-- Hand-written (not generated): session ids are now the SHA-256 of the cookie's token, so ids
-- stored before this migration match no cookie. End them; everyone signs in once more.
DELETE FROM "sessions";

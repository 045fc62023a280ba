CREATE TYPE "public"."api_token_scope" AS ENUM('read', 'upload');--> statement-breakpoint
ALTER TABLE "api_tokens" ADD COLUMN "scope" "api_token_scope" DEFAULT 'upload' NOT NULL;--> statement-breakpoint
ALTER TABLE "api_tokens" ADD COLUMN "expires_at" timestamp (3) with time zone;
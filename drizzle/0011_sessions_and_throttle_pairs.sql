CREATE TABLE "user_sessions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"user_id" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"expires_at" timestamp with time zone NOT NULL
);
--> statement-breakpoint
ALTER TABLE "throttle_events" ALTER COLUMN "kind" SET DATA TYPE text;--> statement-breakpoint
-- Failures counted per account alone are replaced by per account-and-address counts.
DELETE FROM "throttle_events" WHERE "kind" = 'account';--> statement-breakpoint
DROP TYPE "public"."throttle_kind";--> statement-breakpoint
CREATE TYPE "public"."throttle_kind" AS ENUM('account_address', 'address', 'mail');--> statement-breakpoint
ALTER TABLE "throttle_events" ALTER COLUMN "kind" SET DATA TYPE "public"."throttle_kind" USING "kind"::"public"."throttle_kind";--> statement-breakpoint
ALTER TABLE "user_sessions" ADD CONSTRAINT "user_sessions_user_id_user_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "user_sessions_user_idx" ON "user_sessions" USING btree ("user_id");--> statement-breakpoint
ALTER TABLE "user" DROP COLUMN "sessions_valid_after";
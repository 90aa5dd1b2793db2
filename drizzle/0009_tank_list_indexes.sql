-- The tank list at fleet scale: indexes its sorts walk in order, the company's unresolved alerts
-- apart from their history, and a lower-cased search text per tank and home with trigram indexes
-- for the free-text filter. pg_trgm ships with PostgreSQL's contrib and is a trusted extension:
-- the database owner may create it.
CREATE EXTENSION IF NOT EXISTS pg_trgm;--> statement-breakpoint
DROP INDEX "tanks_company_idx";--> statement-breakpoint
ALTER TABLE "homes" ADD COLUMN "search_text" text GENERATED ALWAYS AS (lower("reference" || chr(31) || "address_line" || chr(31) || "postcode" || chr(31) || "town" || chr(31) || coalesce("contact_name", ''))) STORED;--> statement-breakpoint
ALTER TABLE "tanks" ADD COLUMN "search_text" text GENERATED ALWAYS AS (lower("serial" || chr(31) || "model")) STORED;--> statement-breakpoint
CREATE INDEX "homes_search_trgm_idx" ON "homes" USING gin ("search_text" gin_trgm_ops);--> statement-breakpoint
CREATE INDEX "tanks_company_serial_idx" ON "tanks" USING btree ("company_id","serial");--> statement-breakpoint
CREATE INDEX "tanks_search_trgm_idx" ON "tanks" USING gin ("search_text" gin_trgm_ops);--> statement-breakpoint
CREATE INDEX "tank_latest_state_soc_idx" ON "tank_latest_state" USING btree ("soc");--> statement-breakpoint
CREATE INDEX "tank_latest_state_v40_idx" ON "tank_latest_state" USING btree ("v40_l");--> statement-breakpoint
CREATE INDEX "tank_latest_state_last_seen_idx" ON "tank_latest_state" USING btree ("last_seen_at");--> statement-breakpoint
CREATE INDEX "alerts_open_by_company_idx" ON "alerts" USING btree ("company_id","tank_id","kind") WHERE state <> 'resolved';
ALTER TABLE "homes" ADD COLUMN "cold_inlet_c" real;--> statement-breakpoint
ALTER TABLE "tank_latest_state" ADD COLUMN "figures_quality" jsonb;--> statement-breakpoint
ALTER TABLE "tank_latest_state" ADD COLUMN "sensor_check" jsonb;
CREATE TABLE "energy_day_dirty" (
	"tank_id" uuid NOT NULL,
	"hour" timestamp with time zone NOT NULL,
	CONSTRAINT "energy_day_dirty_tank_id_hour_pk" PRIMARY KEY("tank_id","hour")
);
--> statement-breakpoint
CREATE TABLE "energy_days" (
	"tank_id" uuid NOT NULL,
	"day" date NOT NULL,
	"company_id" uuid NOT NULL,
	"cost_pence" real NOT NULL,
	"heat_pump_heat_kwh" real NOT NULL,
	"heat_pump_electricity_kwh" real NOT NULL,
	"immersion_grid_heat_kwh" real NOT NULL,
	"immersion_solar_heat_kwh" real NOT NULL,
	"drawn_litres40" real NOT NULL,
	"standing_loss_kwh" real NOT NULL,
	"solar_export_forgone_pence" real NOT NULL,
	"unpriced_kwh" real NOT NULL,
	"covered_minutes" real NOT NULL,
	"computed_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "energy_days_tank_id_day_pk" PRIMARY KEY("tank_id","day")
);
--> statement-breakpoint
ALTER TABLE "energy_days" ADD CONSTRAINT "energy_days_tank_id_tanks_id_fk" FOREIGN KEY ("tank_id") REFERENCES "public"."tanks"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "energy_days" ADD CONSTRAINT "energy_days_company_id_companies_id_fk" FOREIGN KEY ("company_id") REFERENCES "public"."companies"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "energy_day_dirty_hour_idx" ON "energy_day_dirty" USING btree ("hour");--> statement-breakpoint
CREATE INDEX "energy_days_company_day_idx" ON "energy_days" USING btree ("company_id","day");
--> statement-breakpoint
-- Hours whose hourly rollup was written are queued for the energy-day job (a statement trigger with
-- a transition table: one insert per rollup statement, not one per row). Written by hand: drizzle-kit
-- does not express triggers.
CREATE FUNCTION "energy_day_dirty_from_rollups"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
	INSERT INTO "energy_day_dirty" ("tank_id", "hour")
	SELECT DISTINCT "tank_id", "bucket" FROM changed ORDER BY 1, 2
	ON CONFLICT DO NOTHING;
	RETURN NULL;
END $$;
--> statement-breakpoint
CREATE TRIGGER "rollups_1h_inserted_energy_dirty" AFTER INSERT ON "rollups_1h" REFERENCING NEW TABLE AS changed FOR EACH STATEMENT EXECUTE FUNCTION "energy_day_dirty_from_rollups"();
--> statement-breakpoint
CREATE TRIGGER "rollups_1h_updated_energy_dirty" AFTER UPDATE ON "rollups_1h" REFERENCING NEW TABLE AS changed FOR EACH STATEMENT EXECUTE FUNCTION "energy_day_dirty_from_rollups"();
--> statement-breakpoint
-- Days already rolled up before this migration are accounted too.
INSERT INTO "energy_day_dirty" ("tank_id", "hour") SELECT "tank_id", "bucket" FROM "rollups_1h" ON CONFLICT DO NOTHING;
